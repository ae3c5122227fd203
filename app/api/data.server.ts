/**
 * What the API reads and writes. Every function takes the token's organisation id first and
 * never reads another organisation's rows. Lists page by id (keyset: `id > after`), so a page
 * boundary never skips or repeats a row while rows are added; the cursor is opaque to clients.
 */
import { and, asc, eq, gt, inArray, isNotNull, type SQL } from "drizzle-orm";
import type { z } from "zod";
import { database } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { attempts, credentials, credentialTypes, exams, examVersions, people, personRoles, personUnits, requirements, units } from "~/db/schema";
import { getPlan } from "~/db/queries/plan.server";
import { deriveBoard, flattenBoard } from "~/db/queries/clearance.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { listCredentialTypes, personOf } from "~/db/queries/credentials.server";
import { validThroughForType } from "~/domain/validity";
import type { Evidence } from "~/domain/status/engine";
import type { ClearanceSchema, CredentialSchema, ExamResultSchema, PersonSchema, PersonStatusSchema, RequirementSchema, UnitSchema } from "./schemas";

export type Page<T> = { data: T[]; nextCursor: string | null };
export type PageArgs = { after: string | null; limit: number };

export function encodeCursor(id: string): string {
  return Buffer.from(JSON.stringify({ after: id }), "utf8").toString("base64url");
}

/** The id a cursor carries, or null when it is not one of ours. */
export function decodeCursor(cursor: string): string | null {
  try {
    const parsed = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8")) as unknown;
    if (parsed && typeof parsed === "object" && typeof (parsed as { after?: unknown }).after === "string") return (parsed as { after: string }).after;
  } catch {
    // fall through: not a cursor we issued
  }
  return null;
}

function pageFrom<T extends { id: string }>(rows: T[], limit: number): { rows: T[]; nextCursor: string | null } {
  const more = rows.length > limit;
  const kept = more ? rows.slice(0, limit) : rows;
  return { rows: kept, nextCursor: more ? encodeCursor(kept[kept.length - 1].id) : null };
}

function afterId(column: Parameters<typeof gt>[0], after: string | null): SQL | undefined {
  return after ? gt(column, after) : undefined;
}

export async function listPeoplePage(orgId: string, { after, limit }: PageArgs): Promise<Page<z.infer<typeof PersonSchema>>> {
  const { db } = await database();
  const rows = await db
    .select({ id: people.id, name: people.name, email: people.email, employeeId: people.employeeId, active: people.active, homeUnitId: people.homeUnitId })
    .from(people)
    .where(and(eq(people.orgId, orgId), afterId(people.id, after)))
    .orderBy(asc(people.id))
    .limit(limit + 1);
  const page = pageFrom(rows, limit);
  const ids = page.rows.map((p) => p.id);
  const [roles, links, unitRows] = ids.length
    ? await Promise.all([
        db.select().from(personRoles).where(and(eq(personRoles.orgId, orgId), inArray(personRoles.personId, ids))),
        db.select().from(personUnits).where(and(eq(personUnits.orgId, orgId), inArray(personUnits.personId, ids))),
        db.select({ id: units.id, name: units.name }).from(units).where(eq(units.orgId, orgId)),
      ])
    : [[], [], []];
  const unitName = new Map(unitRows.map((u) => [u.id, u.name]));
  return {
    data: page.rows.map((p) => {
      const personUnitsOut: z.infer<typeof PersonSchema>["units"] = [];
      if (p.homeUnitId && unitName.has(p.homeUnitId)) personUnitsOut.push({ id: p.homeUnitId, name: unitName.get(p.homeUnitId)!, relation: "home" });
      for (const l of links) {
        if (l.personId === p.id && unitName.has(l.unitId) && !(l.relation === "member" && l.unitId === p.homeUnitId)) {
          personUnitsOut.push({ id: l.unitId, name: unitName.get(l.unitId)!, relation: l.relation });
        }
      }
      return {
        id: p.id,
        name: p.name,
        email: p.email,
        employeeId: p.employeeId,
        active: p.active,
        roles: roles.filter((r) => r.personId === p.id).map((r) => r.role).sort(),
        units: personUnitsOut,
      };
    }),
    nextCursor: page.nextCursor,
  };
}

