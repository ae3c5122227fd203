/**
 * The status engine for one person × one requirement: the status on the organisation's
 * calendar day, the date it next changes (and to what), and the evidence behind it.
 *
 * Pure: the caller passes `now` (an instant) and the organisation's IANA time zone; "today" is
 * the calendar date of `now` in that zone, so a credential valid through 8 March lapses at local
 * midnight, whether that midnight is 05:00 or 06:00 UTC (US daylight-saving changes).
 *
 * Rules (PRODUCT.md "Status words and marks"; issue 8 §4):
 * - Held record (a credential, a passed exam, a signed check-off) valid through V:
 *   Current until the reminder window opens (V − reminder days), Due soon from then through the
 *   grace period (V + grace days), Lapsed after it. A due-date extension granted by a manager
 *   moves the end of Due soon to its new due date when that is later; the record's own
 *   valid-through date is kept as evidence, unchanged.
 * - Outstanding work (nothing held) due on D (or the extension's date, when later): Not started
 *   through D, Lapsed after it. Grace extends validity of what is held, not a first due date.
 * - An active waiver (not revoked, end date today or later) shows Waived instead of anything but
 *   Current, and the status changes again the day after it ends.
 */
import { addDays, calendarDateIn, parseIsoDate, type IsoDate } from "./calendar-date";
import { DEFAULT_REMINDER_DAYS, type Status } from "./index";

export type EngineOptions = {
  now: Date;
  /** The organisation's IANA time zone, e.g. "America/Chicago". */
  timeZone: string;
  reminderDays?: number;
};

export type Evidence =
  | { kind: "credential"; id: string; typeName: string; number: string | null; issuer: string | null; issuedOn: IsoDate; validThrough: IsoDate | null; verified: boolean }
  | { kind: "completion"; of: "exam" | "checklist"; refId: string; completedOn: IsoDate; validThrough: IsoDate | null }
  | { kind: "assignment"; id: string; dueOn: IsoDate }
  | { kind: "waiver"; id: string; reason: string; endsOn: IsoDate; grantedBy: string | null }
  | { kind: "extension"; id: string; reason: string; newDueOn: IsoDate; grantedBy: string | null };

export type EngineWaiver = { id: string; reason: string; endsOn: IsoDate; grantedBy?: string | null; revoked?: boolean };
export type EngineExtension = { id: string; reason: string; newDueOn: IsoDate; grantedBy?: string | null };

export type AssessInput = {
  graceDays: number;
  /** What is held, with its valid-through date (null: never expires); null when nothing is held. */
  held: { validThrough: IsoDate | null; evidence: Evidence } | null;
  /** The due date of outstanding work (an open assignment); null when none is set. */
  dueOn: IsoDate | null;
  dueEvidence?: Evidence | null;
  waivers: readonly EngineWaiver[];
  extensions: readonly EngineExtension[];
};

export type Assessment = {
  status: Status;
  /** "valid-through" for a held record, "due" for outstanding work. */
  dateMeaning: "valid-through" | "due";
  /** The record's valid-through date or the work's due date (before any extension). */
  date: IsoDate | null;
  /** Last day of the grace period (valid through + grace days), for held records with a date. */
  graceThrough: IsoDate | null;
  /** The extension's new due date when one is in force. */
  extendedTo: IsoDate | null;
  /** Set when a waiver decided the status: the waiver's last day. */
  waivedThrough: IsoDate | null;
  /** The first calendar day with a different status, and that status; null when nothing changes on its own. */
  nextChangeOn: IsoDate | null;
  nextStatus: Status | null;
  evidence: Evidence[];
};

/**
 * The dates that decide the status, computed once per assessment (ISO dates compare as strings,
 * so judging a day is then a few string comparisons — the Team matrix judges 80,000 cells).
 */
type Thresholds = {
  /** Held with a date: first day of Due soon, and last day before Lapsed (grace and extension included). */
  windowStart: IsoDate | null;
  heldEnd: IsoDate | null;
  /** Outstanding: the last day still on time (due date or extension). */
  due: IsoDate | null;
  /** The active waiver that ends last, if any is not revoked. */
  waiver: EngineWaiver | null;
};

/** The later of two optional dates (what `latest([a, b])` gives, without the array). */
function later(a: IsoDate | null, b: IsoDate | null): IsoDate | null {
  if (a === null) return b;
  if (b === null) return a;
  return b > a ? b : a;
}

/**
 * The waiver that ends last among those not revoked. Most cells have none or one, and skip the
 * sort; with several, the sort stays exactly as written (its order among equal end dates is the
 * one the evidence has always shown).
 */
function lastWaiver(waivers: readonly EngineWaiver[]): EngineWaiver | null {
  if (waivers.length === 0) return null;
  if (waivers.length === 1) return waivers[0].revoked ? null : waivers[0];
  return waivers.filter((w) => !w.revoked).sort((a, b) => (a.endsOn < b.endsOn ? 1 : -1))[0] ?? null;
}

