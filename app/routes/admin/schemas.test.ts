import { isMatch } from "date-fns";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { calendarDateProblem, createNewPersonSchema, createPersonSchema, createUnitSchema, readPeopleFilter } from "./schemas";

/**
 * Calendar dates. Leap years follow the Gregorian rule — every 4th year, except century years
 * not divisible by 400 (papal bull Inter gravissimas, 1582; the calendar ISO 8601 uses).
 */
describe("calendarDateProblem", () => {
  it.each([
    ["2026-02-28", null],
    ["2024-02-29", null], // 2024 divisible by 4: leap
    ["2000-02-29", null], // divisible by 400: leap
    ["2026-12-31", null],
    ["2026-04-30", null],
  ])("%s is a real date", (value, expected) => {
    expect(calendarDateProblem(value)).toBe(expected);
  });

  it.each([
    ["2026-02-29", "2026-02-29 is not a real date: February 2026 has 28 days."],
    ["2026-02-30", "2026-02-30 is not a real date: February 2026 has 28 days."],
    ["1900-02-29", "1900-02-29 is not a real date: February 1900 has 28 days."], // century not divisible by 400
    ["2026-04-31", "2026-04-31 is not a real date: April 2026 has 30 days."],
    ["2026-00-10", "There is no month 00: months run from 01 to 12."],
    ["2026-13-01", "There is no month 13: months run from 01 to 12."],
    ["2026-01-00", "2026-01-00 is not a real date: January 2026 has 31 days."],
    ["26-1-5", "Use the form YYYY-MM-DD, like 2024-03-12."],
    ["2026-1-05", "Use the form YYYY-MM-DD, like 2024-03-12."],
  ])("%s is refused with a specific message", (value, expected) => {
    expect(calendarDateProblem(value)).toBe(expected);
  });

  it("agrees with date-fns about every YYYY-MM-DD from 1900 to 2100 (cross-check by a second library)", () => {
    const pad = (n: number, w: number) => String(n).padStart(w, "0");
    fc.assert(
      fc.property(fc.integer({ min: 1900, max: 2100 }), fc.integer({ min: 0, max: 13 }), fc.integer({ min: 0, max: 32 }), (y, m, d) => {
        const value = `${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`;
        expect(calendarDateProblem(value) === null).toBe(isMatch(value, "yyyy-MM-dd"));
      }),
      { numRuns: 3000 },
    );
  });
});

describe("the person form schema in the browser (no database checks)", () => {
  it("trims, lower-cases the e-mail, and turns empty optional fields into null", async () => {
    const result = await createPersonSchema().safeParseAsync({
      name: "  Ana Lund ",
      email: " Ana.Lund@Example.TEST ",
      title: "   ",
      hireDate: "2025-07-01",
      birthMonth: 7,
    });
    expect(result.success).toBe(true);
    expect(result.data).toMatchObject({ name: "Ana Lund", email: "ana.lund@example.test", title: null, employeeId: null, homeUnitId: null, birthMonth: 7 });
  });
});

describe("the browser's schemas", () => {
  // conform validates with a synchronous parse in the browser: an async refine there throws,
  // the form skips client validation and falls back to a full-page post.
  it("parse synchronously without the server's database checks", () => {
    const person = { name: "Ana Lund", email: "ana@example.test", hireDate: "2025-07-01" };
    expect(createPersonSchema().safeParse(person).success).toBe(true);
    expect(createNewPersonSchema().safeParse({ ...person, firstRole: "therapist" }).success).toBe(true);
    expect(createUnitSchema().safeParse({ name: "Adult ICU", code: "aicu" })).toMatchObject({ success: true, data: { code: "AICU" } });
  });
});

describe("readPeopleFilter", () => {
  it("falls back to safe defaults for anything unexpected in the address", () => {
    expect(readPeopleFilter(new URL("http://x/admin/people?role=wizard&status=gone&page=-3&q=%20ann%20"))).toEqual({
      q: "ann",
      unit: "",
      role: "",
      status: "active",
      page: 1,
    });
  });
});
