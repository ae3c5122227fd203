/**
 * Signing a check-off, acknowledging it and adding signed addenda (design reference: US 21 CFR
 * Part 11 §11.50 manifestation, §11.70 signature/record linking, §11.200 two components).
 * Each signature needs the signer's identity (the signed-in session, or their e-mail typed on
 * a shared tablet) and their own signing PIN; it stores the printed name, credential letters,
 * the instant and the organisation's time zone, the meaning, and the SHA-256 of the signed
 * content — so altering the record, or moving the signature to another, breaks the match.
 * The signature, the record change and the audit event commit in one transaction.
 */
import { createHash } from "node:crypto";
import { and, desc, eq, sql } from "drizzle-orm";
import type { Viewer } from "~/auth/context";
import { canAcknowledgeCheckoff, canAddAddendum, canSignCheckoff, type Actor } from "~/auth/checkoff-policy";
import { isRole } from "~/auth/roles";
import { hashPin, lockedUntil, MAX_PIN_FAILURES, PIN_LOCK_MINUTES, pinProblem, verifyPin } from "~/auth/signing-pin.server";
import { canonicalAddendumContent, canonicalCheckoffContent, signatureMeaning, signingProblems } from "~/domain/checkoffs/record";
import { calendarDateIn } from "~/domain/status/calendar-date";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { addenda, assignments, auditEvents, checkoffs, domainEvents, people, personRoles, requirements, signatures, type Signature } from "../schema";
import { issueCertificateSoon, type CheckoffSignedPayload } from "./certificates.server";
import { getCheckoffRecord, type CheckoffRecord } from "./checkoffs.server";
import type { WriteResult } from "./checkoffs-write.server";

const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");

/** The content hash of a check-off as it stands now (what its signatures must match). */
export function checkoffContentHash(record: Pick<CheckoffRecord, "checkoff" | "checklist" | "marks">): string {
  return sha256(
    canonicalCheckoffContent({
      checkoffId: record.checkoff.id,
      personId: record.checkoff.personId,
      checklistVersionId: record.checklist.versionId,
      steps: record.checklist.steps,
      marks: record.marks,
      outcome: record.checkoff.outcome,
      practicePlan: record.checkoff.practicePlan,
      practiceBy: record.checkoff.practiceBy,
    }),
  );
}

export function addendumContentHash(a: { addendumId: string; recordId: string; recordHash: string; authorId: string; text: string }): string {
  return sha256(canonicalAddendumContent(a));
}

/** Does each signature on the record still match the record's content? (§11.70) */
export function signaturesHold(record: CheckoffRecord): { signatureId: string; holds: boolean }[] {
  const now = checkoffContentHash(record);
  const out = record.signatures.map((s) => ({ signatureId: s.id, holds: s.contentHash === now && s.recordId === record.checkoff.id }));
  for (const a of record.addenda) {
    if (!a.signature || !record.checkoff.contentHash) continue;
    const expected = addendumContentHash({ addendumId: a.id, recordId: record.checkoff.id, recordHash: record.checkoff.contentHash, authorId: a.signature.signerId, text: a.text });
    out.push({ signatureId: a.signature.id, holds: a.signature.contentHash === expected });
  }
  return out;
}

// ── The signing PIN ─────────────────────────────────────────────────────────────────────────

export async function hasSigningPin(orgId: string, personId: string): Promise<boolean> {
  const { db } = await database();
  const [row] = await db.select({ hash: people.signingPinHash }).from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  return !!row?.hash;
}

/** Set once by the person; a second setting is refused (a reset is an admin's job, with an audit event). */
export async function setSigningPin(viewer: Viewer, pin: string, now = new Date()): Promise<WriteResult> {
  const problem = pinProblem(pin);
  if (problem) return { ok: false, status: 400, message: problem };
  const hash = await hashPin(pin);
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx.select({ hash: people.signingPinHash }).from(people).where(and(eq(people.orgId, viewer.org.id), eq(people.id, viewer.person.id)));
    if (row?.hash) return { ok: false as const, status: 409 as const, message: "Your signing PIN is already set." };
    await tx.update(people).set({ signingPinHash: hash, signingPinFailures: 0 }).where(and(eq(people.orgId, viewer.org.id), eq(people.id, viewer.person.id)));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "signing-pin.set", entityType: "person", entityId: viewer.person.id }, now);
    return { ok: true as const, value: undefined };
  });
}

