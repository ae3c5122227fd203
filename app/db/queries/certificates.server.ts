/**
 * Certificates: issued from the domain events a passed exam or a signed competent check-off
 * leaves behind, read by their holder and the holder's managers, revoked by a manager, and
 * verified by anyone holding the code. Organisation id first, always the viewer's; every write
 * goes through the queue with its audit event.
 *
 * Issuing is idempotent: each event is turned into its certificate and marked processed in one
 * write transaction, and a certificate already standing for the same source is never doubled —
 * so the call after a grading, the call after a signing and the periodic sweep can overlap freely.
 */
import { randomBytes } from "node:crypto";
import { and, asc, desc, eq, isNull, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database, type Tx } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { certificates, domainEvents, organisations, people, requirements, type OrganisationSettings } from "~/db/schema";
import { certificateCodeFrom, certificateState, checkoffCertificateTitle, examCertificateTitle, normaliseCertificateCode, type CertificateState } from "~/domain/certificates/certificate";
import { calendarDateIn, type IsoDate } from "~/domain/status";
import { validThroughAfter } from "~/domain/status/plan";
import { mayActFor } from "./credentials.server";

/** What finishAttempt records with an "attempt.passed" event. */
type AttemptPassedPayload = { examId: string; examVersion: number; title: string; requirementId: string | null; scorePercent: number; passedAt: string };
/** What signCheckoff records with a "checkoff.signed" event (competent outcomes only). */
export type CheckoffSignedPayload = { checklistId: string; checklistVersionId: string; title: string; requirementId: string | null; preceptorName: string; signedAt: string };

type PendingEvent = typeof domainEvents.$inferSelect;

/** Who signs an exam certificate when the organisation has named no education lead. */
export function examSignerOf(org: { name: string; settings: OrganisationSettings }): string {
  return org.settings.educationLeadName?.trim() || `Education department, ${org.name}`;
}

/** A fresh code no certificate holds yet (60 random bits; the loop only guards a collision). */
async function freshCode(tx: Tx): Promise<string> {
  for (;;) {
    const code = certificateCodeFrom(randomBytes(8));
    const [taken] = await tx.select({ id: certificates.id }).from(certificates).where(eq(certificates.code, code));
    if (!taken) return code;
  }
}

async function recurrenceOf(tx: Tx, orgId: string, requirementId: string | null) {
  if (!requirementId) return null;
  const [req] = await tx.select({ id: requirements.id, recurrence: requirements.recurrence }).from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
  return req ?? null;
}

/** Issues the certificate one event stands for and marks it processed; false when already done. */
async function issueFor(tx: Tx, eventId: string, now: Date): Promise<boolean> {
  const [event] = await tx.select().from(domainEvents).where(and(eq(domainEvents.id, eventId), isNull(domainEvents.processedAt)));
  if (!event) return false;
  const markDone = () => tx.update(domainEvents).set({ processedAt: now }).where(eq(domainEvents.id, event.id));
  const sourceType = event.kind === "attempt.passed" ? ("attempt" as const) : ("checkoff" as const);
  const [org] = await tx.select().from(organisations).where(eq(organisations.id, event.orgId));
  const [already] = await tx
    .select({ id: certificates.id })
    .from(certificates)
    .where(and(eq(certificates.orgId, event.orgId), eq(certificates.sourceType, sourceType), eq(certificates.sourceId, event.subjectId)));
  if (!org || !event.personId || already) {
    await markDone();
    return false;
  }
  const draft = certificateDraft(event, org);
  const req = await recurrenceOf(tx, event.orgId, draft.requirementId);
  const issuedOn = calendarDateIn(org.timeZone, draft.completedAt);
  const [certificate] = await tx
    .insert(certificates)
    .values({
      orgId: event.orgId,
      personId: event.personId,
      requirementId: req?.id ?? null,
      sourceType,
      sourceId: event.subjectId,
      title: draft.title,
      code: await freshCode(tx),
      issuedOn,
      validThrough: validThroughAfter(issuedOn, req?.recurrence ?? null),
      signerName: draft.signerName,
      createdAt: now,
    })
    .returning();
  await markDone();
  await recordAudit(
    tx,
    {
      orgId: event.orgId,
      actorId: null,
      action: "certificate.issued",
      entityType: "certificate",
      entityId: certificate.id,
      detail: { personId: certificate.personId, sourceType, sourceId: event.subjectId, title: certificate.title, issuedOn, validThrough: certificate.validThrough },
    },
    now,
  );
  return true;
}

function certificateDraft(event: PendingEvent, org: typeof organisations.$inferSelect): { title: string; signerName: string; requirementId: string | null; completedAt: Date } {
  if (event.kind === "attempt.passed") {
    const p = event.payload as AttemptPassedPayload;
    return { title: examCertificateTitle(p.title, p.scorePercent), signerName: examSignerOf(org), requirementId: p.requirementId ?? null, completedAt: new Date(p.passedAt) };
  }
  const p = event.payload as CheckoffSignedPayload;
  return { title: checkoffCertificateTitle(p.title), signerName: p.preceptorName, requirementId: p.requirementId ?? null, completedAt: new Date(p.signedAt) };
}

/**
 * Turns every unprocessed domain event (or only those about `subjectId`) into its certificate,
 * one write transaction per event. Returns how many certificates were issued.
 */
