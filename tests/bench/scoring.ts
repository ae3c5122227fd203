/**
 * How long grading one submitted 50-item attempt takes (target under 5 ms, p95). The attempt is
 * drawn from the demo bank (seeds/bank) as an exam would draw it: each item presented with its
 * own seed by presentItem, then answered by a simulated therapist — mostly right, some near
 * misses (partly right multiple responses, orderings with steps swapped, numbers off by a bit,
 * clicks beside the window), some left unanswered. The demo bank has only four multiple-response
 * items and one ordering item, so those are drawn more than once with different seeds to give
 * the mix below.
 *
 * Timed: scoreAttempt over the 50 items with partial credit on (the costlier policy): every
 * item's score, the raw score, the percentage, pass or fail and the subscores per topic. Not
 * timed: presenting the items (the bench simulation behind scenario and waveform items runs
 * when the attempt starts, not when it is graded).
 *
 * Run alone: npx tsx tests/bench/scoring.ts [--runs N]
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import { parseArgs } from "node:util";
import { presentItem, type Key, type Response } from "~/domain/bank/present";
import { createRandom, type Random } from "~/domain/bench";
import { scoreAttempt, type GradedItemInput, type ScoringPolicy } from "~/domain/scoring";
import { DEMO_BANK } from "../../seeds/bank";

export const SCORING_ITEMS = 50;
export const SCORING_TARGET_MS = 5;
const POLICY: ScoringPolicy = { multiple: "partial", ordering: "partial" };
const PASS_MARK_PERCENT = 80;

/** How many items of each kind the 50-item attempt holds. */
const MIX = { single: 18, numeric: 8, "scenario-numeric": 4, "scenario-single": 2, multiple: 8, ordering: 5, "waveform-point": 5 } as const;
type Slot = keyof typeof MIX;

export type ScoringFigure = {
  items: number;
  mix: Record<Slot, number>;
  policy: string;
  passMarkPercent: number;
  runs: number;
  meanMs: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  /** The graded result of the attempt, so a reader sees it was a real attempt. */
  attempt: { raw: number; max: number; percent: number; passed: boolean; topics: number };
  targetMs: number;
  meetsTarget: boolean;
};

const slotOf = (c: (typeof DEMO_BANK)[number]["content"]): Slot => (c.body.kind === "scenario" ? (c.type === "numeric" ? "scenario-numeric" : "scenario-single") : (c.body.kind as Slot));

/** A therapist's answer: right about 60 % of the time, a near miss 25 %, unanswered 15 %. */
function answer(key: Key, r: Random): Response | null {
  const roll = r.next();
  if (roll < 0.15) return null;
  const right = roll < 0.75;
  switch (key.kind) {
    case "single":
      return { kind: "single", choice: right ? key.correct : key.correct + 1 };
    case "multiple":
      return { kind: "multiple", choices: right ? [...key.correct] : [...key.correct.slice(1), 7] };
    case "numeric":
      return { kind: "numeric", value: right ? key.answer : key.answer + key.tolerance + 1 };
    case "ordering": {
      const order = [...key.order];
      if (!right) [order[0], order[1]] = [order[1], order[0]];
      return { kind: "ordering", order };
    }
    case "waveform-point":
      return { kind: "waveform-point", timeS: right ? (key.fromS + key.toS) / 2 : key.toS + 0.5 };
  }
}

/** The 50 graded-item inputs of one attempt (deterministic for a given seed). */
export function buildAttempt(seed = 2026): GradedItemInput[] {
  const r = createRandom(seed);
  const bySlot = new Map<Slot, (typeof DEMO_BANK)[number][]>();
  for (const demo of DEMO_BANK) bySlot.set(slotOf(demo.content), [...(bySlot.get(slotOf(demo.content)) ?? []), demo]);
  const items: GradedItemInput[] = [];
  for (const [slot, count] of Object.entries(MIX) as [Slot, number][]) {
    const pool = bySlot.get(slot) ?? [];
    if (pool.length === 0) throw new Error(`The demo bank has no ${slot} item.`);
    for (let i = 0; i < count; i++) {
      const demo = pool[i % pool.length];
      const { key } = presentItem(demo.content, r.int(1, 1_000_000));
      items.push({ position: 0, key, response: answer(key, r), topics: [...demo.content.topics], points: 1 });
    }
  }
  // The order an exam shows them in: shuffled, then numbered.
  for (let i = items.length - 1; i > 0; i--) {
    const j = r.int(0, i);
    [items[i], items[j]] = [items[j], items[i]];
  }
  return items.map((item, i) => ({ ...item, position: i + 1 }));
}

const at = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
const round4 = (x: number) => Math.round(x * 10000) / 10000;

export function timeScoring(options: { runs: number; warmupRuns: number }): ScoringFigure {
  const items = buildAttempt();
  if (items.length !== SCORING_ITEMS) throw new Error(`Expected ${SCORING_ITEMS} items, built ${items.length}.`);
  const grade = () => scoreAttempt(items, { passMarkPercent: PASS_MARK_PERCENT, policy: POLICY });
  // Warm-up: let V8 compile the grading path before anything is timed.
  for (let i = 0; i < options.warmupRuns; i++) grade();
  const times: number[] = [];
  let last = grade();
  for (let i = 0; i < options.runs; i++) {
    const started = performance.now();
    last = grade();
    times.push(performance.now() - started);
  }
  const sorted = [...times].sort((a, b) => a - b);
  const p95Ms = round4(at(sorted, 95));
  return {
    items: items.length,
    mix: { ...MIX },
    policy: `multiple ${POLICY.multiple}, ordering ${POLICY.ordering}`,
    passMarkPercent: PASS_MARK_PERCENT,
    runs: options.runs,
    meanMs: round4(times.reduce((s, t) => s + t, 0) / times.length),
    p50Ms: round4(at(sorted, 50)),
    p95Ms,
    p99Ms: round4(at(sorted, 99)),
    maxMs: round4(sorted[sorted.length - 1]),
    attempt: { raw: round4(last.raw), max: last.max, percent: round4(last.percent), passed: last.passed, topics: last.subscores.length },
    targetMs: SCORING_TARGET_MS,
    meetsTarget: p95Ms < SCORING_TARGET_MS,
  };
}

export function formatScoring(f: ScoringFigure): string {
  return [
    `Grading one ${f.items}-item attempt (${Object.entries(f.mix).map(([k, n]) => `${n} ${k}`).join(", ")}; ${f.policy}), ${f.runs} runs:`,
    `  mean ${f.meanMs.toFixed(4)} ms, p50 ${f.p50Ms.toFixed(4)} ms, p95 ${f.p95Ms.toFixed(4)} ms, max ${f.maxMs.toFixed(4)} ms`,
    `  the attempt: ${f.attempt.raw} of ${f.attempt.max} (${f.attempt.percent.toFixed(1)} %), ${f.attempt.passed ? "passed" : "not passed"} at ${f.passMarkPercent} %, ${f.attempt.topics} topic subscores`,
    `Target: p95 under ${f.targetMs} ms per ${f.items}-item grade — ${f.meetsTarget ? "met" : "NOT met"}.`,
  ].join("\n");
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  const { values } = parseArgs({ options: { runs: { type: "string", default: "2000" } } });
  const runs = Number(values.runs);
  if (!Number.isInteger(runs) || runs < 1) {
    console.error(`--runs must be a whole number of at least 1, got "${values.runs}".`);
    process.exit(2);
  }
  console.log(formatScoring(timeScoring({ runs, warmupRuns: 200 })));
}
