import { describe, expect, it } from "vitest";
import {
  isStoredRule,
  reinstatableThrough,
  ruleForPerson,
  standingOn,
  validThrough,
  validThroughForType,
  type CredentialTerms,
  type ValidityRule,
} from "./index";

const AHA = 'American Heart Association, "Course Card Information" (cpr.heart.org)';
const NBRC = 'NBRC, "Credential Maintenance & State License Renewal" (nbrc.org)';
const AARC = 'AARC, "Respiratory Therapist State Licensure Information"; California Business & Professions Code §2535';

const lifeSupport: ValidityRule = { kind: "months-end-of-month", months: 24 };
const board: CredentialTerms = { rule: { kind: "months-end-of-month", months: 60 }, neverExpiresIfIssuedBefore: "2002-07-01", reinstatementMonths: 6 };

describe("validThrough: published rules (shared/TESTING.md C1–C6)", () => {
  // [id, rule, issued on, expected valid through, source]
  const cases: [string, ValidityRule, string, string | null, string][] = [
    // C1: "valid for two years through the end of the month during which the course completion card was issued".
    ["C1 life-support card", lifeSupport, "2026-03-12", "2028-03-31", AHA],
    // C2: five years, ending on the last day of the month the exam was passed — the NBRC's own example.
    ["C2 board credential", board.rule as ValidityRule, "2021-04-22", "2026-04-30", NBRC],
    // C5: neonatal resuscitation, 2 years (from memory; the rule is configurable data).
    ["C5 neonatal resuscitation", { kind: "months-exact", months: 24 }, "2024-08-15", "2026-08-15", "from memory"],
    // C6: biennial licence ending at the end of the birth month in the year the term ends.
    ["C6 birth-month licence", { kind: "birth-month", years: 2, birthMonth: 7 }, "2025-03-10", "2027-07-31", AARC],
    ["C6 annual birth-month licence", { kind: "birth-month", years: 1, birthMonth: 11 }, "2025-12-20", "2026-11-30", AARC],
    // C6: fixed statutory date, biennial.
    ["C6 fixed-date licence", { kind: "fixed-date", month: 6, day: 30, everyYears: 2 }, "2025-09-10", "2027-06-30", AARC],
    ["C6 months end-of-month licence", { kind: "months-end-of-month", months: 24 }, "2025-01-05", "2027-01-31", AARC],
    ["never", { kind: "never" }, "2025-01-05", null, "rule kind"],
  ];
  it.each(cases)("%s (issued %s)", (_id, rule, issued, expected) => {
    expect(validThrough(rule, issued)).toBe(expected);
  });
});

describe("validThrough: month ends, 29 February and the year boundary", () => {
  const cases: [string, ValidityRule, string, string][] = [
    // Month ends: 31 January + 1 month is the end of February, not 3 March (calendar arithmetic).
    ["31 Jan + 1 month exact, leap year", { kind: "months-exact", months: 1 }, "2024-01-31", "2024-02-29"],
    ["31 Jan + 1 month exact, common year", { kind: "months-exact", months: 1 }, "2025-01-31", "2025-02-28"],
    ["31 Mar + 6 months exact → 30 Sep", { kind: "months-exact", months: 6 }, "2026-03-31", "2026-09-30"],
    ["last day of month, end-of-month rule", lifeSupport, "2026-01-31", "2028-01-31"],
    ["first day of month, end-of-month rule", lifeSupport, "2026-02-01", "2028-02-29"],
    // 29 February.
    ["29 Feb + 24 months exact → 28 Feb", { kind: "months-exact", months: 24 }, "2024-02-29", "2026-02-28"],
    ["29 Feb + 48 months exact → 29 Feb", { kind: "months-exact", months: 48 }, "2024-02-29", "2028-02-29"],
    ["29 Feb card, end of month two years on", lifeSupport, "2024-02-29", "2026-02-28"],
    ["fixed 29 Feb in a common year clamps", { kind: "fixed-date", month: 2, day: 29, everyYears: 1 }, "2024-03-01", "2025-02-28"],
    ["fixed 29 Feb in a leap year stays", { kind: "fixed-date", month: 2, day: 29, everyYears: 2 }, "2026-03-01", "2028-02-29"],
    ["birth month February, leap year", { kind: "birth-month", years: 2, birthMonth: 2 }, "2026-05-01", "2028-02-29"],
    // Year boundary.
    ["31 Dec card", lifeSupport, "2025-12-31", "2027-12-31"],
    ["1 Jan card", lifeSupport, "2026-01-01", "2028-01-31"],
    ["Nov + 2 months exact crosses the year", { kind: "months-exact", months: 2 }, "2025-11-30", "2026-01-30"],
    ["Dec + 1 month end-of-month crosses the year", { kind: "months-end-of-month", months: 1 }, "2025-12-15", "2026-01-31"],
  ];
  it.each(cases)("%s", (_name, rule, issued, expected) => {
    expect(validThrough(rule, issued)).toBe(expected);
  });

  it("refuses a date that does not exist rather than rolling it over", () => {
    expect(() => validThrough(lifeSupport, "2026-02-31")).toThrow(RangeError);
    expect(() => validThrough(lifeSupport, "2025-02-29")).toThrow(RangeError);
    expect(() => validThroughForType(board, "2001-02-30")).toThrow(RangeError);
  });
});

