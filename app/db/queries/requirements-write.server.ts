/**
 * Requirement writes from Team → Requirements (educators and managers): create one, change its
 * recurrence, audience, grace period, cited reference and what a lapse leaves, retire it and
 * bring it back. Everything it names (exam, check-off, credential type, unit, reference) must be
 * the organisation's own; every write goes through the writer queue with its audit event, so the
 * cached Team pages are dropped on commit (app/db/read-cache.server.ts).
 *
 * Retiring sets `active = false` and deletes nothing: completions, waivers, extensions and the
 * audit trail stay. Plans, the Team matrix and the counts read active requirements only.
 */
import { and, eq, ne, sql } from "drizzle-orm";
import type { AUDIENCE_ROLES, RECURRENCES as FORM_RECURRENCES, RequirementCreateInput } from "~/routes/team/requirement-schema";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { checklists, credentialTypes, exams, regulatoryReferences, requirements, units, type RECURRENCES } from "../schema";

// The form's list of recurrences is a copy of the schema's (the browser bundle stays free of the
// schema): this stops compiling if the two ever differ.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const recurrencesAgree: Same<(typeof RECURRENCES)[number], (typeof FORM_RECURRENCES)[number]> = true;
void recurrencesAgree;

type Recurrence = (typeof RECURRENCES)[number];
type AudienceRole = (typeof AUDIENCE_ROLES)[number];

/** A refusal that belongs beside one field of the form. */
export type FieldRefusal = { field: string; message: string };
export type WriteOutcome = { ok: true; id: string } | { ok: false; notFound: true } | ({ ok: false; notFound?: false } & FieldRefusal);

const refuse = (field: string, message: string): WriteOutcome => ({ ok: false, field, message });

/** Case and surrounding spaces do not make a different requirement ("Annual exam" = "annual exam "). */
async function nameTaken(tx: Tx, orgId: string, name: string, exceptId: string | null): Promise<boolean> {
  const [row] = await tx
    .select({ id: requirements.id })
    .from(requirements)
    .where(
      and(
        eq(requirements.orgId, orgId),
        eq(requirements.active, true),
        sql`lower(trim(${requirements.name})) = lower(trim(${name}))`,
        exceptId ? ne(requirements.id, exceptId) : undefined,
      ),
    )
    .limit(1);
  return !!row;
}

const takenMessage = (name: string) => `An active requirement is already called “${name.trim()}”. Choose another name, or change that one.`;

async function checkReference(orgId: string, referenceId: string | null): Promise<FieldRefusal | null> {
  if (!referenceId) return null;
  const { db } = await database();
  const [ref] = await db.select({ id: regulatoryReferences.id }).from(regulatoryReferences).where(and(eq(regulatoryReferences.orgId, orgId), eq(regulatoryReferences.id, referenceId)));
  return ref ? null : { field: "regulatoryReferenceId", message: "Choose one of your organisation's references." };
}

/** A unit must be the organisation's and active — unless it is the one the requirement already names. */
async function checkUnit(orgId: string, unitId: string | null, keeping: string | null = null): Promise<FieldRefusal | null> {
  if (!unitId) return null;
  const { db } = await database();
  const [unit] = await db.select({ id: units.id, active: units.active }).from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
  if (!unit) return { field: "unitId", message: "Choose one of your organisation's units." };
  if (!unit.active && unit.id !== keeping) return { field: "unitId", message: "That unit is deactivated; choose an active unit." };
  return null;
}

/** The exam or check-off must be the organisation's and published; the credential type the organisation's. */
async function checkTarget(orgId: string, input: RequirementCreateInput): Promise<FieldRefusal | null> {
  const { db } = await database();
  if (input.kind === "exam") {
    const [exam] = await db.select({ status: exams.status }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.id, input.examId!)));
    if (!exam) return { field: "examId", message: "Choose one of your organisation's exams." };
    if (exam.status !== "published") return { field: "examId", message: "That exam is not published; publish it in the Bank first, or choose a published one." };
    return null;
  }
  if (input.kind === "checklist") {
    const [list] = await db.select({ status: checklists.status }).from(checklists).where(and(eq(checklists.orgId, orgId), eq(checklists.id, input.checklistId!)));
    if (!list) return { field: "checklistId", message: "Choose one of your organisation's check-offs." };
    if (list.status !== "published") return { field: "checklistId", message: "That check-off is not published; choose a published one." };
    return null;
  }
  const [type] = await db.select({ id: credentialTypes.id }).from(credentialTypes).where(and(eq(credentialTypes.orgId, orgId), eq(credentialTypes.id, input.credentialTypeId!)));
  return type ? null : { field: "credentialTypeId", message: "Choose one of your organisation's credential types." };
}

