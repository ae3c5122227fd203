import { describe, expect, it } from "vitest";
import { countLevels, deriveClearances, mostRestrictive, type ClearancePersonInput, type ClearanceRequirement, type SkillCheckoff } from "./index";

/*
 * What a lapse leaves, and how check-offs and credentials combine on the Clearance board, is not
 * published anywhere: the rules are common practice, no source (PRODUCT.md "Clearance": "each
 * requirement says what a lapse leaves the person with"). Recurrence arithmetic (every 12
 * months: valid through the same date a year later) is the status engine's, also common
 * practice, no source. Dates below are worked by hand.
 */

const TODAY = "2026-12-02";
const ICU = "icu";
const FLOOR = "floor";
const VENT = { checklistId: "vent", name: "Ventilator set-up" };
const SUCTION = { checklistId: "suction", name: "In-line suctioning" };

const req = (over: Partial<ClearanceRequirement> & Pick<ClearanceRequirement, "id" | "name" | "kind">): ClearanceRequirement => ({
  examId: null,
  checklistId: null,
  credentialTypeId: null,
  recurrence: null,
  unitId: null,
  role: "therapist",
  active: true,
  graceDays: 0,
  lapseLeaves: "not-cleared",
  ...over,
});

const ANNUAL_VENT = req({ id: "r-vent", name: "Annual ventilator check-off", kind: "checklist", checklistId: "vent", recurrence: "every-12-months", lapseLeaves: "supervised" });
const LICENCE = req({ id: "r-lic", name: "State licence", kind: "credential", credentialTypeId: "lic", lapseLeaves: "not-cleared" });
const ACLS_ICU = req({ id: "r-acls", name: "Advanced cardiac life support (ICU)", kind: "credential", credentialTypeId: "acls", unitId: ICU, lapseLeaves: "supervised" });
const EXAM = req({ id: "r-exam", name: "Annual modes exam", kind: "exam", examId: "modes", recurrence: "every-12-months", lapseLeaves: "supervised" });

const at = (day: string) => Date.parse(`${day}T15:00:00Z`);
const competent = (checklistId: string, day: string): SkillCheckoff => ({ checklistId, status: "acknowledged", outcome: "competent", signedAt: at(day), signedOn: day, practiceBy: null });
const practice = (checklistId: string, day: string, by: string): SkillCheckoff => ({ checklistId, status: "signed", outcome: "needs-practice", signedAt: at(day), signedOn: day, practiceBy: by });
const open = (checklistId: string, status: "requested" | "in-progress" | "cancelled"): SkillCheckoff => ({ checklistId, status, outcome: null, signedAt: null, signedOn: null, practiceBy: null });
const card = (typeId: string, validThrough: string | null) => ({ id: `c-${typeId}`, credentialTypeId: typeId, typeName: typeId, number: null, issuer: null, issuedOn: "2025-01-01", validThrough, verified: true });

type Over = {
  requirements?: ClearanceRequirement[];
  checkoffs?: SkillCheckoff[];
  credentials?: ReturnType<typeof card>[];
  waivers?: ClearancePersonInput["plan"]["waivers"];
  assignments?: ClearancePersonInput["plan"]["assignments"];
  orientations?: ClearancePersonInput["orientations"];
  unitIds?: string[];
};

function person(o: Over): ClearancePersonInput {
  const checkoffs = o.checkoffs ?? [];
  return {
    plan: {
      person: { roles: ["therapist"], unitIds: o.unitIds ?? [ICU] },
      requirements: o.requirements ?? [ANNUAL_VENT],
      credentials: o.credentials ?? [],
      assignments: o.assignments ?? [],
      // My plan's completions: the check-offs signed competent, on their calendar date.
      completions: checkoffs.filter((c) => c.outcome === "competent" && c.signedOn).map((c) => ({ kind: "checklist" as const, refId: c.checklistId, completedOn: c.signedOn! })),
      waivers: o.waivers ?? [],
      extensions: [],
    },
    checkoffs,
    orientations: o.orientations ?? [],
  };
}

function cell(o: Over, today = TODAY, unit = ICU, skill = VENT) {
  const [c] = deriveClearances(person(o), [unit], [skill], { today, reminderDays: 90 });
  return c;
}