describe("never-expires cut-off (TESTING.md C3)", () => {
  it.each([
    // NBRC, same page: a board credential earned before 2002-07-01 has no expiry.
    ["2002-06-30", null],
    ["1995-10-03", null],
    // On the cut-off day itself the five-year rule applies.
    ["2002-07-01", "2007-07-31"],
    ["2021-04-22", "2026-04-30"],
  ])("board credential passed %s → %s", (issued, expected) => {
    expect(validThroughForType(board, issued)).toBe(expected);
  });
});

describe("reinstatement window (TESTING.md C4)", () => {
  it("NBRC example: expiry 2026-04-30 — 2026-09-15 reinstatable, 2026-11-15 not", () => {
    // NBRC, same page: within 6 months after expiry it can be reinstated; later it needs a new exam.
    expect(standingOn("2026-04-30", 6, "2026-09-15")).toBe("reinstatable");
    expect(standingOn("2026-04-30", 6, "2026-11-15")).toBe("expired");
  });
  it.each([
    // Our reading: month end + 6 months stays a month end.
    ["2026-04-30", 6, "2026-10-31"],
    ["2026-08-31", 6, "2027-02-28"],
    ["2027-08-31", 6, "2028-02-29"],
    ["2026-03-15", 6, "2026-09-15"],
  ] as const)("valid through %s, %i months → reinstatable through %s", (through, months, expected) => {
    expect(reinstatableThrough(through, months)).toBe(expected);
  });
  it("edges: the valid-through day is valid, the window's last day reinstatable, the next day expired", () => {
    expect(standingOn("2026-04-30", 6, "2026-04-30")).toBe("valid");
    expect(standingOn("2026-04-30", 6, "2026-05-01")).toBe("reinstatable");
    expect(standingOn("2026-04-30", 6, "2026-10-31")).toBe("reinstatable");
    expect(standingOn("2026-04-30", 6, "2026-11-01")).toBe("expired");
    // A type without a window goes straight to expired.
    expect(standingOn("2026-04-30", null, "2026-05-01")).toBe("expired");
    expect(standingOn(null, 6, "2090-01-01")).toBe("valid");
  });
});

describe("stored rules", () => {
  it("a birth-month rule takes the person's birth month, and falls back to the term's month end without one", () => {
    const stored = { kind: "birth-month", years: 2 } as const;
    expect(validThroughForType({ rule: stored }, "2025-03-10", 3)).toBe("2027-03-31");
    expect(ruleForPerson(stored, null)).toEqual({ kind: "months-end-of-month", months: 24 });
    expect(validThroughForType({ rule: stored }, "2025-03-10", null)).toBe("2027-03-31");
  });
  it.each([
    [{ kind: "months-end-of-month", months: 24 }, true],
    [{ kind: "months-exact", months: 0 }, false],
    [{ kind: "birth-month", years: 2 }, true],
    [{ kind: "birth-month", years: 2, birthMonth: 13 }, false],
    [{ kind: "fixed-date", month: 2, day: 29, everyYears: 2 }, true],
    [{ kind: "fixed-date", month: 2, day: 30, everyYears: 2 }, false],
    [{ kind: "never" }, true],
    [{ kind: "weekly" }, false],
    ["months-exact", false],
  ])("isStoredRule(%j) is %s", (value, ok) => {
    expect(isStoredRule(value)).toBe(ok);
  });
});
