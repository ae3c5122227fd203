import { createHash } from "node:crypto";
import { asc, desc } from "drizzle-orm";
import type { DbOrTx, Tx } from "./client.server";
import { auditEvents, type AuditEvent } from "./schema";

export const GENESIS_HASH = "0".repeat(64);

export type AuditInput = {
  orgId: string | null;
  actorId: string | null;
  action: string;
  entityType: string;
  entityId?: string | null;
  detail?: Record<string, unknown>;
};

type HashedFields = Pick<AuditEvent, "orgId" | "actorId" | "action" | "entityType" | "entityId" | "detail" | "at" | "prevHash">;

/** SHA-256 over the event's fields in a fixed order, chained to the previous event's hash. */
export function hashEvent(e: HashedFields): string {
  const canonical = JSON.stringify([e.prevHash, e.orgId, e.actorId, e.action, e.entityType, e.entityId, e.detail, e.at]);
  return createHash("sha256").update(canonical).digest("hex");
}

/**
 * Appends an event inside the caller's write transaction, so the record and its audit event
 * commit or fail together. Writes are serialised by the writer queue, so the chain's tail read
 * here is the true tail.
 */
export async function recordAudit(tx: Tx, input: AuditInput, now: Date = new Date()): Promise<AuditEvent> {
  const [last] = await tx.select({ hash: auditEvents.hash }).from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
  const fields: HashedFields = {
    orgId: input.orgId,
    actorId: input.actorId,
    action: input.action,
    entityType: input.entityType,
    entityId: input.entityId ?? null,
    detail: JSON.stringify(input.detail ?? {}),
    at: now.toISOString(),
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  const [row] = await tx.insert(auditEvents).values({ ...fields, hash: hashEvent(fields) }).returning();
  return row;
}

export type ChainVerdict = { whole: true; count: number } | { whole: false; count: number; brokenAt: AuditEvent; reason: string };

/** Walks the chain in order; reports the first event whose hash or link does not hold. */
export async function verifyAuditChain(db: DbOrTx): Promise<ChainVerdict> {
  const rows = await db.select().from(auditEvents).orderBy(asc(auditEvents.seq));
  let prev = GENESIS_HASH;
  for (const row of rows) {
    if (row.prevHash !== prev) {
      return { whole: false, count: rows.length, brokenAt: row, reason: "its link to the previous event does not match (an event was removed or reordered)" };
    }
    if (hashEvent(row) !== row.hash) {
      return { whole: false, count: rows.length, brokenAt: row, reason: "its content does not match its hash (the event was changed)" };
    }
    prev = row.hash;
  }
  return { whole: true, count: rows.length };
}
