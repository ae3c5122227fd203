import { describe, expect, it } from "vitest";
import { validThrough } from "../validity";
import { assess, assessOn, startOfDayIn, type AssessInput, type Evidence } from "./engine";

const card = (validThroughOn: string | null): Evidence => ({
  kind: "credential",
  id: "c1",
  typeName: "Basic life support",
  number: "ABC",
  issuer: "Training centre",
  issuedOn: "2024-03-12",
  validThrough: validThroughOn,
  verified: true,
});
const held = (v: string | null, graceDays = 0, extra: Partial<AssessInput> = {}): AssessInput => ({
  graceDays,
  held: { validThrough: v, evidence: card(v) },
  dueOn: null,
  waivers: [],
  extensions: [],
  ...extra,
});
const owed = (dueOn: string | null, extra: Partial<AssessInput> = {}): AssessInput => ({
  graceDays: 0,
  held: null,
  dueOn,
  dueEvidence: dueOn ? { kind: "assignment", id: "a1", dueOn } : null,
  waivers: [],
  extensions: [],
  ...extra,
});

describe("held records: current, due soon, grace, lapsed — and when that changes", () => {
  // Window boundaries: PRODUCT.md "Due soon — valid, but inside the reminder window"; 90-day window
  // from the reminder cadence (shared/TESTING.md, common practice, no source).
  const v = "2026-03-31";
  it.each([
    // [case, today, grace, status, next change, next status]
    ["91 days before", "2025-12-30", 0, "current", "2025-12-31", "due-soon"],
    ["90 days before: window opens", "2025-12-31", 0, "due-soon", "2026-04-01", "lapsed"],
    ["the valid-through day itself is valid", "2026-03-31", 0, "due-soon", "2026-04-01", "lapsed"],
    ["the day after, no grace", "2026-04-01", 0, "lapsed", null, null],
    ["inside a 30-day grace period", "2026-04-30", 30, "due-soon", "2026-05-01", "lapsed"],
    ["the day after the grace period", "2026-05-01", 30, "lapsed", null, null],
  ] as const)("%s (%s, grace %i) → %s", (_c, today, grace, status, next, nextStatus) => {
    const a = assessOn(held(v, grace), today, 90);
    expect(a.status).toBe(status);
    expect(a.nextChangeOn).toBe(next);
    expect(a.nextStatus).toBe(nextStatus);
    expect(a.date).toBe(v);
    expect(a.graceThrough).toBe(grace ? "2026-04-30" : v);
    expect(a.evidence[0]).toMatchObject({ kind: "credential", validThrough: v });
  });

  it("a credential that never expires stays current and never changes", () => {
    // NBRC, "Credential Maintenance & State License Renewal": earned before 2002-07-01, no expiry.
    const a = assessOn(held(null), "2026-05-14");
    expect(a).toMatchObject({ status: "current", nextChangeOn: null, graceThrough: null });
  });

  it("a life-support card issued 29 February lapses on 1 March two years on (end-of-month rule)", () => {
    // AHA, "Course Card Information": through the end of the month of issue, two years later.
    const v2 = validThrough({ kind: "months-end-of-month", months: 24 }, "2024-02-29");
    expect(v2).toBe("2026-02-28");
    expect(assessOn(held(v2), "2026-02-28").status).toBe("due-soon");
    expect(assessOn(held(v2), "2026-03-01").status).toBe("lapsed");
  });

  it("crosses the year boundary: valid through 31 December lapses on 1 January", () => {
    expect(assessOn(held("2026-12-31"), "2026-12-31")).toMatchObject({ status: "due-soon", nextChangeOn: "2027-01-01", nextStatus: "lapsed" });
    expect(assessOn(held("2026-12-31"), "2027-01-01").status).toBe("lapsed");
  });
});

describe("outstanding work", () => {
  it.each([
    ["before the due date", "2026-06-01", "not-started", "2026-06-16"],
    ["on the due date", "2026-06-15", "not-started", "2026-06-16"],
    ["the day after", "2026-06-16", "lapsed", null],
  ] as const)("%s → %s", (_c, today, status, next) => {
    const a = assessOn(owed("2026-06-15"), today);
    expect(a.status).toBe(status);
    expect(a.nextChangeOn).toBe(next);
    expect(a.evidence).toEqual([{ kind: "assignment", id: "a1", dueOn: "2026-06-15" }]);
  });
  it("without a due date it stays not started", () => {
    expect(assessOn(owed(null), "2026-06-16")).toMatchObject({ status: "not-started", nextChangeOn: null });
  });
});

