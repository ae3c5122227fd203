/**
 * The upper and lower groups of the discrimination index D (Kelley's 27 %: Kelley, via Lopez,
 * Rasch Measurement Transactions 1998;12(1):626; D itself: UCLA Teaching, "Interpretation of
 * Statistics"), with the two rules every report
 * must state: how the group size is rounded, and what happens to examinees tied on the score
 * at a group's edge.
 *
 * Group size: n = round(0.27 × N), halves rounded up (Math.floor(0.27 × N + 0.5)), at least 1
 * and at most ⌊N / 2⌋ so the groups never overlap by size; no groups (n = 0) below 2
 * examinees. Examples: N = 10 → 3 (2.7), N = 40 → 11 (10.8), N = 50 → 14 (13.5, half up).
 *
 * Ties at the edge — "tie-fair" sharing. Examinees are ranked by total score only. Going down
 * from the top score (up from the bottom score for the lower group), every examinee of a score
 * that fits whole into the remaining places enters with weight 1. When the examinees who share
 * the next score are more than the places left, all of them enter with the same weight
 * (places left ÷ examinees with that score). Example: n = 3, scores 9, 9, 8, 8, …: both 9s
 * count fully and each 8 counts as half an examinee.
 *
 * Why this rule and not "sort by score, then by some secondary key": any secondary key (row
 * order, name, attempt id, time of submission) decides between examinees on something the
 * test did not measure, so an item's D would change when the same attempts are listed in
 * another order, or favour whoever submitted first. Sharing treats tied examinees alike, is
 * deterministic, and depends only on the multiset of (score, answers) — a property test
 * permutes examinees and checks that nothing changes. The price is that "upper correct" can
 * be fractional (1.5 of 3); the group always weighs exactly n examinees in total.
 *
 * When the tied block straddles *both* edges (for example 8 examinees with scores 5, 4, 4, 4,
 * 4, 4, 4, 0 and n = 2), those examinees enter both groups with the same weight and their
 * answers cancel in D, as they should: the test cannot tell them apart.
 *
 * Scores are compared after rounding to a millionth of an item (SCORE_STEPS_PER_ITEM), so partial
 * credits that add up to the same score in exact arithmetic (1/3 + 2/3 and 1) tie even when
 * binary rounding leaves them a last bit apart.
 */

/** Kelley's fraction of examinees in each of the upper and lower groups. */
export const UPPER_LOWER_FRACTION = 0.27;

/** Totals are compared in steps of 1 / SCORE_STEPS_PER_ITEM of an item (a millionth). */
export const SCORE_STEPS_PER_ITEM = 1_000_000;

/** The rule in plain words, for reports and the item analysis page. */
export const GROUP_RULE_TEXT =
  "Upper and lower groups are the 27 % of examinees with the highest and the lowest total scores. " +
  "Group size = 27 % of the examinees rounded to the nearest whole number (halves up), at least 1 " +
  "and at most half the examinees. Examinees tied on the score at a group's edge share the places " +
  "left equally: if 1 place is left and 2 examinees have that score, each counts as half an examinee. " +
  "Discrimination D = (upper group correct − lower group correct) ÷ group size.";

export type ExtremeGroups = {
  /** n, the number of examinees each group weighs. */
  size: number;
  /** Weight of each examinee (input order) in the upper group: 0, 1, or a share at a tie. */
  upper: number[];
  /** The same for the lower group. */
  lower: number[];
};

/** The integer key two totals must share to count as the same score. */
export function scoreKey(total: number): number {
  return Math.round(total * SCORE_STEPS_PER_ITEM);
}

/** The score a key stands for (exact for whole and half scores). */
export function scoreOfKey(key: number): number {
  return key / SCORE_STEPS_PER_ITEM;
}

/** n for N examinees: round(fraction × N) halves up, clamped to [1, ⌊N/2⌋]; 0 below 2 examinees. */
export function extremeGroupSize(examinees: number, fraction = UPPER_LOWER_FRACTION): number {
  if (!Number.isInteger(examinees) || examinees < 0) {
    throw new RangeError(`The number of examinees must be a whole number of at least 0, not ${examinees}.`);
  }
  if (!(fraction > 0 && fraction <= 0.5)) {
    throw new RangeError(`The upper and lower group fraction must be above 0 and at most 0.5 (half the examinees), not ${fraction}.`);
  }
  if (examinees < 2) return 0;
  return Math.min(Math.floor(examinees / 2), Math.max(1, Math.floor(fraction * examinees + 0.5)));
}

/**
 * Each examinee's weight in the upper and in the lower group, from their total scores, by the
 * rules above. Pages use the same weights to count how often each option was chosen by each
 * group, so the option table and D agree.
 */
export function extremeGroups(totals: readonly number[], fraction = UPPER_LOWER_FRACTION): ExtremeGroups {
  const bad = totals.findIndex((t) => !Number.isFinite(t));
  if (bad >= 0) throw new RangeError(`Total scores must be finite numbers: total ${bad} is ${String(totals[bad])}.`);
  const size = extremeGroupSize(totals.length, fraction);
  const upper = totals.map(() => 0);
  const lower = totals.map(() => 0);
  if (size === 0) return { size, upper, lower };

  const byScore = new Map<number, number[]>();
  totals.forEach((total, index) => {
    const key = scoreKey(total);
    const members = byScore.get(key);
    if (members) members.push(index);
    else byScore.set(key, [index]);
  });
  const ascending = [...byScore.keys()].sort((a, b) => a - b);
  fill(upper, [...ascending].reverse(), byScore, size);
  fill(lower, ascending, byScore, size);
  return { size, upper, lower };
}

function fill(weights: number[], scoreOrder: readonly number[], byScore: ReadonlyMap<number, number[]>, size: number) {
  let placesLeft = size;
  for (const key of scoreOrder) {
    if (placesLeft === 0) return;
    const members = byScore.get(key) as number[];
    const weight = members.length <= placesLeft ? 1 : placesLeft / members.length;
    for (const index of members) weights[index] = weight;
    placesLeft -= Math.min(members.length, placesLeft);
  }
}
