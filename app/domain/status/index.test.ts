import { describe, expect, it } from "vitest";
import {
  compareByDate,
  countStatuses,
  heldStatus,
  isWaiverActive,
  outstandingStatus,
  reminderWindowDays,
  withWaiver,
  type Status,
} from "./index";

/*
 * Status words and their meanings: PRODUCT.md "Status words and marks" (Tidemark's own).
 * "Valid through" is inclusive and distinct from "expires on": shared/TESTING.md "Credential dates".
 * Check dates come from published validity examples:
 * - C1: a life-support card issued 2026-03-12 is valid through 2028-03-31 (American Heart
 *   Association, "Course Card Information", cpr.heart.org: "valid for two years through the end of
 *   the month during which the course completion card was issued").
 * - C2: a board credential passed 2021-04-22 expires 2026-04-30 (NBRC, "Credential Maintenance &
 *   State License Renewal", nbrc.org, its own example).
 * Day counts across February 2028 (a leap year: divisible by 4, not by 100) were checked with
 * Python's datetime: 2028-01-01 → 2028-03-31 is 90 days; 2026-01-30 → 2026-04-30 is 90 days.
 */

describe("heldStatus — a credential or met requirement with a valid-through date (reminder window 90 days)", () => {
  const cases: { name: string; validThrough: string | null; today: string; status: Status; daysLeft: number | null; daysLapsed: number | null }[] = [
    // C1 card, valid through 2028-03-31
    { name: "C1: the valid-through day itself is still valid (inside the window)", validThrough: "2028-03-31", today: "2028-03-31", status: "due-soon", daysLeft: 0, daysLapsed: null },
    { name: "C1: the day after valid-through is lapsed, for 1 day", validThrough: "2028-03-31", today: "2028-04-01", status: "lapsed", daysLeft: -1, daysLapsed: 1 },
    { name: "C1: exactly 90 days before is inside the window (reminders start at 90 days)", validThrough: "2028-03-31", today: "2028-01-01", status: "due-soon", daysLeft: 90, daysLapsed: null },
    { name: "C1: 91 days before is still current", validThrough: "2028-03-31", today: "2027-12-31", status: "current", daysLeft: 91, daysLapsed: null },
    { name: "C1: on the issue day, two years out, current", validThrough: "2028-03-31", today: "2026-03-12", status: "current", daysLeft: 750, daysLapsed: null },
    // C2 board credential, expires 2026-04-30
    { name: "C2: valid on 2026-04-30", validThrough: "2026-04-30", today: "2026-04-30", status: "due-soon", daysLeft: 0, daysLapsed: null },
    { name: "C2: lapsed on 2026-05-01", validThrough: "2026-04-30", today: "2026-05-01", status: "lapsed", daysLeft: -1, daysLapsed: 1 },
    { name: "C2: 90 days before (2026-01-30) is due soon", validThrough: "2026-04-30", today: "2026-01-30", status: "due-soon", daysLeft: 90, daysLapsed: null },
    { name: "C2: 91 days before (2026-01-29) is current", validThrough: "2026-04-30", today: "2026-01-29", status: "current", daysLeft: 91, daysLapsed: null },
    { name: "C4: on 2026-09-15, within the reinstatement period, still lapsed for 138 days", validThrough: "2026-04-30", today: "2026-09-15", status: "lapsed", daysLeft: -138, daysLapsed: 138 },
    // C3: a board credential earned before 2002-07-01 never expires (NBRC, same page)
    { name: "C3: no valid-through date is current for ever", validThrough: null, today: "2099-12-31", status: "current", daysLeft: null, daysLapsed: null },
    // Across a year end, where a string comparison of months would go wrong
    { name: "year end: valid through 2026-12-31, seen on 2027-01-01", validThrough: "2026-12-31", today: "2027-01-01", status: "lapsed", daysLeft: -1, daysLapsed: 1 },
  ];
  it.each(cases)("$name", ({ validThrough, today, status, daysLeft, daysLapsed }) => {
    const result = heldStatus(validThrough, { today });
    expect(result).toMatchObject({ status, daysLeft, daysLapsed, date: validThrough });
  });

  it("uses the organisation's reminder window when one is given", () => {
    // 60-day window: 61 days left is current, 60 is due soon.
    expect(heldStatus("2028-03-31", { today: "2028-01-30", reminderDays: 60 }).status).toBe("current");
    expect(heldStatus("2028-03-31", { today: "2028-01-31", reminderDays: 60 }).status).toBe("due-soon");
  });
});

