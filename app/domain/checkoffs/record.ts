/**
 * The rules of one check-off record, pure so the bedside page (what to offer) and the server
 * (what to accept) agree: how far the steps have got, whether an outcome may be signed, and
 * what a signature means. No React, database or Node-only APIs.
 */
import { isIsoDate, type IsoDate } from "~/domain/status/calendar-date";

export type StepResult = "met" | "not-met" | "not-applicable";
export type Outcome = "competent" | "needs-practice";
export type Step = { text: string; critical: boolean };
export type Mark = { stepIndex: number; result: StepResult; comment: string | null };

export const RESULT_WORDS: Record<StepResult, string> = { met: "Met", "not-met": "Not met", "not-applicable": "Not applicable" };
export const OUTCOME_WORDS: Record<Outcome, string> = { competent: "Competent", "needs-practice": "Needs practice" };

export type Tally = { total: number; marked: number; met: number; notMet: number; notApplicable: number; criticalNotMet: number[] };

export function tallySteps(steps: readonly Step[], marks: readonly Mark[]): Tally {
  const byIndex = new Map(marks.map((m) => [m.stepIndex, m]));
  const tally: Tally = { total: steps.length, marked: 0, met: 0, notMet: 0, notApplicable: 0, criticalNotMet: [] };
  steps.forEach((step, i) => {
    const mark = byIndex.get(i);
    if (!mark) return;
    tally.marked += 1;
    if (mark.result === "met") tally.met += 1;
    if (mark.result === "not-applicable") tally.notApplicable += 1;
    if (mark.result === "not-met") {
      tally.notMet += 1;
      if (step.critical) tally.criticalNotMet.push(i);
    }
  });
  return tally;
}

/**
 * The outcome the steps allow: a critical step not met means not competent (PRODUCT.md,
 * "Checklist"); otherwise the preceptor judges. Common practice, no source.
 */
export function allowedOutcomes(tally: Tally): Outcome[] {
  return tally.criticalNotMet.length > 0 ? ["needs-practice"] : ["competent", "needs-practice"];
}

export type OutcomeInput = { outcome: Outcome | null; practicePlan: string | null; practiceBy: IsoDate | null };

/** Why this record cannot be signed yet, in words for the preceptor; empty when it can. */
export function signingProblems(steps: readonly Step[], marks: readonly Mark[], input: OutcomeInput, today: IsoDate): string[] {
  const tally = tallySteps(steps, marks);
  const problems: string[] = [];
  if (tally.marked < tally.total) problems.push(`Mark every step first: ${tally.total - tally.marked} of ${tally.total} not marked yet.`);
  const missingComment = marks.filter((m) => m.result === "not-met" && !m.comment?.trim());
  if (missingComment.length > 0) problems.push(`Add a comment to each step not met (step ${missingComment.map((m) => m.stepIndex + 1).join(", ")}).`);
  if (!input.outcome) problems.push("Choose the outcome: competent or needs practice.");
  if (input.outcome === "competent" && tally.criticalNotMet.length > 0) {
    problems.push(`A critical step was not met (step ${tally.criticalNotMet.map((i) => i + 1).join(", ")}), so the outcome is needs practice.`);
  }
  if (input.outcome === "needs-practice") {
    if (!input.practicePlan?.trim()) problems.push("Needs practice requires a plan: what to practise.");
    if (!input.practiceBy || !isIsoDate(input.practiceBy)) problems.push("Needs practice requires a date to practise by.");
    else if (input.practiceBy < today) problems.push("The practise-by date has passed; choose today or later.");
  }
  return problems;
}

export type SignatureRole = "observer" | "acknowledgement" | "addendum";

/**
 * The meaning a signature carries, shown with it on screen and on paper (US 21 CFR Part 11
 * §11.50(a)(3), used here as the design reference).
 */
export function signatureMeaning(role: SignatureRole, outcome: Outcome | null): string {
  switch (role) {
    case "observer":
      return outcome === "competent" ? "Observed and judged competent" : "Observed; needs practice";
    case "acknowledgement":
      return "Acknowledged by the therapist observed";
    case "addendum":
      return "Author of this addendum";
  }
}

export type SignatureFacts = { printedName: string; credentialLetters: string | null; signedAt: Date | string | number; timeZone: string; meaning: string };

/** "Desmond Achterberg, RRT" — the printed name with credential letters. */
export function signerLine(s: Pick<SignatureFacts, "printedName" | "credentialLetters">): string {
  return s.credentialLetters ? `${s.printedName}, ${s.credentialLetters}` : s.printedName;
}

/** Date and time in the organisation's time zone, with the zone named: "2 Dec 2026, 09:41 (America/Chicago)". */
export function signedAtLine(signedAt: Date | string | number, timeZone: string): string {
  const text = new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "numeric",
    month: "short",
    year: "numeric",
    hour: "2-digit",
    minute: "2-digit",
    hourCycle: "h23",
  }).format(new Date(signedAt));
  return `${text} (${timeZone})`;
}

/**
 * The signature as a person reads it: the three elements of US 21 CFR Part 11 §11.50(a) —
 * printed name, date and time of signing, and meaning — in that order.
 */
export function manifestSignature(s: SignatureFacts): { name: string; when: string; meaning: string } {
  return { name: signerLine(s), when: signedAtLine(s.signedAt, s.timeZone), meaning: s.meaning };
}

/**
 * The signed content of a check-off in a fixed order: what its content hash covers. The record
 * id is part of it, so a signature cannot be copied to another record (§11.70).
 */
export function canonicalCheckoffContent(c: {
  checkoffId: string;
  personId: string;
  checklistVersionId: string;
  steps: readonly Step[];
  marks: readonly Mark[];
  outcome: Outcome | null;
  practicePlan: string | null;
  practiceBy: IsoDate | null;
}): string {
  const marks = [...c.marks].sort((a, b) => a.stepIndex - b.stepIndex).map((m) => [m.stepIndex, m.result, m.comment ?? ""]);
  return JSON.stringify(["tidemark-checkoff-v1", c.checkoffId, c.personId, c.checklistVersionId, c.steps.map((s) => [s.text, s.critical]), marks, c.outcome, c.practicePlan ?? "", c.practiceBy ?? ""]);
}

/** The signed content of an addendum: its own words, bound to the record and the record's hash. */
export function canonicalAddendumContent(a: { addendumId: string; recordId: string; recordHash: string; authorId: string; text: string }): string {
  return JSON.stringify(["tidemark-addendum-v1", a.addendumId, a.recordId, a.recordHash, a.authorId, a.text]);
}