/** A new requirement; the form schema has already checked that kind, target and recurrence agree. */
export async function createRequirement(orgId: string, actorId: string, input: RequirementCreateInput, now: Date = new Date()): Promise<WriteOutcome> {
  const refusal = (await checkTarget(orgId, input)) ?? (await checkUnit(orgId, input.unitId)) ?? (await checkReference(orgId, input.regulatoryReferenceId));
  if (refusal) return { ok: false, ...refusal };
  const { write } = await database();
  const values = {
    orgId,
    name: input.name.trim(),
    kind: input.kind,
    examId: input.kind === "exam" ? input.examId : null,
    checklistId: input.kind === "checklist" ? input.checklistId : null,
    credentialTypeId: input.kind === "credential" ? input.credentialTypeId : null,
    recurrence: input.kind === "credential" ? null : input.recurrence,
    graceDays: input.graceDays,
    unitId: input.unitId,
    role: input.role,
    regulatoryReferenceId: input.regulatoryReferenceId,
    lapseLeaves: input.lapseLeaves,
    active: true,
    createdAt: now,
    updatedAt: now,
  };
  return write(async (tx) => {
    // Checked inside the queue, so two people adding the same name at once cannot both succeed.
    if (await nameTaken(tx, orgId, values.name, null)) return refuse("name", takenMessage(values.name));
    const [row] = await tx.insert(requirements).values(values).returning({ id: requirements.id });
    const { orgId: _org, createdAt: _c, updatedAt: _u, ...detail } = values;
    await recordAudit(tx, { orgId, actorId, action: "requirement.created", entityType: "requirement", entityId: row.id, detail }, now);
    return { ok: true, id: row.id } as const;
  });
}

export type RequirementEdit = {
  recurrence: Recurrence | null;
  graceDays: number;
  unitId: string | null;
  role: AudienceRole | null;
  regulatoryReferenceId: string | null;
  lapseLeaves: "supervised" | "not-cleared";
};

/**
 * Changes a requirement's recurrence, audience (unit and role; both empty = everyone), grace
 * period, cited reference and what a lapse leaves; audited with what changed. Kind and what it
 * asks for stay as created. A retired requirement is changed only after it is brought back.
 */
export async function updateRequirement(orgId: string, actorId: string, requirementId: string, edit: RequirementEdit, now: Date = new Date()): Promise<WriteOutcome> {
  const { db, write } = await database();
  const [before] = await db.select().from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
  if (!before || !before.active) return { ok: false, notFound: true };
  if (before.kind !== "credential" && !edit.recurrence) return refuse("recurrence", "Choose how often it recurs.");
  const next = { ...edit, recurrence: before.kind === "credential" ? null : edit.recurrence };
  const refusal = (await checkUnit(orgId, next.unitId, before.unitId)) ?? (await checkReference(orgId, next.regulatoryReferenceId));
  if (refusal) return { ok: false, ...refusal };
  await write(async (tx) => {
    await tx.update(requirements).set({ ...next, updatedAt: now }).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    for (const k of ["recurrence", "graceDays", "unitId", "role", "regulatoryReferenceId", "lapseLeaves"] as const) if (before[k] !== next[k]) changed[k] = { from: before[k], to: next[k] };
    await recordAudit(tx, { orgId, actorId, action: "requirement.updated", entityType: "requirement", entityId: requirementId, detail: { name: before.name, changed } }, now);
  });
  return { ok: true, id: requirementId };
}

/**
 * Retires a requirement (active = false) or brings it back. Nothing about people is deleted:
 * their completions, waivers and extensions stay and count again if it returns. Bringing one back
 * is refused while another active requirement has its name.
 */
export async function setRequirementActive(orgId: string, actorId: string, requirementId: string, active: boolean, now: Date = new Date()): Promise<WriteOutcome> {
  const { write } = await database();
  return write(async (tx) => {
    const [before] = await tx.select().from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
    if (!before) return { ok: false, notFound: true } as const;
    if (before.active === active) return { ok: true, id: requirementId } as const;
    if (active && (await nameTaken(tx, orgId, before.name, requirementId))) return refuse("requirementId", takenMessage(before.name));
    await tx.update(requirements).set({ active, updatedAt: now }).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
    await recordAudit(
      tx,
      { orgId, actorId, action: active ? "requirement.restored" : "requirement.retired", entityType: "requirement", entityId: requirementId, detail: { name: before.name, kind: before.kind } },
      now,
    );
    return { ok: true, id: requirementId } as const;
  });
}
