/** A check-off's audit history (every event about it, oldest first) and the check-offs to choose from. */
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { database } from "../client.server";
import { auditEvents, checklists, checklistVersions, checkoffs, people } from "../schema";

export type CheckoffHistoryRow = { seq: number; at: string; action: string; actor: string | null; detail: string; hash: string };

export async function checkoffHistory(orgId: string, checkoffId: string): Promise<CheckoffHistoryRow[]> {
  const { db } = await database();
  const actor = alias(people, "actor");
  return db
    .select({ seq: auditEvents.seq, at: auditEvents.at, action: auditEvents.action, actor: actor.name, detail: auditEvents.detail, hash: auditEvents.hash })
    .from(auditEvents)
    .leftJoin(actor, and(eq(actor.id, auditEvents.actorId), eq(actor.orgId, orgId)))
    .where(and(eq(auditEvents.orgId, orgId), eq(auditEvents.entityType, "checkoff"), eq(auditEvents.entityId, checkoffId)))
    .orderBy(asc(auditEvents.seq));
}

export type SignedCheckoffOption = { id: string; label: string };

/** Recent signed check-offs of the organisation, for the history picker. */
export async function recentSignedCheckoffs(orgId: string, limit = 50): Promise<SignedCheckoffOption[]> {
  const { db } = await database();
  const rows = await db
    .select({ id: checkoffs.id, person: people.name, title: checklists.title, signedAt: checkoffs.signedAt })
    .from(checkoffs)
    .innerJoin(people, eq(people.id, checkoffs.personId))
    .innerJoin(checklistVersions, eq(checklistVersions.id, checkoffs.checklistVersionId))
    .innerJoin(checklists, eq(checklists.id, checklistVersions.checklistId))
    .where(and(eq(checkoffs.orgId, orgId), inArray(checkoffs.status, ["signed", "acknowledged"])))
    .orderBy(desc(checkoffs.signedAt))
    .limit(limit);
  return rows.map((r) => ({ id: r.id, label: `${r.person} — ${r.title}` }));
}