type Signer = Actor & { name: string; credentialLetters: string | null; method: Signature["method"] };

/**
 * The first component: who signs. Their own session, or — on a shared tablet — the e-mail they
 * typed, looked up in the viewer's organisation only.
 */
async function resolveSigner(tx: Tx, viewer: Viewer, email: string | null): Promise<Signer | null> {
  const typed = email?.trim().toLowerCase() || null;
  const shared = !!typed && typed !== viewer.person.email.toLowerCase();
  const [person] = await tx
    .select({ id: people.id, name: people.name, credentialLetters: people.credentialLetters })
    .from(people)
    .where(and(eq(people.orgId, viewer.org.id), eq(people.active, true), shared ? sql`lower(${people.email}) = ${typed}` : eq(people.id, viewer.person.id)));
  if (!person) return null;
  const roles = (await tx.select({ role: personRoles.role }).from(personRoles).where(and(eq(personRoles.orgId, viewer.org.id), eq(personRoles.personId, person.id))))
    .map((r) => r.role)
    .filter(isRole);
  return { ...person, orgId: viewer.org.id, roles, method: shared ? "shared-device" : "own-session" };
}

const WRONG_SIGNER = "We could not confirm that signer: check the e-mail and the signing PIN.";

/** A refusal for a wrong PIN or an unknown signer: what the per-device limit counts. */
export function isWrongSigner(result: { ok: boolean; message?: string }): boolean {
  return !result.ok && !!result.message?.startsWith(WRONG_SIGNER);
}

/**
 * The second component: the signer's PIN, with five wrong tries locking signing for a while.
 * A wrong PIN is counted and audited in the caller's transaction, which then commits.
 */
async function checkPin(tx: Tx, viewer: Viewer, signer: Signer, pin: string, now: Date): Promise<WriteResult> {
  const [row] = await tx.select({ hash: people.signingPinHash, failures: people.signingPinFailures }).from(people).where(eq(people.id, signer.id));
  if (!row?.hash) {
    return { ok: false, status: 400, message: signer.method === "own-session" ? "Set your signing PIN first (Check-offs › Signing PIN)." : `${signer.name} has not set a signing PIN yet.` };
  }
  const [last] = await tx
    .select({ at: auditEvents.at })
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, "person"), eq(auditEvents.entityId, signer.id), eq(auditEvents.action, "signing-pin.wrong")))
    .orderBy(desc(auditEvents.seq))
    .limit(1);
  const until = lockedUntil(row.failures, last ? new Date(last.at) : null, now);
  if (until) return { ok: false, status: 409, message: `Signing is locked after ${MAX_PIN_FAILURES} wrong PINs. Try again after ${PIN_LOCK_MINUTES} minutes.` };
  // After a lock has run out, the count starts again.
  const failuresBefore = row.failures >= MAX_PIN_FAILURES ? 0 : row.failures;
  if (await verifyPin(pin, row.hash)) {
    if (row.failures !== 0) await tx.update(people).set({ signingPinFailures: 0 }).where(eq(people.id, signer.id));
    return { ok: true, value: undefined };
  }
  const failures = failuresBefore + 1;
  await tx.update(people).set({ signingPinFailures: failures }).where(eq(people.id, signer.id));
  await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "signing-pin.wrong", entityType: "person", entityId: signer.id, detail: { failures, method: signer.method } }, now);
  if (failures >= MAX_PIN_FAILURES) return { ok: false, status: 409, message: `Signing is locked after ${MAX_PIN_FAILURES} wrong PINs. Try again after ${PIN_LOCK_MINUTES} minutes.` };
  return { ok: false, status: 400, message: `${WRONG_SIGNER} ${MAX_PIN_FAILURES - failures} ${MAX_PIN_FAILURES - failures === 1 ? "try" : "tries"} left before signing locks.` };
}

export type SignInput = { email: string | null; pin: string };

