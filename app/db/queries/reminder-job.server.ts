/**
 * The reminder job (issue 9 §1): for each organisation, decide who is owed which reminder today
 * (app/domain/reminders on the status engine's verdicts — the same assessment as the Team
 * matrix), CLAIM each by inserting its row, send only what this run inserted, then record the
 * outcome. The unique index on person + requirement + due date + threshold (and on manager +
 * week for the managers' digests) makes a second run, or two runs at once, send nothing twice.
 *
 * Claims and outcomes are two short write transactions; sending happens between them, outside
 * any transaction (shared/STACK.md: keep slow work out of transactions). A send the transport
 * could not reach is released (its row deleted) so the next run tries again; a refused or
 * invalid one keeps its row with the reason, so it is not retried every hour.
 */
import { and, eq, inArray, sql } from "drizzle-orm";
import { createElement } from "react";
import { env } from "~/config/env.server";
import { sendEmail, type SendEmailOptions, type SendEmailResult } from "~/email/send-email.server";
import { calendarDateIn, reminderWindowDays, type IsoDate, type Status } from "~/domain/status";
import { describeThreshold, dueReminders, indexSent, isoWeek, policyFromSettings, type DueReminder, type SentReminder } from "~/domain/reminders";
import ManagerDigestEmail, { managerDigestSubject, type ManagerDigestEntry } from "../../../emails/manager-digest";
import ReminderEmail, { reminderEmailSubject } from "../../../emails/reminder";
import ReminderDigestEmail, { reminderDigestSubject } from "../../../emails/reminder-digest";
import type { ReminderLine } from "../../../emails/reminder-parts";
import { database } from "../client.server";
import { managerDigests, organisations, reminderRuns, reminders } from "../schema";
import { assessMatrix, readMatrixRows, type Matrix } from "./team-matrix.server";

export type ReminderTrigger = "script" | "app" | "test";

export type ReminderJobOptions = {
  /** The instant of the run; the organisation's calendar date is taken from it. */
  now?: Date;
  trigger?: ReminderTrigger;
  /** Mail settings for sendEmail (tests, bench); by default the process configuration. */
  mail?: SendEmailOptions;
  /** Base of every link in the e-mails; by default PUBLIC_URL. */
  publicUrl?: string;
  /** Only these organisations (by default every one). */
  orgIds?: string[];
  /** E-mails in flight at once. */
  concurrency?: number;
};

export type SentEmail = { to: string; subject: string; kind: "reminder" | "digest" | "manager-digest"; reminders: number; messageId: string };
export type FailedEmail = { to: string; subject: string; kind: SentEmail["kind"]; error: string; retry: boolean };

export type ReminderRunReport = {
  orgId: string;
  orgName: string;
  today: IsoDate;
  /** Reminders this run claimed and sent. */
  remindersSent: number;
  emails: SentEmail[];
  failed: FailedEmail[];
};

type Contact = { id: string; name: string; email: string; delivery: "each" | "digest" };
type Claimed = DueReminder & { id: string; personId: string };
type Outgoing = { kind: SentEmail["kind"]; to: string; subject: string; react: ReturnType<typeof createElement>; reminderIds: string[]; digestId?: string; reminders: number };

const ACTIONS: Record<ReminderLine["kind"], { path: string; label: string; renew: string }> = {
  exam: { path: "/exams", label: "Open your exams", renew: "Open your exams" },
  checklist: { path: "/checkoffs", label: "Ask for a check-off", renew: "Ask for a check-off" },
  credential: { path: "/credentials", label: "Upload your card", renew: "Upload your renewed card" },
};

/** Runs the job once for every organisation (or those named); one report per organisation. */
export async function runReminders(options: ReminderJobOptions = {}): Promise<ReminderRunReport[]> {
  const { db } = await database();
  const orgs = await db.select({ id: organisations.id }).from(organisations).orderBy(organisations.name);
  const reports: ReminderRunReport[] = [];
  for (const org of orgs) {
    if (options.orgIds && !options.orgIds.includes(org.id)) continue;
    reports.push(await runRemindersFor(org.id, options));
  }
  return reports;
}

