/**
 * Requirements (what each unit or role must hold) and the regulatory references they cite.
 * References are editable text with a "last verified" date, kept in Admin: accreditation standards
 * are renumbered from time to time, so none is hard-coded (PRODUCT.md "Regulatory reference").
 * Creating, changing, retiring and bringing back a requirement: requirements-write.server.ts.
 */
import { and, asc, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { checklists, credentialTypes, exams, regulatoryReferences, requirements, units } from "~/db/schema";
import { isStoredRule, type CredentialTerms } from "~/domain/validity";

export type RequirementView = {
  id: string;
  name: string;
  kind: "exam" | "checklist" | "credential";
  what: string | null;
  terms: CredentialTerms | null;
  recurrence: string | null;
  graceDays: number;
  unit: string | null;
  unitId: string | null;
  role: string | null;
  active: boolean;
  lapseLeaves: "supervised" | "not-cleared";
  reference: { id: string; code: string; title: string; lastVerifiedOn: string | null } | null;
};

/** The organisation's requirements by name: the active ones, or with `includeRetired` the retired ones too. */
export async function listRequirements(orgId: string, { includeRetired = false }: { includeRetired?: boolean } = {}): Promise<RequirementView[]> {
  const { db } = await database();
  const ref = alias(regulatoryReferences, "ref");
  const rows = await db
    .select({
      id: requirements.id,
      name: requirements.name,
      kind: requirements.kind,
      examTitle: exams.title,
      checklistTitle: checklists.title,
      typeName: credentialTypes.name,
      rule: credentialTypes.rule,
      neverBefore: credentialTypes.neverExpiresIfIssuedBefore,
      reinstatementMonths: credentialTypes.reinstatementMonths,
      recurrence: requirements.recurrence,
      graceDays: requirements.graceDays,
      unit: units.name,
      unitId: requirements.unitId,
      role: requirements.role,
      active: requirements.active,
      lapseLeaves: requirements.lapseLeaves,
      refId: ref.id,
      refCode: ref.code,
      refTitle: ref.title,
      refVerified: ref.lastVerifiedOn,
    })
    .from(requirements)
    .leftJoin(exams, and(eq(exams.id, requirements.examId), eq(exams.orgId, orgId)))
    .leftJoin(checklists, and(eq(checklists.id, requirements.checklistId), eq(checklists.orgId, orgId)))
    .leftJoin(credentialTypes, and(eq(credentialTypes.id, requirements.credentialTypeId), eq(credentialTypes.orgId, orgId)))
    .leftJoin(units, and(eq(units.id, requirements.unitId), eq(units.orgId, orgId)))
    .leftJoin(ref, and(eq(ref.id, requirements.regulatoryReferenceId), eq(ref.orgId, orgId)))
    .where(and(eq(requirements.orgId, orgId), includeRetired ? undefined : eq(requirements.active, true)))
    .orderBy(asc(requirements.name));
  return rows.map((r) => ({
    id: r.id,
    name: r.name,
    kind: r.kind,
    what: r.examTitle ?? r.checklistTitle ?? r.typeName,
    terms: r.kind === "credential" && isStoredRule(r.rule) ? { rule: r.rule, neverExpiresIfIssuedBefore: r.neverBefore, reinstatementMonths: r.reinstatementMonths } : null,
    recurrence: r.recurrence,
    graceDays: r.graceDays,
    unit: r.unit,
    unitId: r.unitId,
    role: r.role,
    active: r.active,
    lapseLeaves: r.lapseLeaves,
    reference: r.refId && r.refCode ? { id: r.refId, code: r.refCode, title: r.refTitle ?? "", lastVerifiedOn: r.refVerified } : null,
  }));
}

export type ReferenceRow = typeof regulatoryReferences.$inferSelect;

export async function listReferences(orgId: string): Promise<ReferenceRow[]> {
  const { db } = await database();
  return db.select().from(regulatoryReferences).where(eq(regulatoryReferences.orgId, orgId)).orderBy(asc(regulatoryReferences.code));
}

export type ReferenceInput = { code: string; title: string; body: string; lastVerifiedOn: string | null };

/** Edits a reference's text and "last verified" date; audited with what changed. */
export async function updateReference(orgId: string, actorId: string, referenceId: string, input: ReferenceInput, now: Date = new Date()): Promise<boolean> {
  const { db, write } = await database();
  const [before] = await db.select().from(regulatoryReferences).where(and(eq(regulatoryReferences.orgId, orgId), eq(regulatoryReferences.id, referenceId)));
  if (!before) return false;
  await write(async (tx) => {
    await tx
      .update(regulatoryReferences)
      .set({ ...input, updatedAt: now })
      .where(and(eq(regulatoryReferences.orgId, orgId), eq(regulatoryReferences.id, referenceId)));
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    for (const k of ["code", "title", "body", "lastVerifiedOn"] as const) if (before[k] !== input[k]) changed[k] = { from: before[k], to: input[k] };
    await recordAudit(tx, { orgId, actorId, action: "regulatory-reference.updated", entityType: "regulatory_reference", entityId: referenceId, detail: { changed } }, now);
  });
  return true;
}

export type RequirementChoices = {
  exams: { id: string; title: string }[];
  checklists: { id: string; title: string }[];
  credentialTypes: { id: string; name: string }[];
  units: { id: string; name: string; active: boolean }[];
};

/**
 * What a new requirement can ask for and whom it can be aimed at: the organisation's own
 * published exams and check-offs, its credential types and its units (inactive ones too, so a
 * requirement that still names one shows it; the form offers only active ones for a change).
 */
export async function listRequirementChoices(orgId: string): Promise<RequirementChoices> {
  const { db } = await database();
  const [examRows, checklistRows, typeRows, unitRows] = await Promise.all([
    db.select({ id: exams.id, title: exams.title }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.status, "published"))).orderBy(asc(exams.title)),
    db.select({ id: checklists.id, title: checklists.title }).from(checklists).where(and(eq(checklists.orgId, orgId), eq(checklists.status, "published"))).orderBy(asc(checklists.title)),
    db.select({ id: credentialTypes.id, name: credentialTypes.name }).from(credentialTypes).where(eq(credentialTypes.orgId, orgId)).orderBy(asc(credentialTypes.name)),
    db.select({ id: units.id, name: units.name, active: units.active }).from(units).where(eq(units.orgId, orgId)).orderBy(asc(units.name)),
  ]);
  return { exams: examRows, checklists: checklistRows, credentialTypes: typeRows, units: unitRows };
}
