/**
 * Past sittings of the annual modes exam, graded, so the Bank's item analysis has something to
 * analyse on the demo day. Deterministic: each sitting's form seed, its examinee and every
 * answer come from named generator streams (seeds/prng.ts), ids from stable keys.
 *
 * How a sitting is built — the same steps as a real one (app/db/queries/exam-attempts.server.ts):
 *   1. the pool: every published item at its published version with its topic slugs (sorted),
 *      in (created, id) order — loadPool's query, done on the seed's own rows. No band: nothing
 *      was answered before the first sitting, and the annual blueprint has no difficulty mix;
 *   2. the form: drawForm(blueprint, pool, seed, { shuffleItems }) from app/domain/exams;
 *   3. what is shown and the key: presentEntry(content, entry, shuffleOptions), as the exam page
 *      and the grader use it;
 *   4. the answers: a simulated examinee (below);
 *   5. the grade: scoreAttempt(...) with the version's pass mark and scoring policy, exactly as
 *      finishAttempt does; responses.score is each item's fraction.
 *
 * The simulated examinee: ability θ ~ N(0, 1); each item has a difficulty b and a slope a, and
 * P(right) = c + (1 − c) / (1 + e^(−1.7·a·(θ − b))) with c the chance of guessing a single or
 * multiple answer (the three-parameter logistic curve of item response theory; the 1.7 scaling
 * is Birnbaum's, in Lord & Novick, "Statistical theories of mental test scores", 1968 — from
 * memory; the demo needs only a plausible curve, not its exact form). Wrong
 * answers fall on the distractors with fixed per-item weights. Two items are deliberately
 * flawed so the analysis has something to flag (FLAWED_ITEMS): one that stronger examinees miss
 * more often than weaker ones (a negative slope: a key they over-think), one that everybody gets
 * right; one more has a distractor nobody chooses.
 *
 * Why the sittings lie 13 to 35 months back: the plan, Today and the Team matrix read a passed
 * attempt as a completion of the annual exam requirement (valid 12 months). Sittings of the two
 * previous yearly cycles are lapsed completions, and a lapsed completion with an open assignment
 * shows the assignment's due date (app/domain/status/plan.ts), so no demo status changes. The
 * demo accounts (therapist, preceptor, educator) and the new hires sit none, so their stories and
 * attempt counts are as before. Sittings carry no assignment (that cycle's assignment is not in
 * the demo) and record no "attempt.passed" event (no certificate is issued for them).
 */
import { presentEntry, type FormShape, type StoredAnswer, type StoredFormEntry } from "../app/db/queries/exam-attempts.server";
import type { ItemContent } from "../app/domain/bank/item-content";
import type { Key, Presented } from "../app/domain/bank/present";
import { blueprintSchema, drawForm, type PoolItem } from "../app/domain/exams";
import { scoreAttempt } from "../app/domain/scoring";
import { addDays, addMonths, instantOn, type IsoDate } from "./calendar";
import { DEMO_BANK } from "./bank";
import type { OrgContext } from "./catalogue";
import type { KvRoster } from "./kestrel-valley";
import { prngFor, type Prng } from "./prng";
import type { SeededPerson } from "./roster";

/** Items written to misbehave, by bank key (seeds/bank/). */
export const FLAWED_ITEMS = {
  /** Stronger examinees choose "PEEP plus auto-PEEP" more often than weaker ones: negative discrimination. */
  negative: "trigger-autopeep",
  /** Everyone knows a time-triggered breath: p close to 1. */
  easy: "trigger-time",
  /** One distractor is never chosen (a non-functioning distractor). */
  deadDistractor: "limit-time",
} as const;

/** The previous two yearly cycles, in months before the demo day. */
const CYCLES = [
  { key: "last-year", fromMonths: 23, toMonths: 13 },
  { key: "two-years-ago", fromMonths: 35, toMonths: 25 },
] as const;
/** At most this many examinees per cycle, so a 2000-person benchmark hospital seeds no faster-growing history. */
const MAX_PER_CYCLE = 40;
/** A therapist sits the yearly exam only after a month on staff. */
const SETTLING_IN_DAYS = 30;

