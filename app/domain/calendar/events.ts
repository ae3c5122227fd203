/**
 * What goes on a calendar feed (issue 10 §3), as plain all-day events. Pure: the caller loads the
 * plan rows, exam windows and expiries; app/calendar/ics.server.ts writes them as iCalendar.
 *
 * Every date here is an organisation calendar date ('YYYY-MM-DD'), written as an all-day DATE
 * value, which carries no time zone (RFC 5545 §3.3.4, §3.6.1): a card valid through 14 March is on
 * 14 March in every calendar app, whatever the DST change that day. An all-day event's DTEND is
 * the day after its last day (RFC 5545 §3.6.1: "the "DTEND" property ... is non-inclusive").
 */
import { addDays, type IsoDate } from "~/domain/status/calendar-date";
import type { PlanRow } from "~/domain/status/plan";

export type CalendarEvent = {
  /** Stable across fetches, so calendar apps update an event instead of adding a second one. */
  uid: string;
  /** First day. */
  start: IsoDate;
  /** The day after the last day (non-inclusive, RFC 5545). */
  end: IsoDate;
  summary: string;
  description: string;
  url: string;
};

const UID_DOMAIN = "tidemark";

function uidOf(...parts: string[]): string {
  return `${parts.map((p) => p.replace(/[^A-Za-z0-9_-]/g, "-")).join(".")}@${UID_DOMAIN}`;
}

function oneDay(uid: string, day: IsoDate, summary: string, description: string, url: string): CalendarEvent {
  return { uid, start: day, end: addDays(day, 1), summary, description, url };
}

/** "14 March 2027": the description is read in a calendar app, not on our pages. */
function words(day: IsoDate): string {
  const [y, m, d] = day.split("-").map(Number);
  const months = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];
  return `${d} ${months[m - 1]} ${y}`;
}

/**
 * The person's plan rows that carry a date: work due on its (possibly extended) due date, and
 * anything held — cards, licences, met exams and check-offs that recur — on its last valid day.
 */
export function planEvents(rows: readonly PlanRow[], personId: string, planUrl: string): CalendarEvent[] {
  const out: CalendarEvent[] = [];
  for (const row of rows) {
    const date = row.result.date;
    if (!date) continue;
    const uid = uidOf("person", personId, row.key);
    const waived = row.result.waivedThrough ? ` Waived through ${words(row.result.waivedThrough)}.` : "";
    if (row.dateMeaning === "valid-through") {
      const what = row.kind === "credential" ? "Renew it and upload the new card before then." : "Complete it again before then.";
      out.push(oneDay(uid, date, `Expires: ${row.title} (last day valid)`, `${row.title} is valid through ${words(date)}, that day included. ${what}${waived}`, planUrl));
    } else {
      const label = row.kind === "exam" ? "Exam due" : row.kind === "checklist" ? "Check-off due" : "Due";
      const extended = row.extendedTo ? " The due date was extended." : "";
      out.push(oneDay(uid, date, `${label}: ${row.title}`, `${row.title} is due on ${words(date)}.${extended}${waived}`, planUrl));
    }
  }
  return out;
}

export type ExamWindow = { examId: string; title: string; availableFrom: IsoDate | null; availableUntil: IsoDate | null };

/**
 * When an assigned exam can be taken: one span from its first to its last day; with only one
 * end set, that day alone ("opens" or "last day"); with neither, nothing (it is always open).
 */
export function examWindowEvents(windows: readonly ExamWindow[], personId: string, examsUrl: string): CalendarEvent[] {
  const out: CalendarEvent[] = [];
  for (const w of windows) {
    const uid = uidOf("person", personId, "exam-window", w.examId);
    if (w.availableFrom && w.availableUntil) {
      out.push({
        uid,
        start: w.availableFrom,
        end: addDays(w.availableUntil, 1),
        summary: `Exam open: ${w.title}`,
        description: `${w.title} can be taken from ${words(w.availableFrom)} through ${words(w.availableUntil)}.`,
        url: examsUrl,
      });
    } else if (w.availableFrom) {
      out.push(oneDay(uid, w.availableFrom, `Exam opens: ${w.title}`, `${w.title} can be taken from ${words(w.availableFrom)}.`, examsUrl));
    } else if (w.availableUntil) {
      out.push(oneDay(uid, w.availableUntil, `Last day to take: ${w.title}`, `${w.title} can be taken through ${words(w.availableUntil)}.`, examsUrl));
    }
  }
  return out;
}

export type UnitExpiry = { personId: string; name: string; requirementId: string; requirement: string; validThrough: IsoDate };

/** A manager's feed: each person's record in their units on its last valid day. */
export function expiryEvents(expiries: readonly UnitExpiry[], managerId: string, cellUrl: (e: UnitExpiry) => string): CalendarEvent[] {
  return expiries.map((e) =>
    oneDay(
      uidOf("units", managerId, e.personId, e.requirementId),
      e.validThrough,
      `Expires: ${e.name} — ${e.requirement} (last day valid)`,
      `${e.name}'s ${e.requirement} is valid through ${words(e.validThrough)}, that day included.`,
      cellUrl(e),
    ),
  );
}
