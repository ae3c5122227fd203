import { addDays as addDaysFns, addMonths as addMonthsFns, format, parseISO } from "date-fns";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { addDays, addMonths, formatIsoDate } from "./calendar";
import { CREDENTIAL_TYPES } from "./catalogue";
import { dateStatus, issueDateForStatus, validThroughFor, type DateStatus, type ValidityTerms } from "./credential-dates";
import { prngFor } from "./prng";

const type = (code: string): ValidityTerms => {
  const found = CREDENTIAL_TYPES.find((t) => t.code === code);
  if (!found) throw new Error(code);
  return found;
};

describe("valid-through dates of seeded credentials", () => {
  it("life-support cards run two years to the end of the month of issue", () => {
    // shared/TESTING.md C1 — American Heart Association, "Course Card Information" (cpr.heart.org):
    // issued 2026-03-12, valid through 2028-03-31.
    expect(validThroughFor(type("basic-life-support"), "2026-03-12")).toBe("2028-03-31");
    expect(validThroughFor(type("advanced-cardiac-life-support"), "2026-03-12")).toBe("2028-03-31");
  });

  it("the board credential runs five years to the end of the month the exam was passed", () => {
    // TESTING.md C2 — NBRC, "Credential Maintenance & State License Renewal" (nbrc.org), its own example.
    expect(validThroughFor(type("board-credential"), "2021-04-22")).toBe("2026-04-30");
  });

  it("a board credential earned before 2002-07-01 never expires", () => {
    // TESTING.md C3 — NBRC, same page.
    expect(validThroughFor(type("board-credential"), "2002-06-30")).toBeNull();
    expect(validThroughFor(type("board-credential"), "2002-07-01")).toBe("2007-07-31");
  });

  it("neonatal resuscitation runs two years to the same day (issue 8's months-exact contract)", () => {
    // TESTING.md C5: two years, from memory; configurable data. app/domain/validity: "the same day
    // N months later, clamped to the month's end".
    expect(validThroughFor(type("neonatal-resuscitation"), "2024-08-15")).toBe("2026-08-15");
    // 29 February: the anniversary month has no 29th, so the term ends on its last day.
    expect(validThroughFor(type("neonatal-resuscitation"), "2024-02-29")).toBe("2026-02-28");
    expect(validThroughFor(type("neonatal-resuscitation"), "2024-02-28")).toBe("2026-02-28");
  });

  it("a birth-month licence ends in the holder's birth month of the year the term ends", () => {
    // TESTING.md C6 — end of the birth month (California B&P §2535); issue 8's contract: the
    // last day of the birth month in the year the term ends.
    const terms: ValidityTerms = { rule: { kind: "birth-month", years: 2 } };
    expect(validThroughFor(terms, "2025-03-10", 7)).toBe("2027-07-31");
    expect(validThroughFor(terms, "2025-09-10", 7)).toBe("2027-07-31");
    expect(validThroughFor(terms, "2025-03-10", 3)).toBe("2027-03-31");
    // No birth month on file: the end of the month the term ends.
    expect(validThroughFor(terms, "2025-03-10", null)).toBe("2027-03-31");
  });
});

describe("calendar arithmetic", () => {
  it("agrees with date-fns on adding days and clamped months", () => {
    // date-fns 4 as an independent cross-check (TESTING.md: a second date library only as a cross-check).
    fc.assert(
      fc.property(fc.integer({ min: 1990, max: 2060 }), fc.integer({ min: 1, max: 12 }), fc.integer({ min: 1, max: 31 }), fc.integer({ min: -800, max: 800 }), (y, m, d, n) => {
        const day = Math.min(d, new Date(Date.UTC(y, m, 0)).getUTCDate());
        const iso = formatIsoDate(y, m, day);
        expect(addDays(iso, n)).toBe(format(addDaysFns(parseISO(iso), n), "yyyy-MM-dd"));
        expect(addMonths(iso, Math.trunc(n / 20))).toBe(format(addMonthsFns(parseISO(iso), Math.trunc(n / 20)), "yyyy-MM-dd"));
      }),
    );
  });

  it("clamps 31 January + 1 month to the end of February", () => {
    // shared/STACK.md: JavaScript's Date and SQLite both give 3 March here.
    expect(addMonths("2026-01-31", 1)).toBe("2026-02-28");
    expect(addMonths("2024-01-31", 1)).toBe("2024-02-29");
  });
});

describe("status on the demo day", () => {
  it("separates lapsed, due soon (90-day window) and current at the boundaries", () => {
    const today = "2026-05-14";
    expect(dateStatus("2026-05-13", today)).toBe("lapsed");
    expect(dateStatus("2026-05-14", today)).toBe("due-soon");
    expect(dateStatus(addDays(today, 90), today)).toBe("due-soon");
    expect(dateStatus(addDays(today, 91), today)).toBe("current");
    expect(dateStatus(null, today)).toBe("current");
  });

  it("chooses issue dates that land in the wanted status for every rule", () => {
    const statuses: DateStatus[] = ["current", "due-soon", "lapsed"];
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 3650 }), fc.integer({ min: 1, max: 12 }), fc.string(), (offset, birthMonth, key) => {
        const today = addDays("2024-01-01", offset);
        for (const spec of CREDENTIAL_TYPES) {
          for (const wanted of statuses) {
            const issued = issueDateForStatus(spec, wanted, today, prngFor(key), birthMonth);
            expect(issued < today).toBe(true);
            expect(dateStatus(validThroughFor(spec, issued, birthMonth), today)).toBe(wanted);
          }
        }
      }),
      { numRuns: 60 },
    );
  });
});
