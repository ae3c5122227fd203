/**
 * The seed's calendar helpers. Date arithmetic is the app's own (app/domain/status/calendar-date);
 * only what the seed alone needs is defined here.
 */
import { calendarDateIn, daysInMonth, formatIsoDate, parseIsoDate, type IsoDate } from "~/domain/status/calendar-date";

export { addDays, addMonths, daysBetween, daysInMonth, endOfMonth, formatIsoDate, isIsoDate, parseIsoDate, type IsoDate } from "~/domain/status/calendar-date";

/** The same month as `date`, on day `day` (clamped to the month's length). */
export function withDay(date: IsoDate, day: number): IsoDate {
  const { year, month } = parseIsoDate(date);
  return formatIsoDate(year, month, Math.min(Math.max(1, day), daysInMonth(year, month)));
}

/** Today's calendar date in an IANA time zone. */
export function todayIn(timeZone: string, now: Date = new Date()): IsoDate {
  return calendarDateIn(timeZone, now);
}

/**
 * A fixed instant on a calendar date (12:00 UTC, which is the morning of the same date in every
 * US time zone): seeded timestamps come from dates, never from the clock, so re-runs match.
 */
export function instantOn(date: IsoDate, minutes = 0): Date {
  const { year, month, day } = parseIsoDate(date);
  return new Date(Date.UTC(year, month - 1, day, 12, minutes));
}
