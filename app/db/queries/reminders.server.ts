/**
 * Reminders for the pages: an organisation's policy (Admin → Reminders, audited), a person's
 * choice of separate e-mails or one daily digest (My plan → Reminders, audited), and what the
 * job did lately. Every function takes the signed-in viewer's organisation id first. The job
 * itself is reminder-job.server.ts; its in-app timer reminder-schedule.server.ts.
 */
import { and, desc, eq } from "drizzle-orm";
import { policyFromSettings, settingsFromPolicy, type ReminderPolicy } from "~/domain/reminders";
import { recordAudit } from "../audit.server";
import { database } from "../client.server";
import { managerDigests, organisations, people, reminderRuns, reminders, requirements } from "../schema";

export type ReminderDelivery = "each" | "digest";

export async function getReminderPolicy(orgId: string): Promise<ReminderPolicy | null> {
  const { db } = await database();
  const [org] = await db.select({ settings: organisations.settings }).from(organisations).where(eq(organisations.id, orgId));
  return org ? policyFromSettings(org.settings) : null;
}

/**
 * Saves the policy into the organisation's settings (merged: the settings JSON is shared with
 * other sections) with an audit event of before and after. Returns false when nothing changed
 * (nothing written, no event).
 */
export async function saveReminderPolicy(orgId: string, actorId: string, policy: ReminderPolicy, now: Date = new Date()): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const [org] = await tx.select({ settings: organisations.settings }).from(organisations).where(eq(organisations.id, orgId));
    if (!org) throw new Error(`organisation ${orgId} not found`);
    const before = policyFromSettings(org.settings);
    const stored = settingsFromPolicy(policy);
    const after = policyFromSettings(stored);
    if (JSON.stringify(before) === JSON.stringify(after)) return false;
    await tx
      .update(organisations)
      .set({ settings: { ...org.settings, ...stored }, updatedAt: now })
      .where(eq(organisations.id, orgId));
    await recordAudit(tx, { orgId, actorId, action: "reminder-policy.updated", entityType: "organisation", entityId: orgId, detail: { before, after } }, now);
    return true;
  });
}

export async function getReminderDelivery(orgId: string, personId: string): Promise<ReminderDelivery | null> {
  const { db } = await database();
  const [row] = await db.select({ delivery: people.reminderDelivery }).from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  return row?.delivery ?? null;
}

/** The person's own choice; audited. Returns false when it was already so. */
export async function saveReminderDelivery(orgId: string, personId: string, delivery: ReminderDelivery, now: Date = new Date()): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx.select({ delivery: people.reminderDelivery }).from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
    if (!row) throw new Error(`person ${personId} not found in ${orgId}`);
    if (row.delivery === delivery) return false;
    await tx.update(people).set({ reminderDelivery: delivery, updatedAt: now }).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
    await recordAudit(tx, { orgId, actorId: personId, action: "reminder-delivery.updated", entityType: "person", entityId: personId, detail: { from: row.delivery, to: delivery } }, now);
    return true;
  });
}

export type ReminderRunRow = { id: string; ranOn: string; trigger: string; startedAt: Date; finishedAt: Date; sent: number; emails: number; failed: number };

export async function listReminderRuns(orgId: string, limit = 10): Promise<ReminderRunRow[]> {
  const { db } = await database();
  return db
    .select({
      id: reminderRuns.id,
      ranOn: reminderRuns.ranOn,
      trigger: reminderRuns.trigger,
      startedAt: reminderRuns.startedAt,
      finishedAt: reminderRuns.finishedAt,
      sent: reminderRuns.sent,
      emails: reminderRuns.emails,
      failed: reminderRuns.failed,
    })
    .from(reminderRuns)
    .where(eq(reminderRuns.orgId, orgId))
    .orderBy(desc(reminderRuns.finishedAt))
    .limit(limit);
}

export type RecentReminder = {
  id: string;
  personName: string;
  requirement: string;
  dueOn: string;
  threshold: string;
  channel: "email" | "digest";
  sentAt: Date | null;
  failure: string | null;
};

/** The latest reminders claimed (sent, or refused with a reason), newest first. */
export async function listRecentReminders(orgId: string, options: { personId?: string; limit?: number } = {}): Promise<RecentReminder[]> {
  const { db } = await database();
  return db
    .select({
      id: reminders.id,
      personName: people.name,
      requirement: requirements.name,
      dueOn: reminders.dueOn,
      threshold: reminders.threshold,
      channel: reminders.channel,
      sentAt: reminders.sentAt,
      failure: reminders.failure,
    })
    .from(reminders)
    .innerJoin(people, and(eq(people.id, reminders.personId), eq(people.orgId, orgId)))
    .innerJoin(requirements, and(eq(requirements.id, reminders.requirementId), eq(requirements.orgId, orgId)))
    .where(and(eq(reminders.orgId, orgId), options.personId ? eq(reminders.personId, options.personId) : undefined))
    .orderBy(desc(reminders.createdAt), desc(reminders.id))
    .limit(options.limit ?? 25);
}

export type RecentManagerDigest = { id: string; managerName: string; week: string; people: number; sentAt: Date | null; failure: string | null };

export async function listRecentManagerDigests(orgId: string, limit = 10): Promise<RecentManagerDigest[]> {
  const { db } = await database();
  return db
    .select({ id: managerDigests.id, managerName: people.name, week: managerDigests.week, people: managerDigests.people, sentAt: managerDigests.sentAt, failure: managerDigests.failure })
    .from(managerDigests)
    .innerJoin(people, and(eq(people.id, managerDigests.managerId), eq(people.orgId, orgId)))
    .where(eq(managerDigests.orgId, orgId))
    .orderBy(desc(managerDigests.createdAt))
    .limit(limit);
}
