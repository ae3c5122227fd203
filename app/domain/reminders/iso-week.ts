/**
 * ISO 8601 week numbers for calendar dates ('YYYY-MM-DD'): weeks start on Monday, and week 1 is
 * the week holding the year's first Thursday (ISO 8601-1:2019, §5.2.4.1 "week number"), so the
 * last days of December can belong to week 1 of the next year and the first days of January to
 * week 52 or 53 of the year before. Pure.
 */
import { addDays, parseIsoDate, type IsoDate } from "../status/calendar-date";

/** 1 = Monday … 7 = Sunday. */
export function isoWeekday(date: IsoDate): number {
  const { year, month, day } = parseIsoDate(date);
  const d = new Date(Date.UTC(year, month - 1, day)).getUTCDay();
  return d === 0 ? 7 : d;
}

/** The Monday that starts the date's ISO week. */
export function isoWeekStart(date: IsoDate): IsoDate {
  return addDays(date, 1 - isoWeekday(date));
}

/** e.g. "2026-W49": the week's year is the year of its Thursday. */
export function isoWeek(date: IsoDate): string {
  const thursday = addDays(date, 4 - isoWeekday(date));
  const { year } = parseIsoDate(thursday);
  const ordinal = Math.round((Date.parse(`${thursday}T00:00:00Z`) - Date.UTC(year, 0, 1)) / 86_400_000) + 1;
  const week = Math.floor((ordinal - 1) / 7) + 1;
  return `${year}-W${String(week).padStart(2, "0")}`;
}

/** The Monday of an ISO week ("2026-W49" → "2026-11-30"), or null when the text is not one. */
export function mondayOfIsoWeek(week: string): IsoDate | null {
  const m = /^(\d{4})-W(\d{2})$/.exec(week);
  if (!m) return null;
  const year = Number(m[1]);
  const n = Number(m[2]);
  if (n < 1 || n > 53) return null;
  // 4 January is always in week 1 (ISO 8601: week 1 holds the first Thursday).
  const jan4 = `${m[1]}-01-04`;
  const monday = addDays(isoWeekStart(jan4), (n - 1) * 7);
  return isoWeek(monday) === week ? monday : null;
}

