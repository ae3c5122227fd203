/**
 * Showing dates. Calendar dates ('YYYY-MM-DD', already in the organisation's time zone) are
 * formatted from their three numbers, so no time zone can shift them: `new Date('2026-03-31')`
 * is UTC midnight and would show 30 March in Chicago (shared/STACK.md "Dates"). Instants are
 * formatted in the organisation's time zone. Server and browser produce the same text.
 */
import { parseIsoDate, type IsoDate } from "~/domain/status/calendar-date";

const MONTHS_SHORT = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const MONTHS_LONG = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];
const WEEKDAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"];

/** '2028-03-31' → "31 Mar 2028". */
export function formatCalendarDate(value: IsoDate): string {
  const { year, month, day } = parseIsoDate(value);
  return `${day} ${MONTHS_SHORT[month - 1]} ${year}`;
}

/** '2026-12-02' → "Wednesday 2 December 2026". */
export function formatLongCalendarDate(value: IsoDate): string {
  const { year, month, day } = parseIsoDate(value);
  const weekday = new Date(Date.UTC(year, month - 1, day)).getUTCDay();
  return `${WEEKDAYS[weekday]} ${day} ${MONTHS_LONG[month - 1]} ${year}`;
}

/** An instant as the calendar date it falls on in `timeZone`, e.g. "3 Nov 2026". */
export function formatInstantDate(instant: Date | string | number, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, day: "numeric", month: "short", year: "numeric" }).format(new Date(instant));
}

const plural = (n: number, one: string) => `${n} ${one}${n === 1 ? "" : "s"}`;

/**
 * A span of whole days in words, rounded down so it never overstates: exact days up to a month
 * (what a person plans with), then weeks up to about three months, then months, then years.
 */
export function formatDayCount(days: number): string {
  const d = Math.abs(Math.trunc(days));
  if (d < 32) return plural(d, "day");
  if (d < 91) return plural(Math.floor(d / 7), "week");
  // 365.25 / 12 days in an average Gregorian-calendar month.
  if (d < 730) return plural(Math.floor(d / 30.4375), "month");
  return plural(Math.floor(d / 365.25), "year");
}

/** A calendar date in a <time> element, machine-readable and formatted the same everywhere. */
export function CalendarDate({ value, long = false }: { value: IsoDate; long?: boolean }) {
  return <time dateTime={value}>{long ? formatLongCalendarDate(value) : formatCalendarDate(value)}</time>;
}