/** Runs the job once for one organisation. */
export async function runRemindersFor(orgId: string, options: ReminderJobOptions = {}): Promise<ReminderRunReport> {
  const startedAt = new Date();
  const now = options.now ?? startedAt;
  const { db, write } = await database();
  const [org] = await db.select().from(organisations).where(eq(organisations.id, orgId));
  if (!org) throw new Error(`organisation ${orgId} not found`);
  const today = calendarDateIn(org.timeZone, now);
  const policy = policyFromSettings(org.settings);
  const matrix = assessMatrix(await readMatrixRows(orgId, { unitIds: null }), { unitIds: null }, org.timeZone, {
    today,
    reminderDays: reminderWindowDays(org.settings.reminderDays),
  });
  const [contacts, boardRows, history] = await Promise.all([
    db.all<{ id: string; name: string; email: string; reminder_delivery: "each" | "digest" }>(
      sql`select id, name, email, reminder_delivery from people where org_id = ${orgId} and active = 1`,
    ),
    db.all<{ id: string }>(sql`
      select r.id from requirements r join credential_types t on t.id = r.credential_type_id and t.org_id = ${orgId}
      where r.org_id = ${orgId} and t.category = 'board'`),
    db.all<{ person_id: string; requirement_id: string; due_on: string; threshold: string }>(
      sql`select person_id, requirement_id, due_on, threshold from reminders where org_id = ${orgId}`,
    ),
  ]);
  const contactOf = new Map<string, Contact>(contacts.map((c) => [c.id, { id: c.id, name: c.name, email: c.email, delivery: c.reminder_delivery }]));
  const board = new Set(boardRows.map((r) => r.id));
  const sentBy = new Map<string, SentReminder[]>();
  for (const h of history) {
    const list = sentBy.get(h.person_id) ?? [];
    list.push({ requirementId: h.requirement_id, dueOn: h.due_on, threshold: h.threshold });
    sentBy.set(h.person_id, list);
  }

  // 1. Decide.
  const wanted: (DueReminder & { personId: string; channel: "email" | "digest" })[] = [];
  for (const person of matrix.people) {
    const contact = contactOf.get(person.id);
    if (!contact) continue;
    const subjects = Object.entries(person.cells).map(([requirementId, cell]) => ({ requirementId, status: cell.status, date: cell.date, board: board.has(requirementId) }));
    for (const d of dueReminders(policy, today, subjects, indexSent(sentBy.get(person.id) ?? []))) {
      wanted.push({ ...d, personId: person.id, channel: contact.delivery === "digest" ? "digest" : "email" });
    }
  }

  // 2. Claim: only the rows this run inserts are this run's to send.
  const claimed: Claimed[] = await write(async (tx) => {
    const out: Claimed[] = [];
    const byKey = new Map(wanted.map((w) => [`${w.personId}|${w.requirementId}|${w.dueOn}|${w.threshold}`, w]));
    for (let i = 0; i < wanted.length; i += 400) {
      const chunk = wanted.slice(i, i + 400);
      const inserted = await tx
        .insert(reminders)
        .values(chunk.map((w) => ({ orgId, personId: w.personId, requirementId: w.requirementId, dueOn: w.dueOn, threshold: w.threshold, channel: w.channel, createdAt: now })))
        .onConflictDoNothing()
        .returning({ id: reminders.id, personId: reminders.personId, requirementId: reminders.requirementId, dueOn: reminders.dueOn, threshold: reminders.threshold });
      for (const r of inserted) out.push({ ...byKey.get(`${r.personId}|${r.requirementId}|${r.dueOn}|${r.threshold}`)!, id: r.id, personId: r.personId });
    }
    return out;
  });

  // 3. The e-mails: separate ones, daily digests, then the managers' weekly digests.
  const base = (options.publicUrl ?? env().publicUrl).replace(/\/$/, "");
  const links = { planUrl: `${base}/plan`, choiceUrl: `${base}/plan/reminders` };
  const requirementOf = new Map(matrix.columns.map((c) => [c.id, c]));
  const personOf = new Map(matrix.people.map((p) => [p.id, p]));
  const lineOf = (c: Claimed): ReminderLine => {
    const column = requirementOf.get(c.requirementId)!;
    const person = personOf.get(c.personId);
    const cell = person?.cells[c.requirementId];
    const action = ACTIONS[column.kind];
    const held = cell?.dateMeaning === "valid-through";
    return {
      title: column.name,
      kind: column.kind,
      dateMeaning: cell?.dateMeaning ?? "due",
      dueOn: c.dueOn,
      daysLeft: c.daysLeft,
      lapsed: c.status === "lapsed",
      thresholdWords: describeThreshold(c.threshold),
      actionUrl: `${base}${action.path}`,
      actionLabel: held ? action.renew : action.label,
    };
  };
  const outgoing: Outgoing[] = [];
  const claimedBy = new Map<string, Claimed[]>();
  for (const c of claimed) claimedBy.set(c.personId, [...(claimedBy.get(c.personId) ?? []), c]);
  for (const [personId, list] of claimedBy) {
    const contact = contactOf.get(personId)!;
    if (contact.delivery === "digest") {
      const lines = list.map(lineOf);
      outgoing.push({
        kind: "digest",
        to: contact.email,
        subject: reminderDigestSubject({ lines, today }),
        react: createElement(ReminderDigestEmail, { personName: contact.name, orgName: org.name, today, lines, ...links }),
        reminderIds: list.map((c) => c.id),
        reminders: list.length,
      });
    } else {
      for (const c of list) {
        const line = lineOf(c);
        outgoing.push({
          kind: "reminder",
          to: contact.email,
          subject: reminderEmailSubject({ line }),
          react: createElement(ReminderEmail, { personName: contact.name, orgName: org.name, line, ...links }),
          reminderIds: [c.id],
          reminders: 1,
        });
      }
    }
  }
  if (policy.managerDigest) outgoing.push(...(await claimManagerDigests(orgId, org.name, today, now, matrix, base)));

  // 4. Send, outside any transaction.
  const results = await sendAll(outgoing, options.mail ?? {}, options.concurrency ?? 8);

  // 5. Record what happened, and the run.
  const report: ReminderRunReport = { orgId, orgName: org.name, today, remindersSent: 0, emails: [], failed: [] };
  await write(async (tx) => {
    for (const [i, message] of outgoing.entries()) {
      const result = results[i];
      if (result.ok) {
        report.remindersSent += message.reminders;
        report.emails.push({ to: message.to, subject: message.subject, kind: message.kind, reminders: message.reminders, messageId: result.id });
        if (message.reminderIds.length > 0) await tx.update(reminders).set({ sentAt: now, messageId: result.id }).where(inArray(reminders.id, message.reminderIds));
        if (message.digestId) await tx.update(managerDigests).set({ sentAt: now, messageId: result.id }).where(eq(managerDigests.id, message.digestId));
        continue;
      }
      const retry = result.error.kind === "unreachable";
      report.failed.push({ to: message.to, subject: message.subject, kind: message.kind, error: result.error.message, retry });
      if (retry) {
        if (message.reminderIds.length > 0) await tx.delete(reminders).where(inArray(reminders.id, message.reminderIds));
        if (message.digestId) await tx.delete(managerDigests).where(eq(managerDigests.id, message.digestId));
      } else {
        if (message.reminderIds.length > 0) await tx.update(reminders).set({ failure: result.error.message }).where(inArray(reminders.id, message.reminderIds));
        if (message.digestId) await tx.update(managerDigests).set({ failure: result.error.message }).where(eq(managerDigests.id, message.digestId));
      }
    }
    await tx.insert(reminderRuns).values({
      orgId,
      ranOn: today,
      trigger: options.trigger ?? "script",
      startedAt,
      finishedAt: new Date(),
      sent: report.remindersSent,
      emails: report.emails.length,
      failed: report.failed.length,
    });
  });
  return report;
}

