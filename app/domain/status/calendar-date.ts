/**
 * Calendar dates as ISO 'YYYY-MM-DD' text in the organisation's time zone (STYLE.md "Data").
 * Pure and safe in the browser. Arithmetic goes through Date.UTC on the three numbers, never
 * `new Date('2026-03-31')`, which is UTC midnight and shows the 30th in Chicago
 * (shared/STACK.md "Dates"). Month arithmetic clamps to the end of the month, because
 * JavaScript and SQLite both turn 31 January + 1 month into 3 March (same source).
 */
export type IsoDate = string;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

export function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/*
 * The Team matrix judges 80,000 person × requirement cells per assessment, each with a few date
 * comparisons and additions over a few thousand distinct dates, so the parse of a valid date and
 * its day number are remembered (a bounded map, emptied when full; invalid text is never kept and
 * still throws). The results are the same as computing them afresh.
 */
type DateParts = { readonly year: number; readonly month: number; readonly day: number };
const MEMO_LIMIT = 20_000;
const parsed = new Map<string, DateParts>();
const dayNumbers = new Map<string, number>();
const fromDayNumbers = new Map<number, IsoDate>();
function remember<K, V>(map: Map<K, V>, key: K, value: V): V {
  if (map.size >= MEMO_LIMIT) map.clear();
  map.set(key, value);
  return value;
}

/** The three numbers of a calendar date; throws on anything that is not a real date. */
export function parseIsoDate(value: string): { year: number; month: number; day: number } {
  const known = parsed.get(value);
  if (known) return { year: known.year, month: known.month, day: known.day };
  const match = ISO_DATE.exec(value);
  if (!match) throw new RangeError(`not a YYYY-MM-DD date: ${value}`);
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) throw new RangeError(`no such date: ${value}`);
  remember(parsed, value, Object.freeze({ year, month, day }));
  return { year, month, day };
}

/** Days since 1970-01-01 of a valid date (throws like parseIsoDate otherwise). */
function dayNumber(value: IsoDate): number {
  const known = dayNumbers.get(value);
  if (known !== undefined) return known;
  const { year, month, day } = parseIsoDate(value);
  return remember(dayNumbers, value, Date.UTC(year, month - 1, day) / 86_400_000);
}

function isoOfDayNumber(n: number): IsoDate {
  const known = fromDayNumbers.get(n);
  if (known !== undefined) return known;
  const t = new Date(n * 86_400_000);
  return remember(fromDayNumbers, n, formatIsoDate(t.getUTCFullYear(), t.getUTCMonth() + 1, t.getUTCDate()));
}

export function isIsoDate(value: unknown): value is IsoDate {
  if (typeof value !== "string") return false;
  try {
    parseIsoDate(value);
    return true;
  } catch {
    return false;
  }
}

export function formatIsoDate(year: number, month: number, day: number): IsoDate {
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")}`;
}

/** Whole days from `from` to `to`: positive when `to` is later. */
export function daysBetween(from: IsoDate, to: IsoDate): number {
  return Math.round(dayNumber(to) - dayNumber(from));
}

export function addDays(value: IsoDate, days: number): IsoDate {
  const n = dayNumber(value);
  // Whole days stay on the memo; anything else goes the long way (Date.UTC takes fractions as is).
  if (Number.isInteger(days)) return isoOfDayNumber(n + days);
  const { year, month, day } = parseIsoDate(value);
  const t = new Date(Date.UTC(year, month - 1, day + days));
  return formatIsoDate(t.getUTCFullYear(), t.getUTCMonth() + 1, t.getUTCDate());
}

/** Whole months; a day past the end of the target month becomes its last day. */
export function addMonths(value: IsoDate, months: number): IsoDate {
  const { year, month, day } = parseIsoDate(value);
  const index = year * 12 + (month - 1) + months;
  const y = Math.floor(index / 12);
  const m = index - y * 12 + 1;
  return formatIsoDate(y, m, Math.min(day, daysInMonth(y, m)));
}

// Building an Intl.DateTimeFormat costs far more than using one; the Team matrix converts
// thousands of instants per assessment, so one formatter per zone is kept.
const formatters = new Map<string, Intl.DateTimeFormat>();
function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
    formatters.set(timeZone, f);
  }
  return f;
}

/** The calendar date an instant falls on in an IANA time zone (e.g. "today" for the organisation). */
export function calendarDateIn(timeZone: string, instant: Date): IsoDate {
  // en-CA formats as YYYY-MM-DD; formatToParts keeps us independent of that locale detail.
  const parts = formatterFor(timeZone).formatToParts(instant);
  const part = (type: string) => Number(parts.find((p) => p.type === type)?.value);
  return formatIsoDate(part("year"), part("month"), part("day"));
}

/** The last day of the date's month. */
export function endOfMonth(value: IsoDate): IsoDate {
  const { year, month } = parseIsoDate(value);
  return formatIsoDate(year, month, daysInMonth(year, month));
}
