/**
 * The requirement status engine: which of Tidemark's five status words (PRODUCT.md "Status
 * words and marks") a record carries on a given calendar day. Pure — no database, no clock:
 * the caller passes `today` as the organisation's calendar date ('YYYY-MM-DD') and the
 * reminder window in days.
 *
 * Two shapes of record:
 * - something held with a "valid through" date (a credential, or a met requirement): the
 *   valid-through day itself is still valid, the day after is lapsed (shared/TESTING.md: keep
 *   "valid through" inclusive, distinct from "expires on");
 * - something required and not done yet (an open assignment, an unmet requirement), with an
 *   optional due date: not started until the due date has passed, lapsed after it.
 *
 * A manager's waiver excuses a requirement until its end date (inclusive); see `withWaiver`.
 */
import { addDays, daysBetween, type IsoDate } from "./calendar-date";

export { addDays, addMonths, calendarDateIn, daysBetween, isIsoDate, parseIsoDate, type IsoDate } from "./calendar-date";

export const STATUSES = ["current", "due-soon", "lapsed", "not-started", "waived"] as const;
export type Status = (typeof STATUSES)[number];

/**
 * Reminders start 90 days before a date (shared/TESTING.md "Reminder cadence": 90, 60, 30, 14
 * and 7 days before — common practice, no source), so "due soon" is the last 90 days.
 */
export const DEFAULT_REMINDER_DAYS = 90;

export type StatusOptions = {
  /** The organisation's calendar date today. */
  today: IsoDate;
  /** "Due soon" window: a held record whose valid-through date is this many days away or fewer. */
  reminderDays?: number;
};

export type StatusResult = {
  status: Status;
  /** The date the status was judged on (valid through, or due), or null when there is none. */
  date: IsoDate | null;
  /** Days from today to `date` (0 on the day itself, negative once past); null without a date. */
  daysLeft: number | null;
  /** For lapsed records: days past `date` (1 on the first lapsed day). Otherwise null. */
  daysLapsed: number | null;
  /** Set when a waiver decided the status: the waiver's last day. */
  waivedThrough?: IsoDate;
};

function judge(status: Status, date: IsoDate | null, today: IsoDate): StatusResult {
  const daysLeft = date === null ? null : daysBetween(today, date);
  return { status, date, daysLeft, daysLapsed: status === "lapsed" && daysLeft !== null ? -daysLeft : null };
}

/**
 * A record that is held: a credential or a met requirement. `validThrough` null means it
 * never expires (e.g. a board credential earned before 2002-07-01: NBRC, "Credential
 * Maintenance & State License Renewal").
 */
export function heldStatus(validThrough: IsoDate | null, { today, reminderDays = DEFAULT_REMINDER_DAYS }: StatusOptions): StatusResult {
  if (validThrough === null) return judge("current", null, today);
  const left = daysBetween(today, validThrough);
  if (left < 0) return judge("lapsed", validThrough, today);
  return judge(left <= reminderDays ? "due-soon" : "current", validThrough, today);
}

/**
 * Work that is required and not done yet. Until its due date has passed it is "not started"
 * (PRODUCT.md: "required, nothing recorded yet"); the due date itself is still on time.
 */
export function outstandingStatus(dueOn: IsoDate | null, { today }: StatusOptions): StatusResult {
  if (dueOn !== null && dueOn < today) return judge("lapsed", dueOn, today);
  return judge("not-started", dueOn, today);
}

export type WaiverSpan = { endsOn: IsoDate; revoked?: boolean };

/** A waiver counts through its end date (inclusive) unless a manager revoked it. */
export function isWaiverActive(waiver: WaiverSpan, today: IsoDate): boolean {
  return !waiver.revoked && waiver.endsOn >= today;
}

/**
 * Applies the latest-ending active waiver. A waiver excuses what is not met — lapsed, not
 * started or inside the reminder window; a record that is plainly current keeps "Current",
 * because that is the more useful truth once the person has renewed.
 */
export function withWaiver(result: StatusResult, waivers: readonly WaiverSpan[], today: IsoDate): StatusResult {
  if (result.status === "current") return result;
  const active = waivers.filter((w) => isWaiverActive(w, today)).sort((a, b) => (a.endsOn < b.endsOn ? 1 : -1))[0];
  if (!active) return result;
  return { ...result, status: "waived", daysLapsed: null, waivedThrough: active.endsOn };
}

/** Order of attention: what needs doing first. Used to break ties between equal dates. */
export const STATUS_URGENCY: Record<Status, number> = { lapsed: 0, "not-started": 1, "due-soon": 2, waived: 3, current: 4 };

/**
 * Due-date order, soonest (and so overdue) first. Records without a date come last, the ones
 * that need doing (not started) before the ones that never expire.
 */
export function compareByDate(a: { date: IsoDate | null; status: Status }, b: { date: IsoDate | null; status: Status }): number {
  if (a.date !== b.date) {
    if (a.date === null) return 1;
    if (b.date === null) return -1;
    return a.date < b.date ? -1 : 1;
  }
  return STATUS_URGENCY[a.status] - STATUS_URGENCY[b.status];
}

export type CredentialCounts = { lapsed: number; dueSoon: number; current: number; waived: number };

/** Tallies statuses of a set of credentials (one result per person and credential type). */
export function countStatuses(results: Iterable<{ status: Status }>): CredentialCounts {
  const counts: CredentialCounts = { lapsed: 0, dueSoon: 0, current: 0, waived: 0 };
  for (const { status } of results) {
    if (status === "lapsed") counts.lapsed += 1;
    else if (status === "due-soon") counts.dueSoon += 1;
    else if (status === "current") counts.current += 1;
    else if (status === "waived") counts.waived += 1;
  }
  return counts;
}

/**
 * The organisation's "due soon" window: its earliest reminder (the largest number of days
 * before a date in its reminder policy), or 90 days when it has none.
 */
export function reminderWindowDays(reminderDays: readonly number[] | undefined | null): number {
  const valid = (reminderDays ?? []).filter((d) => Number.isInteger(d) && d > 0);
  return valid.length > 0 ? Math.max(...valid) : DEFAULT_REMINDER_DAYS;
}

/**
 * The two dates that divide held records into lapsed / due soon / current, for code that must
 * count many records in SQL (Team, Today's manager line) rather than one by one here:
 * valid through before `today` → lapsed; on or before `dueSoonThrough` → due soon; else current.
 * Integration tests check those counts against `heldStatus` record by record.
 */
export function statusThresholds({ today, reminderDays = DEFAULT_REMINDER_DAYS }: StatusOptions): { today: IsoDate; dueSoonThrough: IsoDate } {
  return { today, dueSoonThrough: addDays(today, reminderDays) };
}