async function insertSignature(
  tx: Tx,
  viewer: Viewer,
  signer: Signer,
  input: { recordType: Signature["recordType"]; recordId: string; meaning: string; contentHash: string },
  now: Date,
): Promise<Signature> {
  const [signature] = await tx
    .insert(signatures)
    .values({
      orgId: viewer.org.id,
      signerId: signer.id,
      recordType: input.recordType,
      recordId: input.recordId,
      meaning: input.meaning,
      printedName: signer.name,
      credentialLetters: signer.credentialLetters,
      signedAt: now,
      timeZone: viewer.org.timeZone,
      contentHash: input.contentHash,
      method: signer.method,
      createdAt: now,
    })
    .returning();
  return signature;
}

/** The preceptor signs the observed check-off; needs practice schedules a repeat. */
export async function signCheckoff(viewer: Viewer, checkoffId: string, input: SignInput, now = new Date()): Promise<WriteResult<{ repeatId: string | null }>> {
  const { write } = await database();
  const result = await write(async (tx) => {
    const record = await getCheckoffRecord(viewer.org.id, checkoffId, tx);
    if (!record) return { ok: false as const, status: 404 as const, message: "We could not find that check-off." };
    const signer = await resolveSigner(tx, viewer, input.email);
    if (!signer) return { ok: false as const, status: 400 as const, message: WRONG_SIGNER };
    if (signer.id === record.checkoff.personId) return { ok: false as const, status: 403 as const, message: "A person cannot sign their own check-off." };
    if (!canSignCheckoff(signer, record.checkoff)) return { ok: false as const, status: 403 as const, message: "This check-off cannot be signed by that person now." };
    const problems = signingProblems(record.checklist.steps, record.marks, record.checkoff, calendarDateIn(viewer.org.timeZone, now));
    if (problems.length > 0) return { ok: false as const, status: 400 as const, message: problems.join(" ") };
    const pin = await checkPin(tx, viewer, signer, input.pin, now);
    if (!pin.ok) return pin;

    const contentHash = checkoffContentHash(record);
    await tx
      .update(checkoffs)
      .set({ status: "signed", preceptorId: signer.id, contentHash, signedAt: now, updatedAt: now })
      .where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, checkoffId)));
    const meaning = signatureMeaning("observer", record.checkoff.outcome);
    const signature = await insertSignature(tx, viewer, signer, { recordType: "checkoff", recordId: checkoffId, meaning, contentHash }, now);
    let repeatId: string | null = null;
    if (record.checkoff.outcome === "needs-practice") {
      // The repeat: a new check-off of the same checklist version, asked for on the therapist's behalf.
      const [repeat] = await tx
        .insert(checkoffs)
        .values({ orgId: viewer.org.id, personId: record.checkoff.personId, checklistVersionId: record.checklist.versionId, assignmentId: record.checkoff.assignmentId, status: "requested", practiceBy: record.checkoff.practiceBy, createdAt: now, updatedAt: now })
        .returning({ id: checkoffs.id });
      repeatId = repeat.id;
      await recordAudit(tx, { orgId: viewer.org.id, actorId: signer.id, action: "checkoff.repeat-scheduled", entityType: "checkoff", entityId: repeat.id, detail: { after: checkoffId, practiceBy: record.checkoff.practiceBy } }, now);
    }
    await recordAudit(
      tx,
      { orgId: viewer.org.id, actorId: signer.id, action: "checkoff.signed", entityType: "checkoff", entityId: checkoffId, detail: { signatureId: signature.id, meaning, outcome: record.checkoff.outcome, contentHash, method: signer.method, repeatId } },
      now,
    );
    if (record.checkoff.outcome === "competent") await recordCompetentSigning(tx, viewer.org.id, record, signer, now);
    return { ok: true as const, value: { repeatId } };
  });
  // The certificate, once the signing has committed (its own write; the periodic sweep retries).
  if (result.ok) await issueCertificateSoon(checkoffId, now);
  return result;
}

/** The "checkoff.signed" event a certificate is issued from, in the signing's own transaction. */
async function recordCompetentSigning(tx: Tx, orgId: string, record: CheckoffRecord, signer: Signer, now: Date): Promise<void> {
  const [assignment] = record.checkoff.assignmentId
    ? await tx.select({ requirementId: assignments.requirementId }).from(assignments).where(and(eq(assignments.orgId, orgId), eq(assignments.id, record.checkoff.assignmentId)))
    : [];
  const [req] = assignment?.requirementId
    ? [{ id: assignment.requirementId }]
    : await tx
        .select({ id: requirements.id })
        .from(requirements)
        .where(and(eq(requirements.orgId, orgId), eq(requirements.checklistId, record.checklist.id), eq(requirements.active, true)))
        .limit(1);
  const payload: CheckoffSignedPayload = {
    checklistId: record.checklist.id,
    checklistVersionId: record.checklist.versionId,
    title: record.checklist.title,
    requirementId: req?.id ?? null,
    preceptorName: signer.credentialLetters ? `${signer.name}, ${signer.credentialLetters}` : signer.name,
    signedAt: now.toISOString(),
  };
  await tx
    .insert(domainEvents)
    .values({ orgId, kind: "checkoff.signed", subjectId: record.checkoff.id, personId: record.checkoff.personId, payload, createdAt: now })
    .onConflictDoNothing();
}

