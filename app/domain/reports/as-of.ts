/**
 * Reports "as recorded by the end of a day" (issue 9 §4, §5): the calendar arithmetic and the
 * checks of a report's dates. Pure — no database, no clock: the caller passes `today` (the
 * organisation's calendar date) and instants as milliseconds.
 */
import { addDays, addMonths, endOfMonth, isIsoDate, parseIsoDate, type IsoDate } from "~/domain/status/calendar-date";

/**
 * The last days of the `count` whole months before the month of `today`, oldest first: on
 * 2 December 2026, 31 December 2025 … 30 November 2026. A month still running has no month end
 * yet, so it is left out (calendar arithmetic with end-of-month clamping, shared/STACK.md "Dates").
 */
export function monthEndsBefore(today: IsoDate, count = 12): IsoDate[] {
  const { year, month } = parseIsoDate(today);
  const firstOfMonth = `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-01`;
  const out: IsoDate[] = [];
  for (let back = count; back >= 1; back--) out.push(endOfMonth(addMonths(firstOfMonth, -back)));
  return out;
}

/** Share of `part` in `whole` as a percentage with one decimal (0 when there is nothing to count). */
export function percentOf(part: number, whole: number): number {
  if (whole <= 0) return 0;
  return Math.round((part / whole) * 1000) / 10;
}

/** Whether something recorded at `at` (ms) had been recorded by `cutoff` (ms, exclusive: the next day's local midnight). */
export function recordedBy(at: number | null | undefined, cutoff: number): boolean {
  return at !== null && at !== undefined && at < cutoff;
}

/** A person's activation changes as the audit log records them ("person.deactivated" / "person.reactivated"). */
export type ActivationChange = { at: number; active: boolean };

/**
 * Whether a person was active at `cutoff`: the state set by their last change before it; with no
 * change before it, the opposite of their first later change (that change had something to
 * change); with no change at all, their state today (no history to go on).
 */
export function wasActiveAt(activeToday: boolean, changes: readonly ActivationChange[], cutoff: number): boolean {
  const sorted = [...changes].sort((a, b) => a.at - b.at);
  let state: boolean | null = null;
  for (const c of sorted) if (c.at < cutoff) state = c.active;
  if (state !== null) return state;
  const firstLater = sorted.find((c) => c.at >= cutoff);
  return firstLater ? !firstLater.active : activeToday;
}

export type DayCheck = { ok: true; day: IsoDate } | { ok: false; message: string };

/** A report's "on" date: empty → today; otherwise a real YYYY-MM-DD date, not after today. */
export function checkReportDay(raw: string | null | undefined, today: IsoDate): DayCheck {
  const value = (raw ?? "").trim();
  if (value === "") return { ok: true, day: today };
  if (!isIsoDate(value)) return { ok: false, message: "Enter a real date as YYYY-MM-DD, for example 2026-06-30." };
  if (value > today) return { ok: false, message: `Choose today (${today}) or an earlier day: nothing is recorded for a day still to come.` };
  return { ok: true, day: value };
}

export type RangeCheck = { ok: true; from: IsoDate; to: IsoDate } | { ok: false; field: "from" | "to"; message: string };

/** The longest range a report lists: five years, enough for a survey cycle (common practice, no source). */
export const MAX_RANGE_DAYS = 1827;

/** A report's date range: empty ends take the defaults; both must be real dates, `from` not after `to`. */
export function checkRange(rawFrom: string | null | undefined, rawTo: string | null | undefined, defaults: { from: IsoDate; to: IsoDate }): RangeCheck {
  const from = (rawFrom ?? "").trim() || defaults.from;
  const to = (rawTo ?? "").trim() || defaults.to;
  if (!isIsoDate(from)) return { ok: false, field: "from", message: "Enter the first day as YYYY-MM-DD, for example 2026-01-01." };
  if (!isIsoDate(to)) return { ok: false, field: "to", message: "Enter the last day as YYYY-MM-DD, for example 2026-12-31." };
  if (from > to) return { ok: false, field: "to", message: "The last day must be on or after the first day." };
  if (addDays(from, MAX_RANGE_DAYS) < to) return { ok: false, field: "to", message: "Choose a range of at most five years." };
  return { ok: true, from, to };
}
