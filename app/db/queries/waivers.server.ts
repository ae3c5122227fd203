/**
 * A manager's waivers and due-date extensions: each written through the queue with its audit
 * event (who, why, until when), so Team and My plan show them as such.
 */
import { and, eq, isNull } from "drizzle-orm";
import { database } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { extensions, requirements, waivers } from "~/db/schema";

async function requirementOf(orgId: string, requirementId: string) {
  const { db } = await database();
  const [row] = await db.select({ id: requirements.id, name: requirements.name }).from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.id, requirementId)));
  return row ?? null;
}

export async function grantWaiver(orgId: string, managerId: string, input: { personId: string; requirementId: string; reason: string; endsOn: string }, now: Date = new Date()): Promise<boolean> {
  const req = await requirementOf(orgId, input.requirementId);
  if (!req) return false;
  const { write } = await database();
  await write(async (tx) => {
    const [row] = await tx.insert(waivers).values({ orgId, personId: input.personId, requirementId: req.id, reason: input.reason, endsOn: input.endsOn, grantedBy: managerId }).returning({ id: waivers.id });
    await recordAudit(tx, { orgId, actorId: managerId, action: "waiver.granted", entityType: "waiver", entityId: row.id, detail: { personId: input.personId, requirement: req.name, reason: input.reason, endsOn: input.endsOn } }, now);
  });
  return true;
}

export async function grantExtension(orgId: string, managerId: string, input: { personId: string; requirementId: string; reason: string; newDueOn: string }, now: Date = new Date()): Promise<boolean> {
  const req = await requirementOf(orgId, input.requirementId);
  if (!req) return false;
  const { write } = await database();
  await write(async (tx) => {
    const [row] = await tx.insert(extensions).values({ orgId, personId: input.personId, requirementId: req.id, reason: input.reason, newDueOn: input.newDueOn, grantedBy: managerId }).returning({ id: extensions.id });
    await recordAudit(tx, { orgId, actorId: managerId, action: "extension.granted", entityType: "extension", entityId: row.id, detail: { personId: input.personId, requirement: req.name, reason: input.reason, newDueOn: input.newDueOn } }, now);
  });
  return true;
}

/**
 * Ends a waiver before its date (the person no longer needs it, or it was granted in error). The
 * row stays, marked revoked, so the record shows it was once in force; audited like the grant.
 */
export async function revokeWaiver(
  orgId: string,
  managerId: string,
  input: { waiverId: string; personId: string; requirementId: string; reason: string },
  now: Date = new Date(),
): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx
      .update(waivers)
      .set({ revokedAt: now })
      .where(
        and(
          eq(waivers.orgId, orgId),
          eq(waivers.id, input.waiverId),
          eq(waivers.personId, input.personId),
          eq(waivers.requirementId, input.requirementId),
          isNull(waivers.revokedAt),
        ),
      )
      .returning({ id: waivers.id, endsOn: waivers.endsOn });
    if (!row) return false;
    await recordAudit(tx, { orgId, actorId: managerId, action: "waiver.revoked", entityType: "waiver", entityId: row.id, detail: { personId: input.personId, requirementId: input.requirementId, reason: input.reason, wasThrough: row.endsOn } }, now);
    return true;
  });
}