describe("outstandingStatus — required work not done yet", () => {
  const cases: { name: string; dueOn: string | null; today: string; status: Status; daysLeft: number | null; daysLapsed: number | null }[] = [
    { name: "due in 21 days: not started", dueOn: "2026-12-23", today: "2026-12-02", status: "not-started", daysLeft: 21, daysLapsed: null },
    { name: "due today: still not started (the due day is on time)", dueOn: "2026-12-02", today: "2026-12-02", status: "not-started", daysLeft: 0, daysLapsed: null },
    { name: "due yesterday: lapsed for 1 day", dueOn: "2026-12-01", today: "2026-12-02", status: "lapsed", daysLeft: -1, daysLapsed: 1 },
    { name: "due 9 days ago: lapsed for 9 days", dueOn: "2026-11-23", today: "2026-12-02", status: "lapsed", daysLeft: -9, daysLapsed: 9 },
    { name: "no due date: not started, undated", dueOn: null, today: "2026-12-02", status: "not-started", daysLeft: null, daysLapsed: null },
  ];
  it.each(cases)("$name", ({ dueOn, today, status, daysLeft, daysLapsed }) => {
    expect(outstandingStatus(dueOn, { today })).toMatchObject({ status, daysLeft, daysLapsed, date: dueOn });
  });
});

describe("waivers", () => {
  const today = "2026-12-02";
  it.each([
    { name: "a waiver ending today still counts", endsOn: "2026-12-02", revoked: false, active: true },
    { name: "a waiver that ended yesterday does not", endsOn: "2026-12-01", revoked: false, active: false },
    { name: "a revoked waiver does not", endsOn: "2027-01-01", revoked: true, active: false },
    { name: "a waiver ending in 30 days counts", endsOn: "2027-01-01", revoked: false, active: true },
  ])("$name", ({ endsOn, revoked, active }) => {
    expect(isWaiverActive({ endsOn, revoked }, today)).toBe(active);
  });

  it.each([
    { name: "lapsed + active waiver → waived", base: heldStatus("2026-11-15", { today }), expected: "waived" },
    { name: "not started + active waiver → waived", base: outstandingStatus(null, { today }), expected: "waived" },
    { name: "due soon + active waiver → waived (no reminders for excused work)", base: heldStatus("2027-01-15", { today }), expected: "waived" },
    { name: "current + active waiver → current (the person has renewed)", base: heldStatus("2028-01-15", { today }), expected: "current" },
  ] as const)("$name", ({ base, expected }) => {
    const result = withWaiver(base, [{ endsOn: "2027-01-01" }], today);
    expect(result.status).toBe(expected);
    if (expected === "waived") {
      expect(result.waivedThrough).toBe("2027-01-01");
      expect(result.daysLapsed).toBeNull();
    }
  });

  it("an expired waiver leaves the lapse showing, with how long ago", () => {
    const result = withWaiver(heldStatus("2026-11-15", { today }), [{ endsOn: "2026-12-01" }], today);
    expect(result).toMatchObject({ status: "lapsed", daysLapsed: 17 });
  });

  it("of several waivers, the one ending last is shown", () => {
    const result = withWaiver(outstandingStatus("2026-11-01", { today }), [{ endsOn: "2026-12-10" }, { endsOn: "2027-02-01" }, { endsOn: "2026-11-30" }], today);
    expect(result.waivedThrough).toBe("2027-02-01");
  });
});

describe("ordering and counting", () => {
  it("orders by date, overdue first, undated last with the work to do before what never expires", () => {
    const today = "2026-12-02";
    const items = [
      { label: "no expiry", ...heldStatus(null, { today }) },
      { label: "card due soon", ...heldStatus("2027-01-10", { today }) },
      { label: "undated work", ...outstandingStatus(null, { today }) },
      { label: "overdue check-off", ...outstandingStatus("2026-11-23", { today }) },
      { label: "exam", ...outstandingStatus("2026-12-23", { today }) },
    ];
    expect(items.sort(compareByDate).map((i) => i.label)).toEqual(["overdue check-off", "exam", "card due soon", "undated work", "no expiry"]);
  });

  it("counts statuses", () => {
    const s = (status: Status) => ({ status });
    expect(countStatuses([s("lapsed"), s("lapsed"), s("due-soon"), s("current"), s("waived"), s("not-started")])).toEqual({ lapsed: 2, dueSoon: 1, current: 1, waived: 1 });
  });

  it.each([
    { policy: undefined, days: 90 },
    { policy: [], days: 90 },
    { policy: [90, 60, 30, 14, 7, 0], days: 90 },
    { policy: [60, 30, 7, 0], days: 60 },
  ])("reminder window of $policy is $days days", ({ policy, days }) => {
    expect(reminderWindowDays(policy)).toBe(days);
  });
});