export async function listUnitsPage(orgId: string, { after, limit }: PageArgs): Promise<Page<z.infer<typeof UnitSchema>>> {
  const { db } = await database();
  const rows = await db
    .select({ id: units.id, name: units.name, code: units.code, active: units.active })
    .from(units)
    .where(and(eq(units.orgId, orgId), afterId(units.id, after)))
    .orderBy(asc(units.id))
    .limit(limit + 1);
  const page = pageFrom(rows, limit);
  return { data: page.rows, nextCursor: page.nextCursor };
}

export async function listRequirementsPage(orgId: string, { after, limit }: PageArgs): Promise<Page<z.infer<typeof RequirementSchema>>> {
  const { db } = await database();
  const rows = await db
    .select({
      id: requirements.id,
      name: requirements.name,
      kind: requirements.kind,
      examId: requirements.examId,
      checklistId: requirements.checklistId,
      credentialTypeId: requirements.credentialTypeId,
      recurrence: requirements.recurrence,
      graceDays: requirements.graceDays,
      unitId: requirements.unitId,
      role: requirements.role,
      active: requirements.active,
    })
    .from(requirements)
    .where(and(eq(requirements.orgId, orgId), afterId(requirements.id, after)))
    .orderBy(asc(requirements.id))
    .limit(limit + 1);
  const page = pageFrom(rows, limit);
  return { data: page.rows, nextCursor: page.nextCursor };
}

function describeEvidence(e: Evidence): string {
  switch (e.kind) {
    case "credential":
      return `${e.typeName}${e.number ? ` ${e.number}` : ""} issued ${e.issuedOn}, valid through ${e.validThrough ?? "no expiry"}${e.verified ? ", verified" : ", not yet verified"}`;
    case "completion":
      return `${e.of === "exam" ? "Exam passed" : "Check-off signed competent"} on ${e.completedOn}${e.validThrough ? `, valid through ${e.validThrough}` : ""}`;
    case "assignment":
      return `Assigned, due ${e.dueOn}`;
    case "waiver":
      return `Waived through ${e.endsOn}: ${e.reason}`;
    case "extension":
      return `Extended to ${e.newDueOn}: ${e.reason}`;
  }
}

/** The status engine's answer for one person (the same rows as My plan), or null for no such person. */
export async function personStatus(orgId: string, timeZone: string, personId: string, now: Date = new Date()): Promise<z.infer<typeof PersonStatusSchema> | null> {
  const options = await statusOptionsFor(orgId, timeZone, now);
  const plan = await getPlan(orgId, personId, timeZone, options);
  if (!plan) return null;
  return {
    personId,
    today: options.today,
    rows: plan.map((r) => ({
      requirementId: r.requirementId ?? null,
      kind: r.kind,
      title: r.title,
      status: r.result.status,
      date: r.extendedTo ?? r.result.date,
      dateMeaning: r.dateMeaning,
      nextChangeOn: r.nextChangeOn ?? null,
      nextStatus: r.nextStatus ?? null,
      evidence: (r.evidence ?? []).map(describeEvidence),
    })),
  };
}

