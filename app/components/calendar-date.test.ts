import { describe, expect, it } from "vitest";
import { formatCalendarDate, formatDayCount, formatInstantDate, formatLongCalendarDate } from "./calendar-date";

describe("showing dates", () => {
  it("shows a calendar date as written, with no time-zone shift", () => {
    // new Date('2026-03-31') is UTC midnight and shows 30 March in Chicago (shared/STACK.md "Dates").
    expect(formatCalendarDate("2026-03-31")).toBe("31 Mar 2026");
    expect(formatCalendarDate("2028-03-31")).toBe("31 Mar 2028");
    expect(formatCalendarDate("2026-01-01")).toBe("1 Jan 2026");
  });

  it("names the weekday (2 December 2026 is a Wednesday: Python datetime, checked)", () => {
    expect(formatLongCalendarDate("2026-12-02")).toBe("Wednesday 2 December 2026");
  });

  it("shows an instant on the organisation's calendar", () => {
    // 05:30 UTC on 3 December is 23:30 on 2 December in Chicago (UTC−6).
    expect(formatInstantDate(new Date("2026-12-03T05:30:00Z"), "America/Chicago")).toBe("2 Dec 2026");
    expect(formatInstantDate("2026-12-03T05:30:00Z", "UTC")).toBe("3 Dec 2026");
  });

  it.each([
    { days: 1, words: "1 day" },
    { days: 9, words: "9 days" },
    { days: 31, words: "31 days" },
    { days: 32, words: "4 weeks" },
    { days: 90, words: "12 weeks" },
    { days: 91, words: "2 months" },
    { days: 138, words: "4 months" },
    { days: 729, words: "23 months" },
    { days: 730, words: "1 year" },
    { days: 1100, words: "3 years" },
  ])("$days days reads “$words”", ({ days, words }) => {
    expect(formatDayCount(days)).toBe(words);
  });
});