describe("waivers and extensions", () => {
  const waiver = { id: "w1", reason: "Long-term leave", endsOn: "2026-07-31", grantedBy: "Manager" };
  it("a waiver shows Waived through its end date, then the lapse returns", () => {
    const input = held("2026-03-31", 0, { waivers: [waiver] });
    const a = assessOn(input, "2026-05-14");
    expect(a).toMatchObject({ status: "waived", waivedThrough: "2026-07-31", nextChangeOn: "2026-08-01", nextStatus: "lapsed" });
    expect(a.evidence.map((e) => e.kind)).toEqual(["credential", "waiver"]);
    expect(assessOn(input, "2026-08-01").status).toBe("lapsed");
  });
  it("a revoked waiver counts for nothing", () => {
    expect(assessOn(held("2026-03-31", 0, { waivers: [{ ...waiver, revoked: true }] }), "2026-05-14").status).toBe("lapsed");
  });
  it("a current record stays Current under a waiver", () => {
    expect(assessOn(held("2027-12-31", 0, { waivers: [waiver] }), "2026-05-14").status).toBe("current");
  });
  it("an extension keeps a lapsing record due soon until the new due date, and is shown as evidence", () => {
    const input = held("2026-03-31", 0, { extensions: [{ id: "e1", reason: "Course full", newDueOn: "2026-06-30", grantedBy: "Manager" }] });
    const a = assessOn(input, "2026-05-14");
    expect(a).toMatchObject({ status: "due-soon", date: "2026-03-31", extendedTo: "2026-06-30", nextChangeOn: "2026-07-01", nextStatus: "lapsed" });
    expect(a.evidence.map((e) => e.kind)).toEqual(["credential", "extension"]);
  });
  it("an extension moves the due date of outstanding work", () => {
    const input = owed("2026-04-30", { extensions: [{ id: "e1", reason: "Orientation delayed", newDueOn: "2026-05-31" }] });
    expect(assessOn(input, "2026-05-14")).toMatchObject({ status: "not-started", extendedTo: "2026-05-31", nextChangeOn: "2026-06-01" });
  });
});

describe("time zones and US daylight-saving changes", () => {
  // US daylight saving 2026: begins Sunday 8 March at 02:00, ends Sunday 1 November at 02:00
  // (Energy Policy Act of 2005, §110; 15 U.S.C. §260a). Chicago is UTC−6 in standard time and
  // UTC−5 in daylight time (IANA tz database, America/Chicago).
  const tz = "America/Chicago";
  it.each([
    // A card valid through 8 March (the spring-forward day).
    ["23:30 CST on 7 March", "2026-03-08T05:30:00Z", "2026-03-08", "due-soon"],
    ["23:30 CDT on 8 March is still 8 March", "2026-03-09T04:30:00Z", "2026-03-08", "due-soon"],
    ["00:30 CDT on 9 March: lapsed", "2026-03-09T05:30:00Z", "2026-03-08", "lapsed"],
    // A card valid through 1 November (the fall-back day).
    ["23:30 CST on 1 November is still 1 November", "2026-11-02T05:30:00Z", "2026-11-01", "due-soon"],
    ["00:30 CST on 2 November: lapsed", "2026-11-02T06:30:00Z", "2026-11-01", "lapsed"],
  ] as const)("%s", (_c, instant, v, status) => {
    expect(assess(held(v), { now: new Date(instant), timeZone: tz }).status).toBe(status);
  });

  it("the same instant is a different calendar day in New York and Los Angeles", () => {
    const now = new Date("2026-03-09T05:30:00Z"); // 01:30 EDT 9 March; 22:30 PDT 8 March.
    expect(assess(held("2026-03-08"), { now, timeZone: "America/New_York" }).status).toBe("lapsed");
    expect(assess(held("2026-03-08"), { now, timeZone: "America/Los_Angeles" }).status).toBe("due-soon");
  });

  it("finds local midnight on both sides of a change (a 23-hour and a 25-hour day)", () => {
    expect(startOfDayIn(tz, "2026-03-08").toISOString()).toBe("2026-03-08T06:00:00.000Z");
    expect(startOfDayIn(tz, "2026-03-09").toISOString()).toBe("2026-03-09T05:00:00.000Z");
    expect(startOfDayIn(tz, "2026-11-01").toISOString()).toBe("2026-11-01T05:00:00.000Z");
    expect(startOfDayIn(tz, "2026-11-02").toISOString()).toBe("2026-11-02T06:00:00.000Z");
    const hours = (a: string, b: string) => (startOfDayIn(tz, b).getTime() - startOfDayIn(tz, a).getTime()) / 3_600_000;
    expect(hours("2026-03-08", "2026-03-09")).toBe(23);
    expect(hours("2026-11-01", "2026-11-02")).toBe(25);
  });
});
