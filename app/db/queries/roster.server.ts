/**
 * Roster import from HR (issue 10, item 2): the preview and the apply. Parsing and the plan
 * are pure (app/domain/roster/); this module reads the organisation's people and units, and
 * writes the plan in ONE write transaction with one "roster.imported" audit event (counts and
 * the file's SHA-256) plus the per-person events the admin pages write ("person.created",
 * "person.updated", "role.granted", "person.deactivated", "person.reactivated").
 *
 * The preview hands the file's bytes back to the page (base64 in a hidden field) with the
 * SHA-256 of the plan. Applying parses the same bytes again and recomputes the plan inside the
 * write transaction; when it differs from the previewed one (someone edited a person meanwhile)
 * nothing is written and the admin previews again. So "apply" writes exactly what was shown.
 */
import { createHash } from "node:crypto";
import { and, eq, inArray, ne } from "drizzle-orm";
import { isRole } from "~/auth/roles";
import { parseRoster, type RosterProblem, type RosterUnit, columnLetter } from "~/domain/roster/parse";
import { planCounts, planIsEmpty, planKey, planRoster, type CurrentPerson, type RosterPlan } from "~/domain/roster/plan";
import { recordAudit } from "../audit.server";
import { database, type DbOrTx, type Tx } from "../client.server";
import { applyActive } from "./admin-people.server";
import { people, personRoles, units } from "../schema";
import { uniqueViolation } from "./unique-violation";

export type RosterPreview =
  | { ok: false; problems: RosterProblem[]; fileSha256: string | null }
  | { ok: true; plan: RosterPlan; planSha256: string; fileSha256: string; rowCount: number };

const sha256 = (data: Uint8Array | string) => createHash("sha256").update(data).digest("hex");

async function rosterUnits(db: DbOrTx, orgId: string): Promise<RosterUnit[]> {
  return db.select({ id: units.id, name: units.name, code: units.code, active: units.active }).from(units).where(eq(units.orgId, orgId));
}

async function currentPeople(db: DbOrTx, orgId: string): Promise<CurrentPerson[]> {
  const rows = await db
    .select({
      id: people.id,
      employeeId: people.employeeId,
      name: people.name,
      email: people.email,
      title: people.title,
      hireDate: people.hireDate,
      homeUnitId: people.homeUnitId,
      active: people.active,
    })
    .from(people)
    .where(eq(people.orgId, orgId));
  const roles = await db.select({ personId: personRoles.personId, role: personRoles.role }).from(personRoles).where(eq(personRoles.orgId, orgId));
  const byPerson = new Map<string, CurrentPerson["roles"]>();
  for (const r of roles) if (isRole(r.role)) byPerson.set(r.personId, [...(byPerson.get(r.personId) ?? []), r.role]);
  return rows.map((p) => ({ ...p, roles: byPerson.get(p.id) ?? [] }));
}

async function foreignEmails(db: DbOrTx, orgId: string, emails: string[]): Promise<Set<string>> {
  const found = new Set<string>();
  // SQLite's bound-parameter limit is 32766 (SQLite, "Limits In SQLite", §9); stay well under it.
  for (let i = 0; i < emails.length; i += 500) {
    const chunk = emails.slice(i, i + 500);
    const rows = await db.select({ email: people.email }).from(people).where(and(inArray(people.email, chunk), ne(people.orgId, orgId)));
    for (const r of rows) found.add(r.email);
  }
  return found;
}

/** `mayGrantRoles`: whether the importer holds roles:grant (adding a role is a role grant, as on "Add a person"). */
async function previewWith(db: DbOrTx, orgId: string, actorId: string, bytes: Uint8Array, deactivateMissing: boolean, mayGrantRoles: boolean): Promise<RosterPreview> {
  const fileSha256 = bytes.length > 0 ? sha256(bytes) : null;
  const parsed = parseRoster(bytes, await rosterUnits(db, orgId));
  if (parsed.problems.length > 0) return { ok: false, problems: parsed.problems, fileSha256 };
  const plan = planRoster(parsed.rows, {
    people: await currentPeople(db, orgId),
    foreignEmails: await foreignEmails(db, orgId, parsed.rows.map((r) => r.email)),
    actorId,
    deactivateMissing,
    columnLabel: (c) => (parsed.columns[c] === undefined ? c : `${columnLetter(parsed.columns[c] as number)} (${c})`),
  });
  if (!mayGrantRoles) {
    for (const r of [...plan.created.filter((n) => n.roles.length > 0), ...plan.changed.filter((c) => c.rolesAdded.length > 0)]) {
      plan.problems.push({ row: r.row, column: parsed.columns.roles === undefined ? "roles" : `${columnLetter(parsed.columns.roles)} (roles)`, message: "Your roles do not include granting roles; leave the roles column out or ask an admin." });
    }
  }
  if (plan.problems.length > 0) return { ok: false, problems: plan.problems, fileSha256 };
  return { ok: true, plan, planSha256: sha256(planKey(plan)), fileSha256: fileSha256 as string, rowCount: parsed.rows.length };
}