function thresholdsOf(input: AssessInput, reminderDays: number): Thresholds {
  let extendedTo: IsoDate | null = null;
  for (const e of input.extensions) extendedTo = later(extendedTo, e.newDueOn);
  const v = input.held?.validThrough ?? null;
  const waiver = lastWaiver(input.waivers);
  return {
    windowStart: input.held && v !== null ? addDays(v, -reminderDays) : null,
    heldEnd: input.held && v !== null ? later(addDays(v, Math.max(0, input.graceDays)), extendedTo) : null,
    due: input.held ? null : later(input.dueOn, extendedTo),
    waiver,
  };
}

/** Status on one calendar day, before the next-change search. */
function statusOn(input: AssessInput, t: Thresholds, day: IsoDate): { status: Status; waiver: EngineWaiver | null } {
  let status: Status;
  if (input.held) {
    if (t.heldEnd === null) status = "current";
    else if (day > t.heldEnd) status = "lapsed";
    else status = day >= t.windowStart! ? "due-soon" : "current";
  } else {
    status = t.due !== null && day > t.due ? "lapsed" : "not-started";
  }
  if (status === "current") return { status, waiver: null };
  return t.waiver && t.waiver.endsOn >= day ? { status: "waived", waiver: t.waiver } : { status, waiver: null };
}

/** The days on which a status can change: the only candidates for "next change". */
function breakpoints(input: AssessInput, reminderDays: number): IsoDate[] {
  const out: IsoDate[] = [];
  const v = input.held?.validThrough ?? null;
  if (input.held && v !== null) {
    out.push(addDays(v, -reminderDays), addDays(v, Math.max(0, input.graceDays) + 1));
  }
  if (input.dueOn) out.push(addDays(input.dueOn, 1));
  for (const e of input.extensions) out.push(addDays(e.newDueOn, 1));
  for (const w of input.waivers) if (!w.revoked) out.push(addDays(w.endsOn, 1));
  // The usual two days (a held record) without a Set; ISO dates sort as text, as `sort()` does.
  if (out.length < 2) return out;
  if (out.length === 2) return out[0] === out[1] ? [out[0]] : out[0] < out[1] ? out : [out[1], out[0]];
  return [...new Set(out)].sort();
}

/** Assesses one person × requirement on a calendar day (the organisation's "today"). */
export function assessOn(input: AssessInput, today: IsoDate, reminderDays: number = DEFAULT_REMINDER_DAYS): Assessment {
  parseIsoDate(today);
  const t = thresholdsOf(input, reminderDays);
  const now = statusOn(input, t, today);
  let nextChangeOn: IsoDate | null = null;
  let nextStatus: Status | null = null;
  for (const day of breakpoints(input, reminderDays)) {
    if (day <= today) continue;
    const then = statusOn(input, t, day).status;
    if (then !== now.status) {
      nextChangeOn = day;
      nextStatus = then;
      break;
    }
  }
  const extensionInForce =
    input.extensions.length < 2 ? (input.extensions[0] ?? null) : ([...input.extensions].sort((a, b) => (a.newDueOn < b.newDueOn ? 1 : -1))[0] ?? null);
  const v = input.held?.validThrough ?? null;
  const evidence: Evidence[] = [];
  if (input.held) evidence.push(input.held.evidence);
  else if (input.dueEvidence) evidence.push(input.dueEvidence);
  if (extensionInForce) evidence.push({ kind: "extension", id: extensionInForce.id, reason: extensionInForce.reason, newDueOn: extensionInForce.newDueOn, grantedBy: extensionInForce.grantedBy ?? null });
  if (now.waiver) evidence.push({ kind: "waiver", id: now.waiver.id, reason: now.waiver.reason, endsOn: now.waiver.endsOn, grantedBy: now.waiver.grantedBy ?? null });
  return {
    status: now.status,
    dateMeaning: input.held ? "valid-through" : "due",
    date: input.held ? v : input.dueOn,
    graceThrough: input.held && v !== null ? addDays(v, Math.max(0, input.graceDays)) : null,
    extendedTo: extensionInForce?.newDueOn ?? null,
    waivedThrough: now.waiver?.endsOn ?? null,
    nextChangeOn,
    nextStatus,
    evidence,
  };
}

/** Assesses on the organisation's calendar day of `now`. */
export function assess(input: AssessInput, { now, timeZone, reminderDays = DEFAULT_REMINDER_DAYS }: EngineOptions): Assessment {
  return assessOn(input, calendarDateIn(timeZone, now), reminderDays);
}

/**
 * The instant a calendar day begins in a time zone (local midnight), e.g. when a status change
 * on `nextChangeOn` takes effect. Found by correcting a UTC guess by the zone's offset, twice,
 * because the offset itself can differ across a daylight-saving change.
 */
export function startOfDayIn(timeZone: string, day: IsoDate): Date {
  const { year, month, day: d } = parseIsoDate(day);
  const target = Date.UTC(year, month - 1, d);
  let guess = target;
  for (let i = 0; i < 3; i++) {
    const parts = new Intl.DateTimeFormat("en-US", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" }).formatToParts(new Date(guess));
    const get = (t: string) => Number(parts.find((p) => p.type === t)?.value);
    const local = Date.UTC(get("year"), get("month") - 1, get("day"), get("hour"), get("minute"), get("second"));
    guess += target - local;
  }
  return new Date(guess);
}
