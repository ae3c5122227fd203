import { describe, expect, it } from "vitest";
import { checkRange, checkReportDay, monthEndsBefore, percentOf, recordedBy, wasActiveAt } from "./as-of";

describe("monthEndsBefore", () => {
  it("lists the 12 whole months before today's month, oldest first", () => {
    // Month lengths: the Gregorian calendar (30 days hath September…; common practice, no source).
    expect(monthEndsBefore("2026-12-02")).toEqual([
      "2025-12-31",
      "2026-01-31",
      "2026-02-28",
      "2026-03-31",
      "2026-04-30",
      "2026-05-31",
      "2026-06-30",
      "2026-07-31",
      "2026-08-31",
      "2026-09-30",
      "2026-10-31",
      "2026-11-30",
    ]);
  });

  it("ends February on the 29th in a leap year and leaves out the month still running, even on its last day", () => {
    // 2024 is a leap year: divisible by 4 and not a century (Gregorian rule, papal bull Inter gravissimas, 1582).
    expect(monthEndsBefore("2024-03-31", 2)).toEqual(["2024-01-31", "2024-02-29"]);
    expect(monthEndsBefore("2026-01-15", 1)).toEqual(["2025-12-31"]);
  });
});

describe("percentOf", () => {
  it("gives one decimal and 0 for nothing to count", () => {
    expect(percentOf(2, 3)).toBe(66.7); // 66.666… rounded half up to one decimal (arithmetic)
    expect(percentOf(1, 8)).toBe(12.5);
    expect(percentOf(0, 0)).toBe(0);
    expect(percentOf(5, 5)).toBe(100);
  });
});

describe("recordedBy", () => {
  it("counts what was recorded strictly before the cut-off (the next day's midnight)", () => {
    const cutoff = Date.parse("2026-12-02T06:00:00Z"); // local midnight starting 2 Dec in Chicago (CST, UTC−6)
    expect(recordedBy(Date.parse("2026-12-02T05:59:59Z"), cutoff)).toBe(true);
    expect(recordedBy(Date.parse("2026-12-02T06:00:00Z"), cutoff)).toBe(false);
    expect(recordedBy(null, cutoff)).toBe(false);
  });
});

describe("wasActiveAt", () => {
  const t = (iso: string) => Date.parse(iso);
  it("follows the audit log's activation changes", () => {
    const changes = [
      { at: t("2026-03-01T12:00:00Z"), active: false },
      { at: t("2026-06-01T12:00:00Z"), active: true },
    ];
    expect(wasActiveAt(true, changes, t("2026-02-01T00:00:00Z"))).toBe(true); // before the first change: the opposite of it
    expect(wasActiveAt(true, changes, t("2026-04-01T00:00:00Z"))).toBe(false);
    expect(wasActiveAt(true, changes, t("2026-07-01T00:00:00Z"))).toBe(true);
  });
  it("takes today's state with no history", () => {
    expect(wasActiveAt(false, [], 0)).toBe(false);
    expect(wasActiveAt(true, [], 0)).toBe(true);
  });
});

describe("checkReportDay", () => {
  it("defaults to today and refuses malformed or future dates with a message", () => {
    expect(checkReportDay("", "2026-12-02")).toEqual({ ok: true, day: "2026-12-02" });
    expect(checkReportDay("2026-06-30", "2026-12-02")).toEqual({ ok: true, day: "2026-06-30" });
    const bad = checkReportDay("2026-02-30", "2026-12-02");
    expect(bad.ok).toBe(false);
    expect(!bad.ok && bad.message).toMatch(/real date/);
    const future = checkReportDay("2026-12-03", "2026-12-02");
    expect(!future.ok && future.message).toMatch(/earlier day/);
    expect(checkReportDay("30/06/2026", "2026-12-02").ok).toBe(false);
  });
});

describe("checkRange", () => {
  const defaults = { from: "2026-12-02", to: "2027-03-02" };
  it("fills empty ends and checks order and size", () => {
    expect(checkRange(null, null, defaults)).toEqual({ ok: true, ...defaults });
    expect(checkRange("2026-01-01", "", defaults)).toEqual({ ok: true, from: "2026-01-01", to: "2027-03-02" });
    expect(checkRange("2026-05-01", "2026-04-30", defaults)).toMatchObject({ ok: false, field: "to" });
    expect(checkRange("nope", "2026-04-30", defaults)).toMatchObject({ ok: false, field: "from" });
    expect(checkRange("2020-01-01", "2026-04-30", defaults)).toMatchObject({ ok: false, field: "to" });
  });
});