export async function listExamResultsPage(
  orgId: string,
  filter: { examId?: string; personId?: string },
  { after, limit }: PageArgs,
): Promise<Page<z.infer<typeof ExamResultSchema>>> {
  const { db } = await database();
  const rows = await db
    .select({
      id: attempts.id,
      personId: people.id,
      personName: people.name,
      examId: exams.id,
      examTitle: exams.title,
      version: examVersions.version,
      scorePercent: attempts.scorePercent,
      passed: attempts.passed,
      submittedAt: attempts.submittedAt,
      closedReason: attempts.closedReason,
    })
    .from(attempts)
    .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
    .innerJoin(exams, and(eq(exams.id, examVersions.examId), eq(exams.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, attempts.personId), eq(people.orgId, orgId)))
    .where(
      and(
        eq(attempts.orgId, orgId),
        isNotNull(attempts.submittedAt),
        filter.examId ? eq(exams.id, filter.examId) : undefined,
        filter.personId ? eq(attempts.personId, filter.personId) : undefined,
        afterId(attempts.id, after),
      ),
    )
    .orderBy(asc(attempts.id))
    .limit(limit + 1);
  const page = pageFrom(rows, limit);
  return {
    data: page.rows.map((r) => ({
      id: r.id,
      person: { id: r.personId, name: r.personName },
      exam: { id: r.examId, title: r.examTitle },
      version: r.version,
      scorePercent: r.scorePercent,
      passed: r.passed,
      submittedAt: r.submittedAt!.toISOString(),
      closedReason: r.closedReason,
    })),
    nextCursor: page.nextCursor,
  };
}

/**
 * Clearances as the Clearance board derives them (app/db/queries/clearance.server.ts), on the
 * organisation's calendar day of `now`: one row per person, unit they work on, and skill. Rows
 * are derived, not stored, so the API and the board never disagree; ids are stable per person,
 * unit and skill, so keyset paging holds while the day lasts.
 */
export async function listClearancesPage(
  orgId: string,
  timeZone: string,
  filter: { unitId?: string; checklistId?: string },
  { after, limit }: PageArgs,
  now: Date = new Date(),
): Promise<Page<z.infer<typeof ClearanceSchema>>> {
  const board = await deriveBoard(orgId, timeZone, { unitIds: filter.unitId ? [filter.unitId] : null, checklistId: filter.checklistId ?? null }, now);
  const rows = flattenBoard(board).filter((r) => after === null || r.id > after);
  const page = pageFrom(rows.slice(0, limit + 1), limit);
  const derivedAt = board.derivedAt.toISOString();
  return {
    data: page.rows.map((c) => ({ id: c.id, personId: c.personId, unitId: c.unitId, checklistId: c.checklistId, level: c.level, reason: c.reason, requirementId: c.requirementId, derivedAt })),
    nextCursor: page.nextCursor,
  };
}

const credentialColumns = {
  id: credentials.id,
  personId: credentials.personId,
  personName: people.name,
  credentialTypeId: credentials.credentialTypeId,
  typeName: credentialTypes.name,
  number: credentials.number,
  issuer: credentials.issuer,
  issuedOn: credentials.issuedOn,
  validThrough: credentials.validThrough,
  verifiedAt: credentials.verifiedAt,
};
type CredentialOut = z.infer<typeof CredentialSchema>;
function credentialOut(r: { [K in keyof typeof credentialColumns]: unknown } & { verifiedAt: Date | null }): CredentialOut {
  const { verifiedAt, ...rest } = r as Omit<CredentialOut, "verified" | "verifiedAt"> & { verifiedAt: Date | null };
  return { ...rest, verified: verifiedAt !== null, verifiedAt: verifiedAt ? verifiedAt.toISOString() : null };
}

function credentialQuery(orgId: string, where: SQL | undefined) {
  return database().then(({ db }) =>
    db
      .select(credentialColumns)
      .from(credentials)
      .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
      .innerJoin(people, and(eq(people.id, credentials.personId), eq(people.orgId, orgId)))
      .where(and(eq(credentials.orgId, orgId), where)),
  );
}

export async function listCredentialsPage(orgId: string, filter: { personId?: string }, { after, limit }: PageArgs): Promise<Page<CredentialOut>> {
  const { db } = await database();
  const rows = await db
    .select(credentialColumns)
    .from(credentials)
    .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, credentials.personId), eq(people.orgId, orgId)))
    .where(and(eq(credentials.orgId, orgId), filter.personId ? eq(credentials.personId, filter.personId) : undefined, afterId(credentials.id, after)))
    .orderBy(asc(credentials.id))
    .limit(limit + 1);
  const page = pageFrom(rows, limit);
  return { data: page.rows.map(credentialOut), nextCursor: page.nextCursor };
}