type ItemModel = { a: number; b: number; guess: number; distractorWeights: number[] };

export function normal(prng: Prng): number {
  // Box–Muller transform (Box GEP, Muller ME, Ann Math Stat 1958;29:610–611 — from memory).
  const u = Math.max(prng.next(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * prng.next());
}

function itemModel(key: string, content: ItemContent): ItemModel {
  const prng = prngFor(`kv:item-model:${key}`);
  const b = -0.8 + 0.8 * normal(prng);
  const a = 0.7 + 0.9 * prng.next();
  const kind = content.body.kind === "scenario" ? (content.type === "single" ? "single" : "numeric") : content.body.kind;
  const options = content.body.kind === "single" || content.body.kind === "multiple" ? content.body.options.length : 4;
  const guess = kind === "single" ? 1 / options : kind === "multiple" ? 0.1 : 0;
  const distractorWeights = Array.from({ length: options }, () => 0.2 + prng.next());
  if (key === FLAWED_ITEMS.negative) return { a: -1.3, b: 0.3, guess: 0, distractorWeights };
  if (key === FLAWED_ITEMS.easy) return { a: 0.8, b: -4.5, guess, distractorWeights };
  if (key === FLAWED_ITEMS.deadDistractor) {
    distractorWeights[distractorWeights.length - 1] = 0;
    return { a, b: 0.2, guess, distractorWeights };
  }
  return { a, b, guess, distractorWeights };
}

function pRight(model: ItemModel, theta: number): number {
  return model.guess + (1 - model.guess) / (1 + Math.exp(-1.7 * model.a * (theta - model.b)));
}

function weightedPick<T>(prng: Prng, choices: readonly T[], weights: readonly number[]): T {
  const total = weights.reduce((s, w) => s + w, 0);
  let r = prng.next() * total;
  for (let i = 0; i < choices.length; i++) {
    r -= weights[i];
    if (r < 0 && weights[i] > 0) return choices[i];
  }
  let last = 0;
  weights.forEach((w, i) => {
    if (w > 0) last = i;
  });
  return choices[last];
}

/** The stored shape of one place on the form (exam-attempts.server.ts keeps its own copy private). */
function shapeOf(presented: Presented): FormShape {
  switch (presented.kind) {
    case "single":
    case "multiple":
      return { kind: presented.kind, optionIds: presented.options.map((o) => o.id) };
    case "ordering":
      return { kind: "ordering", stepIds: presented.steps.map((s) => s.id) };
    case "numeric":
      return { kind: "numeric", unit: presented.unit };
    case "waveform-point":
      return { kind: "waveform-point", fromS: presented.viewFromS, toS: presented.viewToS };
  }
}

/** A right or a wrong answer of the item's kind, as the answer form would have stored it. */
function answerFor(key: Key, presented: Presented, right: boolean, model: ItemModel, prng: Prng, attractive: number | null): StoredAnswer {
  switch (key.kind) {
    case "single": {
      if (right) return { kind: "single", choice: key.correct };
      const ids = presented.kind === "single" ? presented.options.map((o) => o.id).filter((id) => id !== key.correct) : [];
      if (attractive !== null && ids.includes(attractive) && prng.chance(0.7)) return { kind: "single", choice: attractive };
      return { kind: "single", choice: weightedPick(prng, ids, ids.map((id) => model.distractorWeights[id] ?? 1)) };
    }
    case "multiple": {
      if (right) return { kind: "multiple", choices: [...key.correct] };
      const all = presented.kind === "multiple" ? presented.options.map((o) => o.id) : [];
      const wrong = all.filter((id) => !key.correct.includes(id));
      // A typical miss: one right option left out, or one wrong option added.
      const choices = wrong.length > 0 && prng.chance(0.5) ? [...key.correct, weightedPick(prng, wrong, wrong.map((id) => model.distractorWeights[id] ?? 1))] : key.correct.slice(1);
      return { kind: "multiple", choices: [...new Set(choices)].sort((x, y) => x - y) };
    }
    case "numeric": {
      const value = right ? key.answer : Math.round((key.answer * (prng.chance(0.5) ? 1.5 : 0.6) + 3 * key.tolerance + 1) * 10) / 10;
      return { kind: "numeric", value, text: `${value} ${key.unit}` };
    }
    case "ordering": {
      const order = [...key.order];
      if (!right && order.length > 1) {
        const i = prng.int(0, order.length - 2);
        [order[i], order[i + 1]] = [order[i + 1], order[i]];
      }
      return { kind: "ordering", order };
    }
    case "waveform-point": {
      const view = presented.kind === "waveform-point" ? presented : null;
      const middle = Math.round(((key.fromS + key.toS) / 2) * 100) / 100;
      if (right || !view) return { kind: "waveform-point", timeS: middle };
      const before = Math.max(view.viewFromS, key.fromS - 0.4);
      const after = Math.min(view.viewToS, key.toS + 0.4);
      const timeS = before < key.fromS ? before : after;
      return { kind: "waveform-point", timeS: Math.round(timeS * 100) / 100 };
    }
  }
}

type PoolRow = PoolItem & { key: string; content: ItemContent };

/** loadPool (app/db/queries/exam-pool.server.ts) on the seed's own rows. */
function seededPool(ctx: OrgContext): PoolRow[] {
  const slugOf = new Map(ctx.data.topics.map((t) => [t.id, t.slug]));
  const topicsOf = new Map<string, string[]>();
  for (const t of ctx.data.itemVersionTopics) topicsOf.set(t.itemVersionId, [...(topicsOf.get(t.itemVersionId) ?? []), slugOf.get(t.topicId)!]);
  const rows: PoolRow[] = [];
  const items = [...ctx.data.items].filter((i) => i.status === "published").sort((x, y) => (x.createdAt!.getTime() - y.createdAt!.getTime()) || (x.id! < y.id! ? -1 : x.id! > y.id! ? 1 : 0));
  for (const item of items) {
    const published = ctx.data.itemVersions.filter((v) => v.itemId === item.id && v.publishedAt).sort((x, y) => y.version - x.version)[0];
    if (!published) continue;
    const topics = [...(topicsOf.get(published.id!) ?? [])].sort();
    const content: ItemContent = {
      type: published.type,
      stem: published.stem,
      topics: topics as ItemContent["topics"],
      body: published.body as ItemContent["body"],
      scenario: (published.scenario ?? null) as ItemContent["scenario"],
      rationale: published.rationale,
      reference: published.reference,
    };
    rows.push({ itemId: item.id!, itemVersionId: published.id!, topics, band: null, key: "", content });
  }
  return rows;
}

/**
 * A builder of graded sittings of one exam version, done the way a real sitting is (the steps
 * above). `streams` names the organisation's generator streams ("kv", "ab"), so each
 * organisation's sittings are deterministic and independent of the other's.
 */
export function gradedSittings(ctx: OrgContext, exam: { examId: string; versionId: string }, streams: string) {
  const bankKeys = new Map(DEMO_BANK.map((d) => [ctx.id("item", d.key), d.key]));
  const version = ctx.data.examVersions.find((v) => v.id === exam.versionId);
  if (!version) throw new Error(`no exam version ${exam.versionId}`);
  const blueprint = blueprintSchema.parse(version.blueprint);
  const pool = seededPool(ctx).map((p) => ({ ...p, key: bankKeys.get(p.itemId) ?? p.itemId }));
  const byVersion = new Map(pool.map((p) => [p.itemVersionId, p]));
  const models = new Map(pool.map((p) => [p.itemId, itemModel(p.key, p.content)]));
  const policy = { multiple: version.multipleResponseScoring ?? "all-or-nothing", ordering: version.orderingScoring ?? "exact" } as const;
  const shuffleOptions = version.shuffleOptions ?? true;

  /** One graded sitting of `person` on the day `on` by an examinee of ability `theta`; true when passed. */
  return (person: SeededPerson, cycle: string, attemptNumber: number, on: IsoDate, theta: number): boolean => {
    const prng = prngFor(`${streams}:exam-history:${person.key}:${cycle}:${attemptNumber}`);
    const seed = prng.int(1, 2 ** 31 - 1);
    const form = drawForm(blueprint, pool, seed, { shuffleItems: version.shuffleItems ?? true });
    const attemptId = ctx.id("attempt", "annual-modes", person.key, cycle, attemptNumber);
    const startedAt = instantOn(on, prng.int(0, 480));
    const minutes = prng.int(14, 29);
    const submittedAt = new Date(startedAt.getTime() + minutes * 60_000 + prng.int(0, 59) * 1000);
    const stored: StoredFormEntry[] = [];
    const answers: (StoredAnswer | null)[] = [];
    const graded = form.map((entry) => {
      const item = byVersion.get(entry.itemVersionId)!;
      const { presented, key } = presentEntry(item.content, entry, shuffleOptions);
      stored.push({ ...entry, shape: shapeOf(presented) });
      const model = models.get(entry.itemId)!;
      // The over-thought key: the stronger examinee picks the "add them up" option (index 3).
      const attractive = item.key === FLAWED_ITEMS.negative ? 3 : null;
      const answer = prng.chance(0.015) ? null : answerFor(key, presented, prng.chance(pRight(model, theta)), model, prng, attractive);
      answers.push(answer);
      const response = answer === null ? null : answer.kind === "numeric" ? { kind: "numeric" as const, value: answer.value } : answer;
      return { position: entry.position, key, response, topics: item.content.topics };
    });
    const score = scoreAttempt(graded, { passMarkPercent: version.passMarkPercent, policy });
    ctx.data.attempts.push({
      id: attemptId,
      orgId: ctx.orgId,
      personId: person.id,
      examVersionId: exam.versionId,
      assignmentId: null,
      seed,
      attemptNumber,
      form: stored,
      startedAt,
      deadlineAt: new Date(startedAt.getTime() + (version.timeLimitMinutes ?? 30) * 60_000),
      allowedSeconds: (version.timeLimitMinutes ?? 30) * 60,
      accommodationId: null,
      layout: "one",
      lastPosition: form.length - 1,
      submittedAt,
      closedReason: "submitted",
      rawScore: score.raw,
      maxScore: score.max,
      scorePercent: score.percent,
      passed: score.passed,
      subscores: score.subscores,
      createdAt: startedAt,
    });
    score.items.forEach((s, i) => {
      ctx.data.responses.push({
        id: ctx.id("response", attemptId, s.position),
        orgId: ctx.orgId,
        attemptId,
        itemVersionId: form[i].itemVersionId,
        position: form[i].position,
        answer: answers[i],
        flagged: false,
        score: s.fraction,
        savedAt: new Date(startedAt.getTime() + Math.round(((i + 1) / form.length) * minutes * 60_000)),
      });
    });
    return score.passed;
  };
}

/** Adds the graded sittings of one exam version (the annual modes exam's version 1). */
export function addExamHistory(ctx: OrgContext, roster: KvRoster, exam: { examId: string; versionId: string }): void {
  const sit = gradedSittings(ctx, exam, "kv");
  const demo = new Set(Object.values(roster.demo).map((p) => p.id));
  const newHires = new Set(roster.newHires.map((p) => p.id));
  const candidates = roster.therapists.filter((p) => !demo.has(p.id) && !newHires.has(p.id));

  for (const cycle of CYCLES) {
    const earliest = addMonths(ctx.today, -cycle.fromMonths);
    const span = Math.max(1, Math.round((cycle.fromMonths - cycle.toMonths) * 30.4));
    let seated = 0;
    for (const person of candidates) {
      if (seated >= MAX_PER_CYCLE) break;
      const prng = prngFor(`kv:exam-history:${person.key}:${cycle.key}`);
      const on = addDays(earliest, prng.int(0, span));
      if (addDays(person.hireDate, SETTLING_IN_DAYS) > on) continue;
      const theta = normal(prngFor(`kv:ability:${person.key}`)) + 0.25 * normal(prng);
      seated += 1;
      const passed = sit(person, cycle.key, 1, on, theta);
      // Half of those who did not pass sat again one to three weeks later (2 attempts allowed).
      if (!passed && prng.chance(0.5)) sit(person, cycle.key, 2, addDays(on, prng.int(7, 20)), theta + 0.3);
    }
  }
}