/** Reads and checks an uploaded roster and says what applying it would change. Writes nothing. */
export async function previewRoster(orgId: string, actorId: string, input: { bytes: Uint8Array; deactivateMissing: boolean; mayGrantRoles: boolean }): Promise<RosterPreview> {
  const { db } = await database();
  return previewWith(db, orgId, actorId, input.bytes, input.deactivateMissing, input.mayGrantRoles);
}

export type RosterApplyResult =
  | { ok: true; counts: ReturnType<typeof planCounts>; noChanges: boolean }
  | { ok: false; reason: "problems"; problems: RosterProblem[] }
  | { ok: false; reason: "stale" };

/** Applies the previewed plan in one write transaction, or nothing. */
export async function applyRoster(
  orgId: string,
  actorId: string,
  input: { bytes: Uint8Array; deactivateMissing: boolean; mayGrantRoles: boolean; planSha256: string },
  now: Date = new Date(),
): Promise<RosterApplyResult> {
  const { write } = await database();
  try {
    return await write(async (tx) => {
      const preview = await previewWith(tx, orgId, actorId, input.bytes, input.deactivateMissing, input.mayGrantRoles);
      if (!preview.ok) return { ok: false as const, reason: "problems" as const, problems: preview.problems };
      if (preview.planSha256 !== input.planSha256) return { ok: false as const, reason: "stale" as const };
      const { plan } = preview;
      const counts = planCounts(plan);
      // Importing the same file again: nothing to write, no event (the people are already so).
      if (planIsEmpty(plan)) return { ok: true as const, counts, noChanges: true };

      for (const n of plan.created) {
        const columns = { name: n.values.name, email: n.values.email, employeeId: n.employeeId, title: n.values.title ?? null, hireDate: n.values.hireDate, homeUnitId: n.values.homeUnitId ?? null };
        const [person] = await tx
          .insert(people)
          .values({ ...columns, orgId, active: n.values.active, createdAt: now, updatedAt: now })
          .returning({ id: people.id });
        await recordAudit(tx, { orgId, actorId, action: "person.created", entityType: "person", entityId: person.id, detail: { values: { ...columns, active: n.values.active }, source: "roster" } }, now);
        for (const role of n.roles) {
          await tx.insert(personRoles).values({ personId: person.id, orgId, role, grantedBy: actorId, createdAt: now });
          await recordAudit(tx, { orgId, actorId, action: "role.granted", entityType: "person", entityId: person.id, detail: { role, source: "roster" } }, now);
        }
      }

      for (const c of plan.changed) {
        const { active, ...fields } = c.changes;
        const set = Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, v.after]));
        if (Object.keys(set).length > 0) {
          await tx.update(people).set({ ...set, updatedAt: now }).where(and(eq(people.orgId, orgId), eq(people.id, c.personId)));
          await recordAudit(tx, { orgId, actorId, action: "person.updated", entityType: "person", entityId: c.personId, detail: { changed: fields, source: "roster" } }, now);
        }
        if (active) await applyActive(tx, orgId, actorId, c.personId, active.after === true, now, "roster");
        for (const role of c.rolesAdded) {
          await tx.insert(personRoles).values({ personId: c.personId, orgId, role, grantedBy: actorId, createdAt: now });
          await recordAudit(tx, { orgId, actorId, action: "role.granted", entityType: "person", entityId: c.personId, detail: { role, source: "roster" } }, now);
        }
      }

      for (const d of plan.deactivated) await applyActive(tx, orgId, actorId, d.personId, false, now, "roster");

      await recordAudit(
        tx,
        { orgId, actorId, action: "roster.imported", entityType: "roster", entityId: null, detail: { ...counts, fileSha256: preview.fileSha256, deactivateMissing: input.deactivateMissing } },
        now,
      );
      return { ok: true as const, counts, noChanges: false };
    });
  } catch (error) {
    // Two rows exchanging e-mails, or an admin saving the same address meanwhile: the unique
    // index stops it and the whole transaction rolls back.
    const target = uniqueViolation(error);
    if (target === "people.email" || target === "people.org_id, people.employee_id") {
      return {
        ok: false,
        reason: "problems",
        problems: [{ row: null, column: target === "people.email" ? "email" : "employee_id", message: `Two people would end up with the same ${target === "people.email" ? "e-mail address" : "employee id"} (for example two rows exchanging addresses). Change one in Tidemark first, then import again; nothing was imported.` }],
      };
    }
    throw error;
  }
}