describe("a skill renewed by an annual check-off requirement (lapse leaves supervised)", () => {
  it.each([
    // Signed 2026-03-10 → valid through 2027-03-10: current on 2026-12-02 (98 days left, outside the 90-day window).
    { name: "current", checkoffs: [competent("vent", "2026-03-10")], today: TODAY, level: "independent", reason: /current through 2027-03-10/ },
    // Signed 2026-01-15 → valid through 2027-01-15: 44 days left, inside the window.
    { name: "due soon", checkoffs: [competent("vent", "2026-01-15")], today: TODAY, level: "independent", reason: /due soon, valid through 2027-01-15/ },
    // Valid through is inclusive: 2027-03-10 is the last independent day, 2027-03-11 the first supervised one.
    { name: "last valid day", checkoffs: [competent("vent", "2026-03-10")], today: "2027-03-10", level: "independent", reason: /due soon/ },
    { name: "the day after", checkoffs: [competent("vent", "2026-03-10")], today: "2027-03-11", level: "supervised", reason: /Annual ventilator check-off lapsed 2027-03-10 .*leaves supervised/ },
    { name: "a new check-off restores it", checkoffs: [competent("vent", "2025-11-01"), competent("vent", "2026-11-20")], today: TODAY, level: "independent", reason: /signed competent 2026-11-20/ },
    { name: "never checked off", checkoffs: [], today: TODAY, level: "not-cleared", reason: /no competent check-off/i },
  ])("$name → $level", ({ checkoffs, today, level, reason }) => {
    const c = cell({ checkoffs }, today);
    expect(c.level).toBe(level);
    expect(c.reason).toMatch(reason);
  });

  it("a lapse leaves what the requirement says: not cleared when it says so", () => {
    const strict = { ...ANNUAL_VENT, lapseLeaves: "not-cleared" as const };
    const c = cell({ requirements: [strict], checkoffs: [competent("vent", "2025-10-01")] });
    // Valid through 2026-10-01, lapsed on 2026-12-02.
    expect(c).toMatchObject({ level: "not-cleared", requirementId: "r-vent" });
    expect(c.reason).toMatch(/lapsed 2026-10-01 .*leaves not cleared/);
  });

  it("a lapsed check-off with new work assigned (Not started again) still leaves what the requirement says", () => {
    const c = cell({ checkoffs: [competent("vent", "2025-10-01")], assignments: [{ id: "a1", kind: "checklist", refId: "vent", requirementId: "r-vent", title: "", dueOn: "2027-01-10" }] });
    expect(c.level).toBe("supervised");
  });

  it("a waiver of a lapsed renewal keeps the person independent; a waiver never replaces a first check-off", () => {
    const waivers = [{ requirementId: "r-vent", endsOn: "2026-12-31", id: "w1", reason: "Leave" }];
    expect(cell({ checkoffs: [competent("vent", "2025-10-01")], waivers })).toMatchObject({ level: "independent" });
    expect(cell({ checkoffs: [competent("vent", "2025-10-01")], waivers }).reason).toMatch(/waived through 2026-12-31/);
    expect(cell({ checkoffs: [], waivers }).level).toBe("not-cleared");
  });
});

describe("a skill with no requirement renewing it", () => {
  it.each([
    { name: "competent years ago", checkoffs: [competent("suction", "2019-05-05")], level: "independent", reason: /no requirement renews/ },
    { name: "needs practice after a competent one", checkoffs: [competent("suction", "2024-05-05"), practice("suction", "2026-11-20", "2026-12-20")], level: "supervised", reason: /needs practice; practise by 2026-12-20/ },
    { name: "competent after needs practice", checkoffs: [practice("suction", "2026-10-01", "2026-10-30"), competent("suction", "2026-10-28")], level: "independent", reason: /2026-10-28/ },
    { name: "needs practice, date passed", checkoffs: [practice("suction", "2026-10-01", "2026-10-30")], level: "supervised", reason: /practise-by date 2026-10-30 has passed/ },
    { name: "check-off under way", checkoffs: [open("suction", "in-progress")], level: "supervised", reason: /under way/ },
    { name: "check-off only requested", checkoffs: [open("suction", "requested")], level: "not-cleared", reason: /requested, not yet observed/ },
    { name: "cancelled check-off", checkoffs: [open("suction", "cancelled")], level: "not-cleared", reason: /no competent check-off/i },
    { name: "another skill's check-off does not count", checkoffs: [competent("vent", "2026-11-01")], level: "not-cleared", reason: /no competent check-off/i },
  ])("$name → $level", ({ checkoffs, level, reason }) => {
    const c = cell({ checkoffs, requirements: [] }, TODAY, ICU, SUCTION);
    expect(c.level).toBe(level);
    expect(c.reason).toMatch(reason);
  });

  it("an orientee is supervised on the skills of their active orientation plan until checked off, then independent", () => {
    const orientations = [{ endsOn: "2027-01-20", checklistIds: ["suction"] }];
    expect(cell({ requirements: [], orientations }, TODAY, ICU, SUCTION)).toMatchObject({ level: "supervised" });
    expect(cell({ requirements: [], orientations }, TODAY, ICU, SUCTION).reason).toMatch(/in orientation through 2027-01-20/i);
    expect(cell({ requirements: [], orientations, checkoffs: [competent("suction", "2026-11-25")] }, TODAY, ICU, SUCTION).level).toBe("independent");
    // After the plan's last day, an orientee never checked off is not cleared.
    expect(cell({ requirements: [], orientations }, "2027-01-21", ICU, SUCTION).level).toBe("not-cleared");
  });
});

