/**
 * Changing a check-off before it is signed: asking for one, starting one, marking a step,
 * choosing the outcome, attaching evidence. Every write goes through the writer queue with its
 * audit event in the same transaction; every rule is the policy's (app/auth/checkoff-policy.ts).
 */
import { and, eq } from "drizzle-orm";
import type { Viewer } from "~/auth/context";
import { canAttachEvidence, canObserveCheckoff, canRequestCheckoff, canStartCheckoffFor, type Actor } from "~/auth/checkoff-policy";
import { storeScan } from "~/files/store.server";
import { allowedOutcomes, tallySteps, type Outcome, type StepResult } from "~/domain/checkoffs/record";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { checklists, checkoffEvidence, checkoffs, checkoffStepResults, people } from "../schema";
import { getCheckoffRecord, type CheckoffRecord } from "./checkoffs.server";

export function actorOf(viewer: Viewer): Actor {
  return { id: viewer.person.id, orgId: viewer.org.id, roles: viewer.roles };
}

export type WriteResult<T = undefined> = { ok: true; value: T } | { ok: false; status: 400 | 403 | 404 | 409; message: string };

const refused = (status: 400 | 403 | 404 | 409, message: string) => ({ ok: false as const, status, message });

async function currentVersionOf(tx: Tx, orgId: string, checklistId: string): Promise<string | null> {
  const [row] = await tx
    .select({ versionId: checklists.currentVersionId })
    .from(checklists)
    .where(and(eq(checklists.orgId, orgId), eq(checklists.id, checklistId), eq(checklists.status, "published")));
  return row?.versionId ?? null;
}

/** A therapist asks for a check-off of a published checklist. */
export async function requestCheckoff(viewer: Viewer, checklistId: string, now = new Date()): Promise<WriteResult<string>> {
  if (!canRequestCheckoff(actorOf(viewer))) return refused(403, "Only therapists ask for check-offs.");
  const { write } = await database();
  return write(async (tx) => {
    const versionId = await currentVersionOf(tx, viewer.org.id, checklistId);
    if (!versionId) return refused(404, "We could not find that checklist.");
    const [row] = await tx
      .insert(checkoffs)
      .values({ orgId: viewer.org.id, personId: viewer.person.id, checklistVersionId: versionId, status: "requested", createdAt: now, updatedAt: now })
      .returning({ id: checkoffs.id });
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.requested", entityType: "checkoff", entityId: row.id, detail: { checklistVersionId: versionId } }, now);
    return { ok: true as const, value: row.id };
  });
}

/** A preceptor starts a check-off of someone else at the bedside. */
export async function startCheckoffFor(viewer: Viewer, personId: string, checklistId: string, now = new Date()): Promise<WriteResult<string>> {
  if (!canStartCheckoffFor(actorOf(viewer), personId)) return refused(403, "You cannot observe your own check-off.");
  const { write } = await database();
  return write(async (tx) => {
    const [person] = await tx.select({ id: people.id }).from(people).where(and(eq(people.orgId, viewer.org.id), eq(people.id, personId), eq(people.active, true)));
    if (!person) return refused(404, "We could not find that person.");
    const versionId = await currentVersionOf(tx, viewer.org.id, checklistId);
    if (!versionId) return refused(404, "We could not find that checklist.");
    const [row] = await tx
      .insert(checkoffs)
      .values({ orgId: viewer.org.id, personId, checklistVersionId: versionId, preceptorId: viewer.person.id, status: "in-progress", startedAt: now, createdAt: now, updatedAt: now })
      .returning({ id: checkoffs.id });
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.started", entityType: "checkoff", entityId: row.id, detail: { personId, checklistVersionId: versionId } }, now);
    return { ok: true as const, value: row.id };
  });
}

/** Loads the record inside the transaction and checks the observer may still change it. */
async function openForObserver(tx: Tx, viewer: Viewer, checkoffId: string): Promise<CheckoffRecord | WriteResult<never>> {
  const record = await getCheckoffRecord(viewer.org.id, checkoffId, tx);
  if (!record) return refused(404, "We could not find that check-off.");
  if (!canObserveCheckoff(actorOf(viewer), record.checkoff)) {
    return refused(record.checkoff.status === "signed" || record.checkoff.status === "acknowledged" ? 409 : 403, "This check-off is signed or not yours to observe: it cannot be changed. Add a signed addendum instead.");
  }
  return record;
}

const isRefusal = (v: CheckoffRecord | WriteResult<never>): v is WriteResult<never> => "ok" in v;

/** The first mark takes the check-off into progress with this preceptor. */
async function claim(tx: Tx, viewer: Viewer, record: CheckoffRecord, now: Date) {
  if (record.checkoff.status === "requested") {
    await tx
      .update(checkoffs)
      .set({ status: "in-progress", preceptorId: viewer.person.id, startedAt: now, updatedAt: now })
      .where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, record.checkoff.id)));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.started", entityType: "checkoff", entityId: record.checkoff.id, detail: {} }, now);
  } else {
    await tx.update(checkoffs).set({ updatedAt: now }).where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, record.checkoff.id)));
  }
}

