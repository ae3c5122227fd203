/**
 * How much of one item's points a response earns, as a fraction in [0, 1]. Pure: the key comes
 * from presentItem (app/domain/bank/present.ts); option and step ids in the key and the response
 * are the content's own indexes, so the shuffle a seed applied never changes the score.
 *
 * Partial credit is an exam policy, not an item's: the exam chooses it for every multiple-response
 * and every ordering item it draws.
 */
import type { Key, Response } from "~/domain/bank/present";

export type ScoringPolicy = {
  /** Multiple response: exact set only, or the plus/minus rule (see multipleFraction). */
  multiple: "all-or-nothing" | "partial";
  /** Ordering: the whole order only, or Kendall's τ floored at 0 (see orderingFraction). */
  ordering: "exact" | "partial";
};

/** No partial credit anywhere, as the bank preview grades (gradeResponse in present.ts). */
export const ALL_OR_NOTHING_POLICY: ScoringPolicy = { multiple: "all-or-nothing", ordering: "exact" };

/** A hair of slack so 0.1 + 0.2 style binary noise never fails an exact-tolerance answer (as present.ts). */
export const NUMERIC_SLACK = 1e-9;

/**
 * The fraction of the item's points earned. No response, or a response of another kind than the
 * key, earns 0. Never throws; never returns NaN.
 */
export function scoreItem(key: Key, response: Response | null, policy: ScoringPolicy): number {
  if (!response || response.kind !== key.kind) return 0;
  switch (key.kind) {
    case "single":
      return response.kind === "single" && response.choice === key.correct ? 1 : 0;
    case "multiple":
      if (response.kind !== "multiple") return 0;
      return policy.multiple === "partial" ? multipleFraction(key.correct, response.choices) : multipleExact(key.correct, response.choices) ? 1 : 0;
    case "numeric":
      if (response.kind !== "numeric") return 0;
      return Number.isFinite(response.value) && Math.abs(response.value - key.answer) <= key.tolerance + NUMERIC_SLACK ? 1 : 0;
    case "waveform-point":
      if (response.kind !== "waveform-point") return 0;
      return Number.isFinite(response.timeS) && response.timeS >= key.fromS && response.timeS <= key.toS ? 1 : 0;
    case "ordering":
      if (response.kind !== "ordering") return 0;
      return policy.ordering === "partial" ? orderingFraction(key.order, response.order) : orderingExact(key.order, response.order) ? 1 : 0;
  }
}

/** The choices are a set: ticking one box twice (a double submit) is ticking it once. */
function multipleExact(correct: number[], choices: number[]): boolean {
  const want = new Set(correct);
  const got = new Set(choices);
  return want.size === got.size && [...got].every((c) => want.has(c));
}

/**
 * Plus/minus ("right minus wrong") partial credit for multiple response:
 *
 *   fraction = max(0, (correct options ticked − incorrect options ticked) / number of correct options)
 *
 * One point per keyed option ticked, one lost per other option ticked, never below zero — the
 * "+/− scoring" rule NCSBN uses for select-all-that-apply items (NCSBN, "Are traditional NCLEX
 * Multiple Response (SATA) items scored with partial credits?" and "What are the current scoring
 * models?", NCSBN help centre), and the plus/minus method Betts J, Muntean W, Kim D, Kao S found
 * among the most promising ("Evaluating Different Scoring Methods for Multiple Response Items
 * Providing Partial Credit", Educ Psychol Meas 2022;82(1):151–176). Divided by the number of
 * keyed options so a full answer is worth the item's points. Ticking all n options of an item
 * with k keyed earns max(0, (2k − n)/k): nothing whenever at least half the options are
 * distractors, and always less than the right answer alone. Ids outside the options count as
 * incorrect ticks; duplicates count once.
 */
export function multipleFraction(correct: number[], choices: number[]): number {
  const want = new Set(correct);
  if (want.size === 0) return choices.length === 0 ? 1 : 0;
  let right = 0;
  let wrong = 0;
  for (const c of new Set(choices)) {
    if (want.has(c)) right += 1;
    else wrong += 1;
  }
  return Math.max(0, (right - wrong) / want.size);
}

function isPermutationOf(key: number[], order: number[]): boolean {
  if (order.length !== key.length) return false;
  const ids = new Set(key);
  const seen = new Set<number>();
  for (const id of order) {
    if (!ids.has(id) || seen.has(id)) return false;
    seen.add(id);
  }
  return true;
}

function orderingExact(key: number[], order: number[]): boolean {
  return order.length === key.length && order.every((id, i) => id === key[i]);
}

/**
 * Partial credit for ordering: Kendall's τ between the key's order and the response's, floored
 * at 0 (Kendall MG, "A new measure of rank correlation", Biometrika 1938;30(1–2):81–93):
 *
 *   τ = (concordant pairs − discordant pairs) / (n(n − 1)/2),   fraction = max(0, τ)
 *
 * Every pair of steps is judged by whether the response keeps them in the key's relative order —
 * the pairwise form of the right-minus-wrong rule above, so a shuffled guess earns about nothing
 * on average, the exact order earns 1, and a fully reversed order (τ = −1) earns 0. The choice of
 * rule is ours (common practice, no source for ordering items in particular). A response that is
 * not a rearrangement of exactly the key's steps (missing, extra or repeated ids) earns 0: the
 * exam page always submits every step once.
 */
export function orderingFraction(key: number[], order: number[]): number {
  if (!isPermutationOf(key, order)) return 0;
  const n = key.length;
  if (n < 2) return 1;
  const rank = new Map<number, number>();
  order.forEach((id, i) => rank.set(id, i));
  let concordant = 0;
  let discordant = 0;
  for (let i = 0; i < n; i++) {
    const ri = rank.get(key[i])!;
    for (let j = i + 1; j < n; j++) {
      if (rank.get(key[j])! > ri) concordant += 1;
      else discordant += 1;
    }
  }
  return Math.max(0, (concordant - discordant) / ((n * (n - 1)) / 2));
}
