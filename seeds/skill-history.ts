/**
 * Established staff's past check-offs of the skills no requirement renews (set-up, alarms,
 * suctioning, circuit change, flow starvation), so the Clearance board of the demo shows a
 * working department: most staff signed competent some time after hire, a few were last judged
 * "needs practice" and practise under supervision with a repeat asked for, and some never did a
 * skill. Invented for the demo. The annual check-off (a requirement) is left to the records in
 * kestrel-valley-records.ts, so My plan and the Team matrix keep their story.
 *
 * Observers are the generated preceptors (never the demo preceptor, whose lists stay as the
 * demo and its tests expect). Signatures carry the content hash the app computes
 * (app/domain/checkoffs/record.ts), so the record pages show them as holding.
 */
import { createHash } from "node:crypto";
import { canonicalCheckoffContent, type Mark, type Outcome } from "~/domain/checkoffs/record";
import { addDays, daysBetween, instantOn, type IsoDate } from "./calendar";
import type { OrgContext } from "./catalogue";
import { CHECKLISTS } from "./checklists";
import { pushCheckoffSignature } from "./orientation-checkoffs";
import type { KvPerson, KvRoster } from "./kestrel-valley";
import { prngFor } from "./prng";
import type { SeededPerson } from "./roster";

/** The skills with no requirement behind them in the demo. */
const SKILLS = ["ventilator-setup", "high-pressure-alarm", "inline-suction", "circuit-change", "flow-starvation"] as const;
/** A larger hospital (--people) keeps this history for its first therapists only: the board's variety, not bulk. */
const MAX_STAFF = 60;

const PRACTICE_PLAN = "Practise the steps marked not met with the unit's preceptor on the next two shifts, then ask for a new check-off.";

function addCheckoff(
  ctx: OrgContext,
  input: { person: SeededPerson; observer: SeededPerson; checklistKey: string; on: IsoDate; outcome: Outcome; practiceBy: IsoDate | null; timeZone: string },
): void {
  const spec = CHECKLISTS.find((c) => c.key === input.checklistKey);
  if (!spec) throw new Error(`unknown checklist ${input.checklistKey}`);
  const key = [input.person.key, input.checklistKey, input.on] as const;
  const checkoffId = ctx.id("skill-checkoff", ...key);
  const versionId = ctx.id("checklist-version", spec.key, 1);
  // Needs practice: the last non-critical step was not met, with the comment a preceptor must add.
  const missed = input.outcome === "needs-practice" ? spec.steps.map((s, i) => (s.critical ? -1 : i)).filter((i) => i >= 0).pop()! : -1;
  const marks: Mark[] = spec.steps.map((_, stepIndex) =>
    stepIndex === missed ? { stepIndex, result: "not-met", comment: "Needed prompting; talked through it afterwards." } : { stepIndex, result: "met", comment: null },
  );
  const practicePlan = input.outcome === "needs-practice" ? PRACTICE_PLAN : null;
  const contentHash = createHash("sha256")
    .update(canonicalCheckoffContent({ checkoffId, personId: input.person.id, checklistVersionId: versionId, steps: spec.steps, marks, outcome: input.outcome, practicePlan, practiceBy: input.practiceBy }))
    .digest("hex");
  const signedAt = instantOn(input.on, 150);
  const acknowledgedAt = instantOn(input.on, 170);
  ctx.data.checkoffs.push({
    id: checkoffId,
    orgId: ctx.orgId,
    personId: input.person.id,
    checklistVersionId: versionId,
    preceptorId: input.observer.id,
    status: "acknowledged",
    outcome: input.outcome,
    practicePlan,
    practiceBy: input.practiceBy,
    contentHash,
    startedAt: instantOn(input.on, 100),
    signedAt,
    acknowledgedAt,
    createdAt: instantOn(input.on, 100),
    updatedAt: acknowledgedAt,
  });
  for (const m of marks) {
    ctx.data.checkoffStepResults.push({ id: ctx.id("skill-checkoff-step", ...key, m.stepIndex), orgId: ctx.orgId, checkoffId, stepIndex: m.stepIndex, result: m.result, comment: m.comment, updatedAt: signedAt });
  }
  const sign = (who: SeededPerson, role: "observer" | "acknowledgement", at: Date) =>
    pushCheckoffSignature(ctx, { id: ctx.id("skill-signature", ...key, role), checkoffId, who, role, outcome: input.outcome, at, timeZone: input.timeZone, contentHash });
  sign(input.observer, "observer", signedAt);
  sign(input.person, "acknowledgement", acknowledgedAt);
  if (input.outcome === "needs-practice") {
    // The repeat the app schedules on signing "needs practice" (checkoffs-signing.server.ts).
    ctx.data.checkoffs.push({
      id: ctx.id("skill-checkoff-repeat", ...key),
      orgId: ctx.orgId,
      personId: input.person.id,
      checklistVersionId: versionId,
      status: "requested",
      practiceBy: input.practiceBy,
      createdAt: signedAt,
      updatedAt: signedAt,
    });
  }
}

/**
 * Per established therapist and skill (odds invented for the demo): ~78 % signed competent on a day
 * between two months after hire and a month ago; ~7 % of those were re-observed in the last five
 * weeks and judged needs practice; the rest never did the skill.
 */
export function addSkillHistory(ctx: OrgContext, roster: KvRoster, timeZone: string): void {
  const observers = roster.preceptors.filter((p) => p.id !== roster.demo.preceptor.id);
  if (observers.length === 0) return;
  const today = ctx.today;
  // Established therapists: staff and the generated preceptors and educators; not the demo
  // accounts (their stories are fixed) nor the new hires (their orientation plans tell theirs).
  const fixed = new Set([...Object.values(roster.demo).map((p) => p.id), ...roster.newHires.map((p) => p.id)]);
  const established = roster.therapists.filter((p) => !fixed.has(p.id));
  for (const person of established.slice(0, MAX_STAFF)) {
    const prng = prngFor(`kv:skill-history:${person.key}`);
    const sameUnit = observers.filter((o: KvPerson) => o.unit === person.unit && o.id !== person.id);
    const pool = sameUnit.length > 0 ? sameUnit : observers.filter((o) => o.id !== person.id);
    if (pool.length === 0) continue;
    const first = addDays(person.hireDate, 60);
    const last = addDays(today, -30);
    if (first > last) continue;
    const span = daysBetween(first, last);
    for (const skill of SKILLS) {
      if (!prng.chance(0.78)) continue;
      const on = addDays(first, prng.int(0, span));
      addCheckoff(ctx, { person, observer: prng.pick(pool), checklistKey: skill, on, outcome: "competent", practiceBy: null, timeZone });
      if (prng.chance(0.07)) {
        const again = addDays(today, -prng.int(3, 35));
        if (again > on) addCheckoff(ctx, { person, observer: prng.pick(pool), checklistKey: skill, on: again, outcome: "needs-practice", practiceBy: addDays(today, prng.int(7, 28)), timeZone });
      }
    }
  }
}
