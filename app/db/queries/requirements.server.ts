/**
 * Requirements (what each unit or role must hold) and the regulatory references they cite.
 * References are editable text with a "last verified" date, kept in Admin: accreditation standards
 * are renumbered from time to time, so none is hard-coded (PRODUCT.md "Regulatory reference").
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
  role: string | null;
  lapseLeaves: "supervised" | "not-cleared";
  reference: { id: string; code: string; title: string; lastVerifiedOn: string | null } | null;
};

export async function listRequirements(orgId: string): Promise<RequirementView[]> {
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
      role: requirements.role,
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
    .where(and(eq(requirements.orgId, orgId), eq(requirements.active, true)))
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
    role: r.role,
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

export type RequirementEdit = { graceDays: number; regulatoryReferenceId: string | null; lapseLeaves: "supervised" | "not-cleared" };

/**
 * An educator or manager changes a requirement's grace period, cited reference and what a lapse
 * leaves on the Clearance board; audited with what changed. The reference must be the organisation's.
 */
export async function updateRequirement(orgId: string, actorId: string, requirementId: string, edit: RequirementEdit, now: Date = new Date()): Promise<"saved" | "not-found" | "bad-reference"> {
  const { db, write } = await database();
  const [before] = await db.select().from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
  if (!before) return "not-found";
  if (edit.regulatoryReferenceId) {
    const [ref] = await db.select({ id: regulatoryReferences.id }).from(regulatoryReferences).where(and(eq(regulatoryReferences.orgId, orgId), eq(regulatoryReferences.id, edit.regulatoryReferenceId)));
    if (!ref) return "bad-reference";
  }
  await write(async (tx) => {
    await tx.update(requirements).set({ ...edit, updatedAt: now }).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    for (const k of ["graceDays", "regulatoryReferenceId", "lapseLeaves"] as const) if (before[k] !== edit[k]) changed[k] = { from: before[k], to: edit[k] };
    await recordAudit(tx, { orgId, actorId, action: "requirement.updated", entityType: "requirement", entityId: requirementId, detail: { name: before.name, changed } }, now);
  });
  return "saved";
}
