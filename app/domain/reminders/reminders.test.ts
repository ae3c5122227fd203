// The reminder decision (issue 9 §1). Cadence values — 90, 60, 30, 14, 7 days before, on the
// day, weekly while lapsed, board credentials also 12 and 6 months before — are common
// practice, no source (shared/TESTING.md "Reminder cadence"). Calendar dates are checked by
// hand and against Python's datetime (date.fromisoformat(…) ± timedelta; date.isocalendar()).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { addDays } from "../status/calendar-date";
import { DEFAULT_REMINDER_POLICY, dueReminders, latestThreshold, policyFromSettings, settingsFromPolicy, thresholdDate, type ReminderPolicy, type ReminderSubject, type SentReminder } from "./index";
import { describeThreshold } from "./words";

const policy = DEFAULT_REMINDER_POLICY;
const subject = (over: Partial<ReminderSubject>): ReminderSubject => ({ requirementId: "req-1", status: "due-soon", date: "2027-01-05", board: false, ...over });

describe("latestThreshold: the one threshold due today (default policy)", () => {
  it.each([
    // Year boundary: 2027-03-31 − 90 days = 2026-12-31 (31 + 28 + 31 days back).
    { case: "90 days before, across the new year", s: { status: "current", date: "2027-03-31" }, today: "2026-12-31", expected: "90d" },
    { case: "one day short of 90 days before", s: { status: "current", date: "2027-03-31" }, today: "2026-12-30", expected: null },
    { case: "30 days before reached yesterday, 14 not yet", s: { date: "2027-01-05" }, today: "2026-12-07", expected: "30d" },
    // Catch-up: the job was down from 60 days before until 6 days before — only "7d" is due.
    { case: "catch-up after missed days sends only the latest passed", s: { date: "2026-12-10" }, today: "2026-12-04", expected: "7d" },
    { case: "on the day itself", s: { date: "2026-12-02" }, today: "2026-12-02", expected: "on-day" },
    // Inside a grace period the engine still says Due soon after the date: the latest passed is "on the day".
    { case: "past the date, still in grace (Due soon)", s: { date: "2026-11-30" }, today: "2026-12-02", expected: "on-day" },
    // 2026-12-02 is a Wednesday of ISO week 49 (Python: date(2026,12,2).isocalendar() → (2026, 49, 3)).
    { case: "lapsed: the ISO week", s: { status: "lapsed", date: "2026-11-30" }, today: "2026-12-02", expected: "lapsed-2026-W49" },
    // 2027-01-01 is a Friday of ISO week 53 of 2026 (Python isocalendar → (2026, 53, 5)).
    { case: "lapsed over the new year: week 53 of 2026", s: { status: "lapsed", date: "2026-11-30" }, today: "2027-01-01", expected: "lapsed-2026-W53" },
    { case: "lapsed: the first Monday of 2027 is week 1", s: { status: "lapsed", date: "2026-11-30" }, today: "2027-01-04", expected: "lapsed-2027-W01" },
    { case: "not started, due in 10 days (an assignment's due date)", s: { status: "not-started", date: "2026-12-12" }, today: "2026-12-02", expected: "14d" },
    { case: "far away: nothing yet", s: { status: "current", date: "2027-06-30" }, today: "2026-12-02", expected: null },
    { case: "waived: nothing", s: { status: "waived", date: "2026-12-05" }, today: "2026-12-02", expected: null },
    { case: "no date (never expires): nothing", s: { status: "current", date: null }, today: "2026-12-02", expected: null },
    // Board credentials: calendar months with end-of-month clamping (shared/STACK.md "Dates").
    { case: "board: 12 months before", s: { status: "current", date: "2027-11-30", board: true }, today: "2026-11-30", expected: "12m" },
    { case: "board: 6 months before 2027-06-30 is 2026-12-30", s: { status: "current", date: "2027-06-30", board: true }, today: "2026-12-31", expected: "6m" },
    { case: "board: 6 months before 31 August is 28 February (clamped)", s: { status: "current", date: "2027-08-31", board: true }, today: "2027-02-28", expected: "6m" },
    { case: "board: the day before that, still the 12-month one", s: { status: "current", date: "2027-08-31", board: true }, today: "2027-02-27", expected: "12m" },
    // 2028 is a leap year: 12 months before 29 February 2028 is 28 February 2027.
    { case: "board: 12 months before a leap day", s: { status: "current", date: "2028-02-29", board: true }, today: "2027-02-28", expected: "12m" },
    { case: "not a board credential: no months-before reminder", s: { status: "current", date: "2027-11-30", board: false }, today: "2026-11-30", expected: null },
  ] as const)("$case → $expected", ({ s, today, expected }) => {
    expect(latestThreshold(policy, subject(s as Partial<ReminderSubject>), today)?.key ?? null).toBe(expected);
  });

  it("says nothing once lapsed when the policy has no weekly reminders", () => {
    const quiet: ReminderPolicy = { ...policy, weeklyWhileLapsed: false };
    expect(latestThreshold(quiet, subject({ status: "lapsed", date: "2026-11-30" }), "2026-12-02")).toBeNull();
  });
});