export async function getCredential(orgId: string, credentialId: string): Promise<CredentialOut | null> {
  const [row] = await credentialQuery(orgId, eq(credentials.id, credentialId));
  return row ? credentialOut(row) : null;
}

export type CredentialFields = { number: string | null; issuer: string | null; issuedOn: string; validThrough: string | null };
export type ApiWriteResult = { ok: true; credential: CredentialOut } | { ok: false; status: 400 | 404; field: string; message: string };

/**
 * Records a credential for a person of the token's organisation, as the page does (a blank
 * valid-through takes the type's rule), audited with the token as the actor.
 */
export async function createCredentialByToken(
  orgId: string,
  tokenId: string,
  input: CredentialFields & { personId: string; credentialTypeId: string; validThroughGiven: boolean },
  now: Date = new Date(),
): Promise<ApiWriteResult> {
  const [subject, types] = await Promise.all([personOf(orgId, input.personId), listCredentialTypes(orgId)]);
  if (!subject) return { ok: false, status: 400, field: "personId", message: "No person with this id in your organisation." };
  const type = types.find((t) => t.id === input.credentialTypeId);
  if (!type) return { ok: false, status: 400, field: "credentialTypeId", message: "That credential type is not one of your organisation's." };
  const proposed = validThroughForType(type.terms, input.issuedOn, subject.birthMonth);
  const validThrough = input.validThroughGiven ? input.validThrough : proposed;
  const { write } = await database();
  const id = await write(async (tx) => {
    const [row] = await tx
      .insert(credentials)
      .values({ orgId, personId: subject.id, credentialTypeId: type.id, number: input.number, issuer: input.issuer, issuedOn: input.issuedOn, validThrough, createdAt: now, updatedAt: now })
      .returning({ id: credentials.id });
    await recordAudit(tx, {
      orgId,
      actorId: null,
      action: "credential.recorded",
      entityType: "credential",
      entityId: row.id,
      detail: { tokenId, via: "api", personId: subject.id, type: type.name, issuedOn: input.issuedOn, validThrough, proposedValidThrough: proposed, scanFileId: null },
    }, now);
    return row.id;
  });
  return { ok: true, credential: (await getCredential(orgId, id))! };
}

/**
 * Changes a credential's number, issuer or dates. A change to a verified credential clears the
 * verification: the manager checked the old details with the issuing body, not these.
 */
export async function updateCredentialByToken(orgId: string, tokenId: string, credentialId: string, next: CredentialFields, now: Date = new Date()): Promise<ApiWriteResult> {
  const before = await getCredential(orgId, credentialId);
  if (!before) return { ok: false, status: 404, field: "credentialId", message: "No credential with this id in your organisation." };
  const changed = (Object.keys(next) as (keyof CredentialFields)[]).filter((k) => next[k] !== before[k]);
  if (changed.length === 0) return { ok: true, credential: before };
  const { write } = await database();
  await write(async (tx) => {
    await tx
      .update(credentials)
      .set({ ...next, updatedAt: now, ...(before.verified ? { verifiedAt: null, verifiedBy: null, verificationMethod: null } : {}) })
      .where(and(eq(credentials.orgId, orgId), eq(credentials.id, credentialId)));
    await recordAudit(tx, {
      orgId,
      actorId: null,
      action: "credential.updated",
      entityType: "credential",
      entityId: credentialId,
      detail: {
        tokenId,
        via: "api",
        personId: before.personId,
        changes: Object.fromEntries(changed.map((k) => [k, { from: before[k], to: next[k] }])),
        verificationCleared: before.verified,
      },
    }, now);
  });
  return { ok: true, credential: (await getCredential(orgId, credentialId))! };
}
