// ISO 8601 week numbers. Check values: the examples of Wikipedia's "ISO week date" article
// (from memory) and, independently, Python's datetime.date.isocalendar() run on each date.
import { describe, expect, it } from "vitest";
import { isoWeek, isoWeekday, isoWeekStart, mondayOfIsoWeek } from "./iso-week";

describe("isoWeek", () => {
  it.each([
    ["2005-01-01", "2004-W53", 6],
    ["2007-12-31", "2008-W01", 1],
    ["2008-12-29", "2009-W01", 1],
    ["2009-12-31", "2009-W53", 4],
    ["2010-01-03", "2009-W53", 7],
    ["2026-02-28", "2026-W09", 6],
    ["2026-03-31", "2026-W14", 2],
    ["2026-11-30", "2026-W49", 1],
    ["2026-12-02", "2026-W49", 3],
    ["2026-12-28", "2026-W53", 1],
    ["2027-01-01", "2026-W53", 5],
    ["2027-01-04", "2027-W01", 1],
  ])("%s is in %s, weekday %i", (date, week, weekday) => {
    expect(isoWeek(date)).toBe(week);
    expect(isoWeekday(date)).toBe(weekday);
  });

  it("finds the Monday of a week and refuses a week that does not exist", () => {
    expect(isoWeekStart("2027-01-01")).toBe("2026-12-28");
    expect(mondayOfIsoWeek("2026-W49")).toBe("2026-11-30");
    expect(mondayOfIsoWeek("2026-W53")).toBe("2026-12-28");
    expect(mondayOfIsoWeek("2027-W01")).toBe("2027-01-04");
    // 2027 has 52 weeks (it starts on a Friday and is not a leap year).
    expect(mondayOfIsoWeek("2027-W53")).toBeNull();
    expect(mondayOfIsoWeek("week 5")).toBeNull();
  });
});
