/**
 * A person's recent history for the Admin person page: the audit events about them in the
 * signed-in admin's organisation, with who did each.
 */
import { and, desc, eq } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database } from "../client.server";
import { auditEvents, people } from "../schema";

export type HistoryRow = { seq: number; at: string; action: string; actor: string | null; detail: Record<string, unknown> };

/** The last `limit` audit events about this person in this organisation, newest first. */
export async function personHistory(orgId: string, personId: string, limit = 20): Promise<HistoryRow[]> {
  const { db } = await database();
  const actor = alias(people, "actor");
  const rows = await db
    .select({ seq: auditEvents.seq, at: auditEvents.at, action: auditEvents.action, actor: actor.name, detail: auditEvents.detail })
    .from(auditEvents)
    .leftJoin(actor, and(eq(actor.id, auditEvents.actorId), eq(actor.orgId, orgId)))
    .where(and(eq(auditEvents.orgId, orgId), eq(auditEvents.entityType, "person"), eq(auditEvents.entityId, personId)))
    .orderBy(desc(auditEvents.seq))
    .limit(limit);
  return rows.map((r) => ({ ...r, detail: parseDetail(r.detail) }));
}

function parseDetail(text: string): Record<string, unknown> {
  try {
    const value: unknown = JSON.parse(text);
    return value && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
  } catch {
    return {};
  }
}