/** The therapist observed acknowledges the signed record, on their own device or the preceptor's tablet. */
export async function acknowledgeCheckoff(viewer: Viewer, checkoffId: string, input: SignInput, now = new Date()): Promise<WriteResult> {
  const { write } = await database();
  return write(async (tx) => {
    const record = await getCheckoffRecord(viewer.org.id, checkoffId, tx);
    if (!record) return { ok: false as const, status: 404 as const, message: "We could not find that check-off." };
    const signer = await resolveSigner(tx, viewer, input.email);
    if (!signer) return { ok: false as const, status: 400 as const, message: WRONG_SIGNER };
    if (!canAcknowledgeCheckoff(signer, record.checkoff)) return { ok: false as const, status: 403 as const, message: "Only the therapist observed acknowledges a signed check-off." };
    const pin = await checkPin(tx, viewer, signer, input.pin, now);
    if (!pin.ok) return pin;
    const contentHash = checkoffContentHash(record);
    await tx.update(checkoffs).set({ status: "acknowledged", acknowledgedAt: now, updatedAt: now }).where(and(eq(checkoffs.orgId, viewer.org.id), eq(checkoffs.id, checkoffId)));
    const meaning = signatureMeaning("acknowledgement", record.checkoff.outcome);
    const signature = await insertSignature(tx, viewer, signer, { recordType: "checkoff", recordId: checkoffId, meaning, contentHash }, now);
    await recordAudit(tx, { orgId: viewer.org.id, actorId: signer.id, action: "checkoff.acknowledged", entityType: "checkoff", entityId: checkoffId, detail: { signatureId: signature.id, meaning, contentHash, method: signer.method } }, now);
    return { ok: true as const, value: undefined };
  });
}

/** A correction to a signed record: never an edit, always a new signed addendum beside it. */
export async function addAddendum(viewer: Viewer, checkoffId: string, text: string, input: SignInput, now = new Date()): Promise<WriteResult> {
  const words = text.trim();
  if (!words) return { ok: false, status: 400, message: "Write the correction." };
  const { write } = await database();
  return write(async (tx) => {
    const record = await getCheckoffRecord(viewer.org.id, checkoffId, tx);
    if (!record || !record.checkoff.contentHash) return { ok: false as const, status: 404 as const, message: "We could not find that signed check-off." };
    const signer = await resolveSigner(tx, viewer, input.email);
    if (!signer) return { ok: false as const, status: 400 as const, message: WRONG_SIGNER };
    if (!canAddAddendum(signer, record.checkoff)) return { ok: false as const, status: 403 as const, message: "Only the preceptor who signed it or an educator adds an addendum." };
    const pin = await checkPin(tx, viewer, signer, input.pin, now);
    if (!pin.ok) return pin;
    const [addendum] = await tx.insert(addenda).values({ orgId: viewer.org.id, recordType: "checkoff", recordId: checkoffId, authorId: signer.id, text: words, createdAt: now }).returning();
    const contentHash = addendumContentHash({ addendumId: addendum.id, recordId: checkoffId, recordHash: record.checkoff.contentHash, authorId: signer.id, text: words });
    const meaning = signatureMeaning("addendum", null);
    const signature = await insertSignature(tx, viewer, signer, { recordType: "addendum", recordId: addendum.id, meaning, contentHash }, now);
    await recordAudit(tx, { orgId: viewer.org.id, actorId: signer.id, action: "checkoff.addendum", entityType: "checkoff", entityId: checkoffId, detail: { addendumId: addendum.id, signatureId: signature.id, contentHash, text: words } }, now);
    return { ok: true as const, value: undefined };
  });
}
