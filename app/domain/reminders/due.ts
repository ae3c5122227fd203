/**
 * Which reminders are due today for one person: pure, from the policy, today (the
 * organisation's calendar date), the person's status rows (the status engine's verdict per
 * requirement, app/domain/status/plan.ts) and what was already sent.
 *
 * A reminder is keyed by requirement, the date it is about (`dueOn`) and its threshold:
 * "90d" … "7d" (days before), "on-day", "12m" / "6m" (board credentials, calendar months
 * before) and "lapsed-2026-W49" (weekly while lapsed, one per ISO week). The database's unique
 * index on person + those three makes a second or overlapping run send nothing more.
 *
 * - Catch-up: after missed days only the MOST RECENT threshold passed is due, never each one
 *   that was missed (a person does not need "60 days" and "30 days" on the same morning).
 * - Nothing goes backwards: a threshold is not sent when one that falls later for the same date
 *   was already sent (after a policy change, say).
 * - A renewal (or an extension) moves the date: the key changes and a fresh series starts.
 * - Waived rows and rows without a date (never expires, nothing assigned) get no reminder.
 *
 * Cadence values: common practice, no source (shared/TESTING.md "Reminder cadence").
 */
import { addDays, addMonths, daysBetween, type IsoDate } from "../status/calendar-date";
import type { Status } from "../status";
import { isoWeek, mondayOfIsoWeek } from "./iso-week";
import type { ReminderPolicy } from "./policy";

/** One requirement of one person, as the status engine judged it today. */
export type ReminderSubject = {
  requirementId: string;
  status: Status;
  /** The due date (work not done) or the valid-through date (what is held); null: none. */
  date: IsoDate | null;
  /** A board credential gets the policy's extra months-before reminders. */
  board: boolean;
};

export type SentReminder = { requirementId: string; dueOn: IsoDate; threshold: string };

export type DueReminder = {
  requirementId: string;
  dueOn: IsoDate;
  threshold: string;
  /** The day the threshold was reached (≤ today). */
  reachedOn: IsoDate;
  status: Status;
  /** Days from today to `dueOn` (negative once past). */
  daysLeft: number;
};

type Threshold = { key: string; reachedOn: IsoDate };

const LAPSED = /^lapsed-(\d{4}-W\d{2})$/;
const DAYS = /^(\d+)d$/;
const MONTHS = /^(\d+)m$/;

/** The day a threshold falls on for a date (for comparing what was sent); null for an unknown key. */
export function thresholdDate(threshold: string, dueOn: IsoDate): IsoDate | null {
  if (threshold === "on-day") return dueOn;
  const lapsed = LAPSED.exec(threshold);
  if (lapsed) return mondayOfIsoWeek(lapsed[1]);
  const days = DAYS.exec(threshold);
  if (days) return addDays(dueOn, -Number(days[1]));
  const months = MONTHS.exec(threshold);
  if (months) return addMonths(dueOn, -Number(months[1]));
  return null;
}

/** The thresholds before (and on) a date, under a policy. */
export function thresholdsFor(policy: ReminderPolicy, dueOn: IsoDate, board: boolean): Threshold[] {
  const out: Threshold[] = policy.daysBefore.map((d) => ({ key: `${d}d`, reachedOn: addDays(dueOn, -d) }));
  if (policy.onTheDay) out.push({ key: "on-day", reachedOn: dueOn });
  if (board) for (const m of policy.boardMonthsBefore) out.push({ key: `${m}m`, reachedOn: addMonths(dueOn, -m) });
  return out;
}

/** The threshold due today for one subject, before looking at what was sent; null: none. */
export function latestThreshold(policy: ReminderPolicy, subject: ReminderSubject, today: IsoDate): Threshold | null {
  if (subject.date === null || subject.status === "waived") return null;
  if (subject.status === "lapsed") {
    // Weekly while lapsed: the ISO week is the key, so each week sends once whichever day the job runs.
    return policy.weeklyWhileLapsed ? { key: `lapsed-${isoWeek(today)}`, reachedOn: today } : null;
  }
  let best: Threshold | null = null;
  for (const t of thresholdsFor(policy, subject.date, subject.board)) {
    if (t.reachedOn > today) continue;
    // The latest reached wins; on a tie the one nearer the date (fewer days before) does.
    if (!best || t.reachedOn > best.reachedOn) best = t;
  }
  return best;
}

function sentKey(requirementId: string, dueOn: IsoDate): string {
  return `${requirementId}\u0000${dueOn}`;
}

/** Groups what was sent by requirement and date, with the latest day any of them fell on. */
export function indexSent(sent: Iterable<SentReminder>): Map<string, { thresholds: Set<string>; latest: IsoDate | null }> {
  const out = new Map<string, { thresholds: Set<string>; latest: IsoDate | null }>();
  for (const s of sent) {
    const k = sentKey(s.requirementId, s.dueOn);
    let entry = out.get(k);
    if (!entry) out.set(k, (entry = { thresholds: new Set(), latest: null }));
    entry.thresholds.add(s.threshold);
    const on = thresholdDate(s.threshold, s.dueOn);
    if (on !== null && (entry.latest === null || on > entry.latest)) entry.latest = on;
  }
  return out;
}

/**
 * The reminders due today for one person. `sent` may be the person's whole history (or an
 * index of it from `indexSent`); only entries for the same requirement and date matter.
 */
export function dueReminders(
  policy: ReminderPolicy,
  today: IsoDate,
  subjects: readonly ReminderSubject[],
  sent: Iterable<SentReminder> | ReturnType<typeof indexSent>,
): DueReminder[] {
  const index = sent instanceof Map ? sent : indexSent(sent);
  const out: DueReminder[] = [];
  for (const s of subjects) {
    const t = latestThreshold(policy, s, today);
    if (!t || s.date === null) continue;
    const before = index.get(sentKey(s.requirementId, s.date));
    if (before?.thresholds.has(t.key)) continue;
    // Weekly lapsed reminders are held back only by the same week's; a threshold before the date
    // is held back by any later one already sent for that date.
    if (!t.key.startsWith("lapsed-") && before?.latest != null && before.latest > t.reachedOn) continue;
    out.push({ requirementId: s.requirementId, dueOn: s.date, threshold: t.key, reachedOn: t.reachedOn, status: s.status, daysLeft: daysBetween(today, s.date) });
  }
  return out;
}