describe("credentials and exams cap every skill on the units they apply to", () => {
  const currentVent = [competent("vent", "2026-03-10")];
  it.each([
    { name: "licence current", credentials: [card("lic", "2027-06-30")], level: "independent", reason: /current/ },
    { name: "licence lapsed", credentials: [card("lic", "2026-11-30")], level: "not-cleared", reason: /State licence lapsed 2026-11-30 — the requirement leaves not cleared/ },
    { name: "licence missing", credentials: [], level: "not-cleared", reason: /State licence: no card on file/ },
  ])("$name → $level", ({ credentials, level, reason }) => {
    const c = cell({ requirements: [ANNUAL_VENT, LICENCE], checkoffs: currentVent, credentials });
    expect(c.level).toBe(level);
    expect(c.reason).toMatch(reason);
  });

  it("a unit's own card caps only that unit: lapsed ICU life support leaves the ICU supervised, the floor independent", () => {
    const input = person({ requirements: [ANNUAL_VENT, ACLS_ICU], checkoffs: currentVent, credentials: [card("acls", "2026-11-01")], unitIds: [ICU, FLOOR] });
    const [icu, floor] = deriveClearances(input, [ICU, FLOOR], [VENT], { today: TODAY, reminderDays: 90 });
    expect(icu).toMatchObject({ unitId: ICU, level: "supervised", requirementId: "r-acls" });
    expect(icu.reason).toMatch(/Advanced cardiac life support \(ICU\) lapsed 2026-11-01/);
    expect(floor).toMatchObject({ unitId: FLOOR, level: "independent" });
  });

  it("a waived card does not cap; a lapsed exam caps at what it says", () => {
    const waivers = [{ requirementId: "r-acls", endsOn: "2026-12-20", id: "w", reason: "Class cancelled" }];
    expect(cell({ requirements: [ANNUAL_VENT, ACLS_ICU], checkoffs: currentVent, credentials: [card("acls", "2026-11-01")], waivers }).level).toBe("independent");
    const exam = cell({ requirements: [ANNUAL_VENT, EXAM], checkoffs: currentVent, assignments: [{ id: "a", kind: "exam", refId: "modes", requirementId: "r-exam", title: "", dueOn: "2026-11-20" }] });
    expect(exam.level).toBe("supervised");
    expect(exam.reason).toMatch(/Annual modes exam lapsed 2026-11-20/);
  });

  it("the most restrictive wins, and every other restriction is named after it", () => {
    const c = cell({ requirements: [ANNUAL_VENT, LICENCE, ACLS_ICU], checkoffs: [competent("vent", "2025-10-01")], credentials: [card("lic", "2026-11-30"), card("acls", "2026-11-01")] });
    expect(c.level).toBe("not-cleared");
    expect(c.reason).toMatch(/^State licence lapsed/);
    expect(c.reason).toMatch(/also: Annual ventilator check-off lapsed/);
    expect(c.reason).toMatch(/also: Advanced cardiac life support/);
  });

  it("a requirement for another role does not touch the person", () => {
    const managersOnly = { ...LICENCE, role: "manager" };
    expect(cell({ requirements: [ANNUAL_VENT, managersOnly], checkoffs: currentVent }).level).toBe("independent");
  });
});

describe("levels", () => {
  it.each([
    ["independent", "supervised", "supervised"],
    ["not-cleared", "supervised", "not-cleared"],
    ["independent", "independent", "independent"],
  ] as const)("the more restrictive of %s and %s is %s", (a, b, expected) => {
    expect(mostRestrictive(a, b)).toBe(expected);
    expect(mostRestrictive(b, a)).toBe(expected);
  });

  it("counts cells per level", () => {
    expect(countLevels([{ level: "independent" }, { level: "supervised" }, { level: "independent" }])).toEqual({ independent: 2, supervised: 1, "not-cleared": 0 });
  });
});