export async function issuePendingCertificates(now = new Date(), filter: { subjectId?: string } = {}): Promise<number> {
  const { db, write } = await database();
  const where = [isNull(domainEvents.processedAt)];
  if (filter.subjectId) where.push(eq(domainEvents.subjectId, filter.subjectId));
  const pending = await db.select({ id: domainEvents.id }).from(domainEvents).where(and(...where)).orderBy(asc(domainEvents.createdAt));
  let issued = 0;
  for (const e of pending) if (await write((tx) => issueFor(tx, e.id, now))) issued++;
  return issued;
}

/**
 * After a grading or a signing has committed: issue its certificate now. A failure here must not
 * undo or fail what was already recorded, and the periodic sweep retries, so it is only logged.
 */
export async function issueCertificateSoon(subjectId: string, now = new Date()): Promise<void> {
  try {
    await issuePendingCertificates(now, { subjectId });
  } catch (error) {
    console.error("issuing a certificate failed; the sweep will retry", error);
  }
}

// ---- Reading ----------------------------------------------------------------------------------

export type CertificateRow = {
  id: string;
  personId: string;
  personName: string;
  title: string;
  code: string;
  issuedOn: IsoDate;
  validThrough: IsoDate | null;
  signerName: string;
  sourceType: "attempt" | "checkoff";
  revokedAt: string | null;
  revokedReason: string | null;
  revokedByName: string | null;
  state: CertificateState;
};

const revoker = alias(people, "revoker");

async function rowsWhere(orgId: string, today: IsoDate, extra: SQL) {
  const { db } = await database();
  const rows = await db
    .select({ c: certificates, holderName: people.name, revokedByName: revoker.name })
    .from(certificates)
    .innerJoin(people, and(eq(people.id, certificates.personId), eq(people.orgId, orgId)))
    .leftJoin(revoker, and(eq(revoker.id, certificates.revokedBy), eq(revoker.orgId, orgId)))
    .where(and(eq(certificates.orgId, orgId), extra))
    .orderBy(desc(certificates.issuedOn), desc(certificates.createdAt));
  return rows.map(
    ({ c, holderName, revokedByName }): CertificateRow => ({
      id: c.id,
      personId: c.personId,
      personName: holderName,
      title: c.title,
      code: c.code,
      issuedOn: c.issuedOn,
      validThrough: c.validThrough,
      signerName: c.signerName,
      sourceType: c.sourceType,
      revokedAt: c.revokedAt ? c.revokedAt.toISOString() : null,
      revokedReason: c.revokedReason,
      revokedByName,
      state: certificateState(c, today),
    }),
  );
}

/** A person's certificates, newest first (the caller has checked who may see them). */
export async function listCertificatesOf(orgId: string, personId: string, today: IsoDate): Promise<CertificateRow[]> {
  return rowsWhere(orgId, today, eq(certificates.personId, personId));
}

/** One certificate, only when `viewerId` is its holder or a manager of one of their units. */
export async function certificateFor(orgId: string, viewerId: string, canVerify: boolean, certificateId: string, today: IsoDate): Promise<CertificateRow | null> {
  const [row] = await rowsWhere(orgId, today, eq(certificates.id, certificateId));
  if (!row) return null;
  if (!(await mayActFor(orgId, viewerId, row.personId, canVerify))) return null;
  return row;
}

/** What the public verification page may show, and nothing more; null for an unknown code. */
export type VerifiedCertificate = { personName: string; title: string; issuedOn: IsoDate; validThrough: IsoDate | null; state: CertificateState; timeZone: string };

export async function verifyCertificateCode(rawCode: string, now = new Date()): Promise<VerifiedCertificate | null> {
  const code = normaliseCertificateCode(rawCode);
  if (!code) return null;
  const { db } = await database();
  const [row] = await db
    .select({ c: certificates, personName: people.name, timeZone: organisations.timeZone })
    .from(certificates)
    .innerJoin(people, eq(people.id, certificates.personId))
    .innerJoin(organisations, eq(organisations.id, certificates.orgId))
    .where(eq(certificates.code, code));
  if (!row) return null;
  const today = calendarDateIn(row.timeZone, now);
  return { personName: row.personName, title: row.c.title, issuedOn: row.c.issuedOn, validThrough: row.c.validThrough, state: certificateState(row.c, today), timeZone: row.timeZone };
}

// ---- Revoking ---------------------------------------------------------------------------------

export type RevokeOutcome = "revoked" | "already-revoked" | "not-found";

/**
 * A manager of the holder's units revokes a certificate with a reason (audited). Not their own:
 * a manager who holds a certificate is, for it, its holder.
 */
export async function revokeCertificate(orgId: string, managerId: string, certificateId: string, reason: string, now = new Date()): Promise<RevokeOutcome> {
  const { db, write } = await database();
  const [row] = await db.select({ personId: certificates.personId }).from(certificates).where(and(eq(certificates.orgId, orgId), eq(certificates.id, certificateId)));
  if (!row || row.personId === managerId || !(await mayActFor(orgId, managerId, row.personId, true))) return "not-found";
  return write(async (tx) => {
    const updated = await tx
      .update(certificates)
      .set({ revokedAt: now, revokedReason: reason, revokedBy: managerId })
      .where(and(eq(certificates.orgId, orgId), eq(certificates.id, certificateId), isNull(certificates.revokedAt)))
      .returning({ id: certificates.id });
    if (updated.length === 0) return "already-revoked" as const;
    await recordAudit(tx, { orgId, actorId: managerId, action: "certificate.revoked", entityType: "certificate", entityId: certificateId, detail: { personId: row.personId, reason } }, now);
    return "revoked" as const;
  });
}