/** The managers' digests of this ISO week not claimed yet, claimed now (one per manager and week). */
async function claimManagerDigests(orgId: string, orgName: string, today: IsoDate, now: Date, matrix: Matrix, base: string): Promise<Outgoing[]> {
  const { db, write } = await database();
  const week = isoWeek(today);
  const [managers, managed] = await Promise.all([
    db.all<{ id: string; name: string; email: string }>(sql`
      select p.id, p.name, p.email from people p join person_roles r on r.person_id = p.id and r.org_id = ${orgId} and r.role = 'manager'
      where p.org_id = ${orgId} and p.active = 1 order by p.name`),
    db.all<{ person_id: string; unit_id: string; name: string }>(sql`
      select pu.person_id, pu.unit_id, u.name from person_units pu join units u on u.id = pu.unit_id and u.org_id = ${orgId}
      where pu.org_id = ${orgId} and pu.relation = 'manages' and u.active = 1`),
  ]);
  const unitName = new Map(matrix.units.map((u) => [u.id, u.name]));
  const requirementName = new Map(matrix.columns.map((c) => [c.id, c.name]));
  const drafts: { manager: (typeof managers)[number]; units: string[]; entries: ManagerDigestEntry[] }[] = [];
  for (const manager of managers) {
    const units = managed.filter((m) => m.person_id === manager.id);
    if (units.length === 0) continue;
    const unitIds = new Set(units.map((u) => u.unit_id));
    const entries: ManagerDigestEntry[] = [];
    for (const p of matrix.people) {
      if (p.id === manager.id || !p.unitIds.some((u) => unitIds.has(u))) continue;
      const items = Object.entries(p.cells)
        .filter(([, cell]) => (cell.status === "lapsed" || cell.status === "due-soon") && cell.date !== null)
        .map(([id, cell]) => ({ title: requirementName.get(id) ?? "Requirement", status: cell.status as Extract<Status, "lapsed" | "due-soon">, dateMeaning: cell.dateMeaning, date: cell.date! }))
        .sort((a, b) => (a.status === b.status ? (a.date < b.date ? -1 : 1) : a.status === "lapsed" ? -1 : 1));
      if (items.length > 0) entries.push({ personName: p.name, units: p.unitIds.filter((u) => unitIds.has(u)).map((u) => unitName.get(u) ?? u), items });
    }
    // Nothing Due soon or Lapsed: no e-mail this week (a later run this week sends one if that changes).
    if (entries.length === 0) continue;
    entries.sort((a, b) => Number(b.items[0].status === "lapsed") - Number(a.items[0].status === "lapsed") || a.personName.localeCompare(b.personName));
    drafts.push({ manager, units: units.map((u) => u.name).sort(), entries });
  }
  if (drafts.length === 0) return [];
  const claimed = await write(async (tx) =>
    tx
      .insert(managerDigests)
      .values(drafts.map((d) => ({ orgId, managerId: d.manager.id, week, people: d.entries.length, createdAt: now })))
      .onConflictDoNothing()
      .returning({ id: managerDigests.id, managerId: managerDigests.managerId }),
  );
  const teamUrl = `${base}/team/matrix`;
  return claimed.map((c) => {
    const d = drafts.find((x) => x.manager.id === c.managerId)!;
    return {
      kind: "manager-digest" as const,
      to: d.manager.email,
      subject: managerDigestSubject({ week, people: d.entries }),
      react: createElement(ManagerDigestEmail, { managerName: d.manager.name, orgName, week, unitNames: d.units, people: d.entries, teamUrl }),
      reminderIds: [],
      digestId: c.id,
      reminders: 0,
    };
  });
}

