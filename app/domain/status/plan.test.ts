import { describe, expect, it } from "vitest";
import { bestCredential, buildPlan, requirementApplies, validThroughAfter, type PlanInput, type PlanRequirement } from "./plan";

/*
 * Requirements apply by role and unit (PRODUCT.md "Requirement"; schema: unit null = everyone,
 * role null = any role). A credential requirement is met by a credential of its type.
 * Recurrence arithmetic (every 12 months: due again on the same date a year later, still valid
 * that day) is common practice, no source; month ends clamp (shared/STACK.md "Dates").
 */

const req = (over: Partial<PlanRequirement> & Pick<PlanRequirement, "id" | "name" | "kind">): PlanRequirement => ({
  examId: null,
  checklistId: null,
  credentialTypeId: null,
  recurrence: null,
  unitId: null,
  role: null,
  active: true,
  ...over,
});

describe("which requirements apply", () => {
  const person = { roles: ["therapist"], unitIds: ["icu"] };
  it.each([
    { name: "everyone (no unit, no role)", r: req({ id: "a", name: "a", kind: "exam" }), applies: true },
    { name: "the person's role", r: req({ id: "a", name: "a", kind: "exam", role: "therapist" }), applies: true },
    { name: "another role", r: req({ id: "a", name: "a", kind: "exam", role: "educator" }), applies: false },
    { name: "the person's unit", r: req({ id: "a", name: "a", kind: "exam", unitId: "icu" }), applies: true },
    { name: "another unit", r: req({ id: "a", name: "a", kind: "exam", unitId: "nicu" }), applies: false },
    { name: "unit and role both must match", r: req({ id: "a", name: "a", kind: "exam", unitId: "icu", role: "manager" }), applies: false },
    { name: "an inactive requirement", r: req({ id: "a", name: "a", kind: "exam", active: false }), applies: false },
  ])("$name → $applies", ({ r, applies }) => {
    expect(requirementApplies(r, person)).toBe(applies);
  });
});

describe("recurrence and the credential that counts", () => {
  it.each([
    { completedOn: "2026-02-28", recurrence: "every-12-months", expected: "2027-02-28" },
    { completedOn: "2028-02-29", recurrence: "every-12-months", expected: "2029-02-28" },
    { completedOn: "2026-05-31", recurrence: "every-24-months", expected: "2028-05-31" },
    { completedOn: "2026-05-31", recurrence: "once", expected: null },
    { completedOn: "2026-05-31", recurrence: "at-hire", expected: null },
  ] as const)("$recurrence after $completedOn → $expected", ({ completedOn, recurrence, expected }) => {
    expect(validThroughAfter(completedOn, recurrence)).toBe(expected);
  });

  it("a card that never expires beats any dated one; otherwise the latest valid-through", () => {
    const c = (id: string, validThrough: string | null) => ({ id, validThrough, issuedOn: "2020-01-01" });
    expect(bestCredential([c("old", "2025-01-31"), c("new", "2027-01-31")])?.id).toBe("new");
    expect(bestCredential([c("dated", "2099-01-31"), c("forever", null), c("later", "2100-01-31")])?.id).toBe("forever");
  });
});