export async function startRequested(viewer: Viewer, checkoffId: string, now = new Date()): Promise<WriteResult> {
  const { write } = await database();
  return write(async (tx) => {
    const record = await openForObserver(tx, viewer, checkoffId);
    if (isRefusal(record)) return record;
    await claim(tx, viewer, record, now);
    return { ok: true as const, value: undefined };
  });
}

/** One tap at the bedside: a step met, not met or not applicable, with an optional comment. */
export async function markStep(
  viewer: Viewer,
  checkoffId: string,
  input: { stepIndex: number; result: StepResult; comment: string | null },
  now = new Date(),
): Promise<WriteResult> {
  const { write } = await database();
  return write(async (tx) => {
    const record = await openForObserver(tx, viewer, checkoffId);
    if (isRefusal(record)) return record;
    if (input.stepIndex < 0 || input.stepIndex >= record.checklist.steps.length) return refused(400, "That step is not on this checklist.");
    await claim(tx, viewer, record, now);
    const comment = input.comment?.trim() ? input.comment.trim() : null;
    await tx
      .insert(checkoffStepResults)
      .values({ orgId: viewer.org.id, checkoffId, stepIndex: input.stepIndex, result: input.result, comment, updatedAt: now })
      .onConflictDoUpdate({ target: [checkoffStepResults.checkoffId, checkoffStepResults.stepIndex], set: { result: input.result, comment, updatedAt: now } });
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.step-marked", entityType: "checkoff", entityId: checkoffId, detail: { step: input.stepIndex + 1, result: input.result, comment } }, now);
    // A needs-practice outcome chosen earlier stays; a competent one the new mark rules out is cleared.
    const marks = [...record.marks.filter((m) => m.stepIndex !== input.stepIndex), { ...input, comment }];
    if (record.checkoff.outcome && !allowedOutcomes(tallySteps(record.checklist.steps, marks)).includes(record.checkoff.outcome)) {
      await tx.update(checkoffs).set({ outcome: null }).where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, checkoffId)));
    }
    return { ok: true as const, value: undefined };
  });
}

/** The preceptor's judgement before signing: outcome, and for needs practice a plan and a date. */
export async function setOutcome(
  viewer: Viewer,
  checkoffId: string,
  input: { outcome: Outcome; practicePlan: string | null; practiceBy: string | null },
  now = new Date(),
): Promise<WriteResult> {
  const { write } = await database();
  return write(async (tx) => {
    const record = await openForObserver(tx, viewer, checkoffId);
    if (isRefusal(record)) return record;
    if (!allowedOutcomes(tallySteps(record.checklist.steps, record.marks)).includes(input.outcome)) {
      return refused(400, "A critical step was not met, so the outcome is needs practice.");
    }
    await claim(tx, viewer, record, now);
    const needsPractice = input.outcome === "needs-practice";
    await tx
      .update(checkoffs)
      .set({ outcome: input.outcome, practicePlan: needsPractice ? input.practicePlan : null, practiceBy: needsPractice ? input.practiceBy : null, updatedAt: now })
      .where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, checkoffId)));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.outcome-chosen", entityType: "checkoff", entityId: checkoffId, detail: input }, now);
    return { ok: true as const, value: undefined };
  });
}

/**
 * Evidence: checked by content and stored by the files module, its row and audit event in one
 * transaction. A refused file writes nothing (the check runs before any byte reaches disk).
 */
export async function attachEvidence(viewer: Viewer, checkoffId: string, upload: { bytes: Uint8Array; name: string } | null, now = new Date()): Promise<WriteResult> {
  const { write } = await database();
  return write(async (tx) => {
    const record = await getCheckoffRecord(viewer.org.id, checkoffId, tx);
    if (!record || !canAttachEvidence(actorOf(viewer), record.checkoff)) return refused(404, "We could not find that check-off.");
    const stored = await storeScan(tx, { orgId: viewer.org.id, ownerId: record.person.id, purpose: "other", bytes: upload?.bytes ?? null, originalName: upload?.name });
    if (!stored.ok) return refused(400, upload ? stored.message.replace(/^The file/, upload.name || "The file") : stored.message);
    await tx.insert(checkoffEvidence).values({ orgId: viewer.org.id, checkoffId, fileId: stored.file.id, uploadedBy: viewer.person.id, createdAt: now });
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checkoff.evidence-attached", entityType: "checkoff", entityId: checkoffId, detail: { fileId: stored.file.id, sha256: stored.file.sha256, name: stored.file.originalName } }, now);
    return { ok: true as const, value: undefined };
  });
}
