import { describe, expect, it } from "vitest";
import { CHECKLIST_METHODS } from "~/db/schema/checkoffs";
import { METHODS } from "./methods";
import { allowedOutcomes, canonicalCheckoffContent, manifestSignature, signatureMeaning, signingProblems, tallySteps, type Mark, type Step } from "./record";

const steps: Step[] = [
  { text: "Identifies the patient", critical: true },
  { text: "Checks the circuit", critical: false },
  { text: "Sets the alarms", critical: true },
];
const mark = (stepIndex: number, result: Mark["result"], comment: string | null = null): Mark => ({ stepIndex, result, comment });
const TODAY = "2026-12-02";

describe("a check-off's steps and outcome", () => {
  it("counts marks by result and names critical steps not met", () => {
    const t = tallySteps(steps, [mark(0, "met"), mark(1, "not-applicable"), mark(2, "not-met", "alarm left at default")]);
    expect(t).toEqual({ total: 3, marked: 3, met: 1, notMet: 1, notApplicable: 1, criticalNotMet: [2] });
  });

  // PRODUCT.md, "Checklist": a critical step not met means not competent.
  it("a critical step not met allows only needs practice; a non-critical one leaves the judgement to the preceptor", () => {
    expect(allowedOutcomes(tallySteps(steps, [mark(0, "not-met", "x")]))).toEqual(["needs-practice"]);
    expect(allowedOutcomes(tallySteps(steps, [mark(1, "not-met", "x")]))).toEqual(["competent", "needs-practice"]);
  });

  it.each([
    ["an unmarked step", [mark(0, "met"), mark(1, "met")], { outcome: "competent", practicePlan: null, practiceBy: null }, /1 of 3 not marked/],
    ["a step not met without a comment", [mark(0, "met"), mark(1, "not-met"), mark(2, "met")], { outcome: "needs-practice", practicePlan: "p", practiceBy: TODAY }, /comment.*step 2/],
    ["no outcome", [mark(0, "met"), mark(1, "met"), mark(2, "met")], { outcome: null, practicePlan: null, practiceBy: null }, /Choose the outcome/],
    ["competent with a critical step not met", [mark(0, "not-met", "wrong id band"), mark(1, "met"), mark(2, "met")], { outcome: "competent", practicePlan: null, practiceBy: null }, /critical step was not met \(step 1\)/],
    ["needs practice without a plan", [mark(0, "met"), mark(1, "met"), mark(2, "met")], { outcome: "needs-practice", practicePlan: " ", practiceBy: TODAY }, /requires a plan/],
    ["needs practice without a date", [mark(0, "met"), mark(1, "met"), mark(2, "met")], { outcome: "needs-practice", practicePlan: "Practise alarms", practiceBy: null }, /date to practise by/],
    ["needs practice by a past date", [mark(0, "met"), mark(1, "met"), mark(2, "met")], { outcome: "needs-practice", practicePlan: "Practise alarms", practiceBy: "2026-12-01" }, /has passed/],
  ] as const)("refuses to sign with %s", (_, marks, input, message) => {
    expect(signingProblems(steps, marks, input, TODAY).join(" ")).toMatch(message);
  });

  it("accepts a complete record", () => {
    expect(signingProblems(steps, [mark(0, "met"), mark(1, "not-applicable"), mark(2, "met")], { outcome: "competent", practicePlan: null, practiceBy: null }, TODAY)).toEqual([]);
  });

  it("the signed content names the record, so the same marks on another check-off hash differently (21 CFR 11.70)", () => {
    const base = { personId: "p", checklistVersionId: "v", steps, marks: [mark(0, "met")], outcome: "competent" as const, practicePlan: null, practiceBy: null };
    expect(canonicalCheckoffContent({ ...base, checkoffId: "a" })).not.toBe(canonicalCheckoffContent({ ...base, checkoffId: "b" }));
    // Mark order does not matter; a changed comment does.
    const two = [mark(1, "met"), mark(0, "met", "ok")];
    expect(canonicalCheckoffContent({ ...base, checkoffId: "a", marks: two })).toBe(canonicalCheckoffContent({ ...base, checkoffId: "a", marks: [...two].reverse() }));
    expect(canonicalCheckoffContent({ ...base, checkoffId: "a", marks: [mark(0, "met", "ok")] })).not.toBe(canonicalCheckoffContent({ ...base, checkoffId: "a", marks: [mark(0, "met", "ok.")] }));
  });

  it("the methods offered in forms are the schema's methods", () => {
    expect([...METHODS]).toEqual([...CHECKLIST_METHODS]);
  });
});

/**
 * US 21 CFR Part 11 §11.50(a): "Signed electronic records shall contain information associated
 * with the signing that clearly indicates all of the following: (1) The printed name of the
 * signer; (2) The date and time when the signature was executed; and (3) The meaning (such as
 * review, approval, responsibility, or authorship) associated with the signature." §11.50(b):
 * these are part of every human-readable form of the record (screen and print).
 */
describe("the manifestation of a signature (21 CFR Part 11 §11.50)", () => {
  const signedAt = new Date("2026-12-02T15:41:00Z");
  it("shows the printed name with credentials, the date and time in the organisation's zone with the zone named, and the meaning", () => {
    const m = manifestSignature({ printedName: "Desmond Achterberg", credentialLetters: "RRT", signedAt, timeZone: "America/Chicago", meaning: signatureMeaning("observer", "competent") });
    expect(m.name).toBe("Desmond Achterberg, RRT");
    // 15:41 UTC is 09:41 in Chicago in December (UTC−6, Central Standard Time; IANA tz database).
    expect(m.when).toBe("2 Dec 2026, 09:41 (America/Chicago)");
    expect(m.meaning).toBe("Observed and judged competent");
  });

  it("carries a distinct meaning for each kind of signature", () => {
    expect(signatureMeaning("observer", "needs-practice")).toBe("Observed; needs practice");
    expect(signatureMeaning("acknowledgement", "competent")).toBe("Acknowledged by the therapist observed");
    expect(signatureMeaning("addendum", null)).toBe("Author of this addendum");
  });

  it("a signer without credential letters shows the name alone", () => {
    expect(manifestSignature({ printedName: "A. Person", credentialLetters: null, signedAt, timeZone: "UTC", meaning: "m" }).name).toBe("A. Person");
    expect(manifestSignature({ printedName: "A. Person", credentialLetters: null, signedAt, timeZone: "UTC", meaning: "m" }).when).toBe("2 Dec 2026, 15:41 (UTC)");
  });
});