describe("dueReminders: what was sent holds a reminder back", () => {
  const sent = (threshold: string, dueOn = "2026-12-10", requirementId = "req-1"): SentReminder => ({ requirementId, dueOn, threshold });

  it.each([
    { case: "the same threshold already sent", today: "2026-12-04", history: [sent("7d")], expected: [] },
    { case: "the next threshold after one sent", today: "2026-12-10", history: [sent("7d")], expected: ["on-day"] },
    // After a policy change a threshold can fall before one already sent: nothing goes backwards.
    { case: "a later threshold of the same date already sent", today: "2026-12-04", history: [sent("on-day")], expected: [] },
    { case: "another requirement's reminder does not count", today: "2026-12-04", history: [sent("7d", "2026-12-10", "req-2")], expected: ["7d"] },
  ])("$case", ({ today, history, expected }) => {
    const due = dueReminders(policy, today, [subject({ date: "2026-12-10" })], history);
    expect(due.map((d) => d.threshold)).toEqual(expected);
  });

  it("a renewal (a new valid-through date) starts a fresh series", () => {
    const history = [sent("7d", "2026-12-10"), sent("on-day", "2026-12-10")];
    // Renewed on 2026-12-11 through 2028-12-31: nothing is due for the new date yet …
    expect(dueReminders(policy, "2026-12-11", [subject({ status: "current", date: "2028-12-31" })], history)).toEqual([]);
    // … and 90 days before it (2028-10-02) its own first reminder comes, though "7d"/"on-day" were sent for the old date.
    const due = dueReminders(policy, "2028-10-02", [subject({ status: "due-soon", date: "2028-12-31" })], history);
    expect(due).toEqual([{ requirementId: "req-1", dueOn: "2028-12-31", threshold: "90d", reachedOn: "2028-10-02", status: "due-soon", daysLeft: 90 }]);
  });

  it("weekly while lapsed: once per ISO week, and an 'on the day' sent that week does not hold it back", () => {
    const lapsed = subject({ status: "lapsed", date: "2026-12-03" });
    expect(dueReminders(policy, "2026-12-04", [lapsed], [sent("on-day", "2026-12-03")]).map((d) => d.threshold)).toEqual(["lapsed-2026-W49"]);
    expect(dueReminders(policy, "2026-12-06", [lapsed], [sent("lapsed-2026-W49", "2026-12-03")])).toEqual([]);
    // 2026-12-07 is the Monday of week 50.
    expect(dueReminders(policy, "2026-12-07", [lapsed], [sent("lapsed-2026-W49", "2026-12-03")]).map((d) => d.threshold)).toEqual(["lapsed-2026-W50"]);
  });

  it("property: a job run every day sends each threshold once, in order; a job run on some days sends a subset of those, never out of order", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 800 }), fc.array(fc.boolean(), { minLength: 500, maxLength: 500 }), fc.boolean(), (offset, runs, board) => {
        const date = addDays("2026-01-01", offset);
        const start = addDays(date, -400);
        const history: (SentReminder & { reachedOn: string })[] = [];
        for (let i = 0; i < runs.length; i++) {
          if (!runs[i]) continue;
          const today = addDays(start, i);
          const status = today > date ? "lapsed" : "due-soon";
          for (const d of dueReminders(policy, today, [subject({ date, status, board })], history)) history.push({ ...d });
        }
        const keys = history.map((h) => h.threshold);
        expect(new Set(keys).size).toBe(keys.length);
        const beforeDate = history.filter((h) => !h.threshold.startsWith("lapsed-"));
        for (let i = 1; i < beforeDate.length; i++) expect(thresholdDate(beforeDate[i].threshold, date)! > thresholdDate(beforeDate[i - 1].threshold, date)!).toBe(true);
      }),
      { numRuns: 60 },
    );
    // Every day: the whole series, 12 and 6 months first for a board credential.
    const date = "2027-08-31";
    const history: SentReminder[] = [];
    for (let today = "2026-08-01"; today <= "2027-09-20"; today = addDays(today, 1)) {
      const status = today > date ? "lapsed" : "due-soon";
      history.push(...dueReminders(policy, today, [subject({ date, status, board: true })], history));
    }
    expect(history.map((h) => h.threshold)).toEqual(["12m", "6m", "90d", "60d", "30d", "14d", "7d", "on-day", "lapsed-2027-W35", "lapsed-2027-W36", "lapsed-2027-W37", "lapsed-2027-W38"]);
  });
});

describe("the policy in organisation settings", () => {
  it("reads the seed's reminderDays (0 = on the day) and defaults the rest", () => {
    expect(policyFromSettings({ reminderDays: [90, 60, 30, 14, 7, 0] })).toEqual(DEFAULT_REMINDER_POLICY);
    expect(policyFromSettings({ reminderDays: [60, 30, 7, 0] })).toMatchObject({ daysBefore: [60, 30, 7], onTheDay: true, boardMonthsBefore: [12, 6] });
    expect(policyFromSettings({})).toEqual(DEFAULT_REMINDER_POLICY);
  });

  it("round-trips, sorted largest first, duplicates and out-of-range values dropped", () => {
    const stored = settingsFromPolicy({ daysBefore: [7, 30, 30, 0, 400], onTheDay: false, weeklyWhileLapsed: false, boardMonthsBefore: [6, 30], managerDigest: false });
    expect(stored).toEqual({ reminderDays: [30, 7], reminderPolicy: { weeklyWhileLapsed: false, boardMonthsBefore: [6], managerDigest: false } });
    expect(policyFromSettings(stored)).toEqual({ daysBefore: [30, 7], onTheDay: false, weeklyWhileLapsed: false, boardMonthsBefore: [6], managerDigest: false });
  });

  it.each([
    ["90d", "90 days before"],
    ["1d", "1 day before"],
    ["on-day", "on the day"],
    ["12m", "12 months before"],
    ["lapsed-2026-W49", "weekly while lapsed (week 49 of 2026)"],
  ])("describes %s as %s", (key, words) => expect(describeThreshold(key)).toBe(words));
});