/** Sends with at most `concurrency` in flight; results in the messages' order. */
async function sendAll(messages: Outgoing[], mail: SendEmailOptions, concurrency: number): Promise<SendEmailResult[]> {
  const results: SendEmailResult[] = new Array(messages.length);
  let next = 0;
  async function worker() {
    while (next < messages.length) {
      const i = next++;
      const m = messages[i];
      results[i] = await sendEmail({ to: m.to, subject: m.subject, react: m.react }, mail).catch((error: unknown) => ({
        ok: false as const,
        error: { kind: "invalid" as const, message: error instanceof Error ? error.message : String(error) },
      }));
      // Rendering is synchronous work and a refused send answers without I/O: give the event
      // loop a turn between messages, so a long run inside the app never holds up requests.
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
  }
  await Promise.all(Array.from({ length: Math.max(1, Math.min(concurrency, messages.length)) }, worker));
  return results;
}

/**
 * Whether an organisation's job has run cleanly on its calendar date `today`. A run with failures
 * does not count, so the hourly check tries again: claims released for an unreachable service are
 * sent then, and refused ones (kept with their reason) are not sent twice.
 */
export async function hasRunOn(orgId: string, today: IsoDate): Promise<boolean> {
  const { db } = await database();
  const [row] = await db
    .select({ id: reminderRuns.id })
    .from(reminderRuns)
    .where(and(eq(reminderRuns.orgId, orgId), eq(reminderRuns.ranOn, today), eq(reminderRuns.failed, 0)))
    .limit(1);
  return row !== undefined;
}