describe("a therapist's plan on 2026-12-02", () => {
  const today = "2026-12-02";
  const cred = (id: string, typeId: string, typeName: string, validThrough: string | null) => ({
    id,
    credentialTypeId: typeId,
    typeName,
    number: `N-${id}`,
    issuer: "Issuer",
    issuedOn: "2025-01-01",
    validThrough,
    verified: true,
  });
  const input: PlanInput = {
    person: { roles: ["therapist"], unitIds: ["icu"] },
    requirements: [
      req({ id: "r-licence", name: "State licence", kind: "credential", credentialTypeId: "licence", role: "therapist" }),
      req({ id: "r-bls", name: "Basic life support", kind: "credential", credentialTypeId: "bls", role: "therapist" }),
      req({ id: "r-acls", name: "Advanced cardiac life support", kind: "credential", credentialTypeId: "acls", unitId: "icu", role: "therapist" }),
      req({ id: "r-nrp", name: "Neonatal resuscitation", kind: "credential", credentialTypeId: "nrp", unitId: "nicu", role: "therapist" }),
      req({ id: "r-exam", name: "Annual exam", kind: "exam", examId: "exam-1", recurrence: "every-12-months", role: "therapist" }),
      req({ id: "r-check", name: "Annual check-off", kind: "checklist", checklistId: "cl-1", recurrence: "every-12-months", role: "therapist" }),
      req({ id: "r-pals", name: "Pediatric advanced life support", kind: "credential", credentialTypeId: "pals", role: "therapist" }),
    ],
    credentials: [
      cred("lic", "licence", "State licence", "2028-05-31"),
      cred("bls-old", "bls", "Basic life support", "2024-12-31"),
      cred("bls", "bls", "Basic life support", "2027-01-31"),
      cred("acls", "acls", "Advanced cardiac life support", "2026-11-30"),
      cred("board", "board", "Board credential", null),
    ],
    assignments: [
      { id: "a-exam", kind: "exam", refId: "exam-1", requirementId: "r-exam", title: "Annual exam", dueOn: "2026-12-23" },
      { id: "a-check", kind: "checklist", refId: "cl-1", requirementId: "r-check", title: "Annual check-off", dueOn: "2026-11-23" },
      { id: "a-extra", kind: "checklist", refId: "cl-2", requirementId: null, title: "Circuit change", dueOn: "2027-02-01" },
    ],
    completions: [],
    waivers: [{ requirementId: "r-acls", endsOn: "2027-01-01" }],
    extensions: [],
  };

  const plan = buildPlan(input, { today });

  it("lists applying requirements, unlinked work and extra credentials in due-date order", () => {
    expect(plan.map((r) => [r.title, r.result.status, r.result.date])).toEqual([
      ["Annual check-off", "lapsed", "2026-11-23"],
      ["Advanced cardiac life support", "waived", "2026-11-30"],
      ["Annual exam", "not-started", "2026-12-23"],
      ["Basic life support", "due-soon", "2027-01-31"],
      ["Circuit change", "not-started", "2027-02-01"],
      ["State licence", "current", "2028-05-31"],
      ["Pediatric advanced life support", "not-started", null],
      ["Board credential", "current", null],
    ]);
  });

  it("gives the Team matrix the same requirement rows, in the requirements' order, without the rest", () => {
    const cellsOnly = buildPlan(input, { today }, { requirementsOnly: true });
    const expected = plan.filter((r) => r.key.startsWith("requirement:"));
    expect(cellsOnly.map((r) => r.requirementId)).toEqual(input.requirements.filter((r) => expected.some((e) => e.requirementId === r.id)).map((r) => r.id));
    expect([...cellsOnly].sort((a, b) => (a.key < b.key ? -1 : 1))).toEqual([...expected].sort((a, b) => (a.key < b.key ? -1 : 1)));
    expect(cellsOnly.some((r) => r.title === "Circuit change" || r.title === "Board credential")).toBe(false);
  });

  it("says how long ago the lapsed check-off fell due", () => {
    expect(plan[0].result.daysLapsed).toBe(9);
    expect(plan[0].dateMeaning).toBe("due");
  });

  it("counts the newest card of a type, not the old one", () => {
    const bls = plan.find((r) => r.title === "Basic life support")!;
    expect(bls.credential?.number).toBe("N-bls");
    expect(bls.dateMeaning).toBe("valid-through");
  });

  it("leaves out requirements of another unit", () => {
    expect(plan.some((r) => r.title === "Neonatal resuscitation")).toBe(false);
  });

  it("shows a met annual requirement as held until a year after completion, and an extension moves a due date", () => {
    const done = buildPlan(
      { ...input, completions: [{ kind: "exam", refId: "exam-1", completedOn: "2026-01-15" }], extensions: [{ requirementId: "r-check", newDueOn: "2026-12-15" }] },
      { today },
    );
    const exam = done.find((r) => r.title === "Annual exam")!;
    expect(exam).toMatchObject({ dateMeaning: "valid-through", result: { status: "due-soon", date: "2027-01-15" } });
    const check = done.find((r) => r.title === "Annual check-off")!;
    expect(check).toMatchObject({ dateMeaning: "due", extendedTo: "2026-12-15", result: { status: "not-started", date: "2026-12-15" } });
  });

  it("a lapsed completion with new work assigned shows the new due date", () => {
    const lapsedDone = buildPlan({ ...input, completions: [{ kind: "exam", refId: "exam-1", completedOn: "2025-10-01" }] }, { today });
    expect(lapsedDone.find((r) => r.title === "Annual exam")).toMatchObject({ dateMeaning: "due", result: { status: "not-started", date: "2026-12-23" } });
  });

  it("says what to do next for each row", () => {
    // Issue 8 §5: take the exam, ask for a check-off, upload a renewed card.
    const step = (title: string) => plan.find((r) => r.title === title)?.nextStep;
    expect(step("Annual check-off")).toBe("ask-for-checkoff");
    expect(step("Annual exam")).toBe("take-exam");
    expect(step("Advanced cardiac life support")).toBe("none");
    expect(step("Circuit change")).toBe("ask-for-checkoff");
  });

  it("a grace period keeps a lapsing card due soon, and the row says when that ends", () => {
    const withGrace = buildPlan(
      { ...input, requirements: input.requirements.map((r) => (r.id === "r-acls" ? { ...r, graceDays: 30 } : r)), waivers: [] },
      { today: "2026-12-10" },
    );
    const acls = withGrace.find((r) => r.title === "Advanced cardiac life support")!;
    // Valid through 2026-11-30 + 30 days' grace → Due soon through 2026-12-30, Lapsed from 2026-12-31.
    expect(acls).toMatchObject({ result: { status: "due-soon", date: "2026-11-30" }, nextChangeOn: "2026-12-31", nextStatus: "lapsed", nextStep: "upload-renewed-card" });
    expect(acls.evidence?.[0]).toMatchObject({ kind: "credential", validThrough: "2026-11-30" });
  });

  // Issue 5: an exam assigned by an educator shows in My plan and on Today with its due date,
  // whether or not it names a requirement.
  it("an exam assigned without a requirement, for an exam no requirement asks for, is its own row with its due date", () => {
    const plan2 = buildPlan(
      { ...input, assignments: [...input.assignments, { id: "a-adhoc", kind: "exam", refId: "exam-2", requirementId: null, title: "Alarm reasoning exam", dueOn: "2027-01-10" }] },
      { today },
    );
    expect(plan2.find((r) => r.key === "assignment:a-adhoc")).toMatchObject({ kind: "exam", title: "Alarm reasoning exam", dateMeaning: "due", result: { status: "not-started", date: "2027-01-10" }, nextStep: "take-exam" });
  });

  it("an exam assigned without a requirement keeps its own row while the requirement for that exam is met", () => {
    const met = buildPlan(
      {
        ...input,
        assignments: [...input.assignments.filter((a) => a.id !== "a-exam"), { id: "a-again", kind: "exam", refId: "exam-1", requirementId: null, title: "Annual exam", dueOn: "2027-01-20" }],
        completions: [{ kind: "exam", refId: "exam-1", completedOn: "2026-06-15" }],
      },
      { today },
    );
    // The requirement shows the record (valid through 2027-06-15: 12 months on) …
    expect(met.find((r) => r.key === "requirement:r-exam")).toMatchObject({ dateMeaning: "valid-through", result: { date: "2027-06-15" } });
    // … and the new work is not swallowed by it: it keeps its due date (Today lists rows with dateMeaning "due").
    expect(met.find((r) => r.key === "assignment:a-again")).toMatchObject({ dateMeaning: "due", result: { status: "not-started", date: "2027-01-20" } });
  });

  it("an exam assigned without a requirement answers that exam's requirement while it is not met", () => {
    const owed = buildPlan(
      { ...input, assignments: [...input.assignments.filter((a) => a.id !== "a-exam"), { id: "a-unlinked", kind: "exam", refId: "exam-1", requirementId: null, title: "Annual exam", dueOn: "2027-01-20" }] },
      { today },
    );
    expect(owed.find((r) => r.key === "requirement:r-exam")).toMatchObject({ dateMeaning: "due", result: { status: "not-started", date: "2027-01-20" } });
    expect(owed.some((r) => r.key === "assignment:a-unlinked")).toBe(false);
  });
});
