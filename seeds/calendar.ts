/**
 * Calendar dates as ISO 'YYYY-MM-DD' text (STYLE.md "Data"), with month arithmetic that clamps
 * to the end of the month: shared/STACK.md notes that JavaScript and SQLite both turn
 * 31 January + 1 month into 3 March, so neither is used for it.
 */
export type IsoDate = string;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

export function parseIsoDate(value: string): { y: number; m: number; d: number } {
  const match = ISO_DATE.exec(value);
  if (!match) throw new RangeError(`not a YYYY-MM-DD date: ${value}`);
  const [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  if (m < 1 || m > 12 || d < 1 || d > daysInMonth(y, m)) throw new RangeError(`no such date: ${value}`);
  return { y, m, d };
}

export function isIsoDate(value: string): boolean {
  try {
    parseIsoDate(value);
    return true;
  } catch {
    return false;
  }
}

export function formatIsoDate(y: number, m: number, d: number): IsoDate {
  return `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
}

export function daysInMonth(y: number, m: number): number {
  return new Date(Date.UTC(y, m, 0)).getUTCDate();
}

export function addDays(date: IsoDate, days: number): IsoDate {
  const { y, m, d } = parseIsoDate(date);
  const t = new Date(Date.UTC(y, m - 1, d + days));
  return formatIsoDate(t.getUTCFullYear(), t.getUTCMonth() + 1, t.getUTCDate());
}

/** Adds whole months; a day past the end of the target month becomes its last day. */
export function addMonths(date: IsoDate, months: number): IsoDate {
  const { y, m, d } = parseIsoDate(date);
  const index = y * 12 + (m - 1) + months;
  const ty = Math.floor(index / 12);
  const tm = (index % 12) + 1;
  return formatIsoDate(ty, tm, Math.min(d, daysInMonth(ty, tm)));
}

export function endOfMonth(date: IsoDate): IsoDate {
  const { y, m } = parseIsoDate(date);
  return formatIsoDate(y, m, daysInMonth(y, m));
}

/** The same month as `date`, on day `day` (clamped to the month's length). */
export function withDay(date: IsoDate, day: number): IsoDate {
  const { y, m } = parseIsoDate(date);
  return formatIsoDate(y, m, Math.min(Math.max(1, day), daysInMonth(y, m)));
}

/** Whole days from `a` to `b` (positive when b is later). */
export function daysBetween(a: IsoDate, b: IsoDate): number {
  const pa = parseIsoDate(a);
  const pb = parseIsoDate(b);
  return Math.round((Date.UTC(pb.y, pb.m - 1, pb.d) - Date.UTC(pa.y, pa.m - 1, pa.d)) / 86_400_000);
}

/** Today's calendar date in an IANA time zone. */
export function todayIn(timeZone: string, now: Date = new Date()): IsoDate {
  // en-CA formats as YYYY-MM-DD.
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(now);
}

/**
 * A fixed instant on a calendar date (12:00 UTC, which is the morning of the same date in every
 * US time zone): seeded timestamps come from dates, never from the clock, so re-runs match.
 */
export function instantOn(date: IsoDate, minutes = 0): Date {
  const { y, m, d } = parseIsoDate(date);
  return new Date(Date.UTC(y, m - 1, d, 12, minutes));
}
