import { addDays as fnsAddDays, differenceInCalendarDays, format } from "date-fns";
import { describe, expect, it } from "vitest";
import { addDays, addMonths, calendarDateIn, daysBetween, isIsoDate, parseIsoDate } from "./calendar-date";

describe("calendar dates", () => {
  it.each([
    // 31 January + 1 month: JavaScript and SQLite both give 3 March (shared/STACK.md "Dates"); we clamp.
    { from: "2026-01-31", months: 1, expected: "2026-02-28" },
    { from: "2028-01-31", months: 1, expected: "2028-02-29" }, // 2028 is a leap year
    { from: "2026-03-12", months: 24, expected: "2028-03-12" },
    { from: "2026-12-15", months: 1, expected: "2027-01-15" },
    { from: "2027-01-15", months: -1, expected: "2026-12-15" },
  ])("$from + $months months = $expected", ({ from, months, expected }) => {
    expect(addMonths(from, months)).toBe(expected);
  });

  it("counts days across a leap day and a year end", () => {
    expect(daysBetween("2028-02-28", "2028-03-01")).toBe(2);
    expect(daysBetween("2026-12-31", "2027-01-01")).toBe(1);
    expect(addDays("2026-12-02", -9)).toBe("2026-11-23");
  });

  it.each(["2026-02-29", "2026-13-01", "2026-3-1", "31/03/2026", ""])("rejects %s", (value) => {
    expect(isIsoDate(value)).toBe(false);
  });

  // US Central Standard Time is UTC−6 in December and Pacific UTC−8 (IANA time zone database).
  it.each([
    { instant: "2026-12-03T05:30:00Z", timeZone: "America/Chicago", expected: "2026-12-02" },
    { instant: "2026-12-03T06:00:00Z", timeZone: "America/Chicago", expected: "2026-12-03" },
    { instant: "2026-12-03T05:30:00Z", timeZone: "UTC", expected: "2026-12-03" },
    { instant: "2026-12-03T07:59:00Z", timeZone: "America/Los_Angeles", expected: "2026-12-02" },
  ])("$instant is $expected in $timeZone", ({ instant, timeZone, expected }) => {
    expect(calendarDateIn(timeZone, new Date(instant))).toBe(expected);
  });

  // The parse and day number of a date are remembered (the Team matrix adds and compares dates
  // 80,000 times an assessment): asked again and again, the answers stay those of date-fns (a
  // second date library, as a cross-check) over eight years either side of a leap day, asked
  // twice, and a bad date still throws after good ones were remembered.
  it("answers the same when dates are asked again, as date-fns does", () => {
    const local = (iso: string) => {
      const { year, month, day } = parseIsoDate(iso);
      return new Date(year, month - 1, day);
    };
    for (let pass = 0; pass < 2; pass++) {
      for (let offset = -1500; offset <= 1500; offset += 7) {
        const expected = format(fnsAddDays(new Date(2028, 1, 29), offset), "yyyy-MM-dd");
        expect(addDays("2028-02-29", offset)).toBe(expected);
        expect(daysBetween("2028-02-29", expected)).toBe(offset);
        expect(daysBetween(expected, "2026-12-02")).toBe(differenceInCalendarDays(local("2026-12-02"), local(expected)));
      }
    }
    expect(() => addDays("2026-02-30", 1)).toThrow("no such date: 2026-02-30");
    expect(() => daysBetween("2026-12-02", "2026-12-2")).toThrow("not a YYYY-MM-DD date: 2026-12-2");
    expect(addDays("2026-12-02", 0.5)).toBe("2026-12-02"); // a fraction of a day goes the long way, as before
  });
});
