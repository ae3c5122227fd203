/**
 * Classical item analysis of one exam's graded attempts: score mean and spread, KR-20, KR-21,
 * the standard error of measurement, and per item the difficulty p, the point-biserial (plain
 * and corrected) and the upper-minus-lower discrimination index D.
 *
 * Input: rows are examinees, columns are items; each value is the fraction of the item's
 * points earned, in [0, 1] — 0 or 1 for a right/wrong item, 1/3 for one point of three. Totals
 * are therefore in items (a total of 6.5 means six and a half items' worth).
 *
 * Formulas (K items, N examinees, X an examinee's total, σ²ₓ the variance of X):
 *   KR-20 = K/(K−1) · (1 − Σσ²ⱼ / σ²ₓ)       Kuder GF, Richardson MW, Psychometrika 1937
 *   KR-21 = K/(K−1) · (1 − M(K−M) / (K·σ²ₓ))  same source; M the mean total
 *   SEM   = SD · √(1 − KR-20)                 Lane, Online Statistics Education, glossary
 *   point-biserial = Pearson r of the item with X   Brown JD, Shiken (JALT TEVAL SIG) 2001
 *   corrected      = Pearson r of the item with X minus that item   LeBlanc V, Cox MAA, TQMP 2017;13(1):46
 *   D = (upper correct − lower correct) / n   27 % groups, see ./extreme-groups.ts
 *
 * σ²ⱼ is the item's variance with divisor N, which for a 0/1 item is exactly pⱼqⱼ, so Σσ²ⱼ is
 * Kuder and Richardson's Σpq. For partial-credit items the same expression is coefficient
 * alpha (Cronbach LJ, Psychometrika 1951), of which KR-20 is the 0/1 case. The variance kind
 * option changes only σ²ₓ (and so SD, KR-20, KR-21 and SEM): "KR-20 with the N − 1 variance"
 * is the classical Σpq over the sample variance of the totals (0.7378 on Wuensch's data).
 * Population (divisor N) is the default, as the classical worked examples use, and the result
 * always says which was used (varianceKind).
 *
 * Undefined statistics are null, never NaN: below 2 examinees or 2 items there is no KR-20 or
 * KR-21; a zero total variance (everyone the same score, to a millionth of an item) leaves
 * KR-20, KR-21, SEM, the (uncorrected) point-biserials and D undefined; an item everyone got
 * right (or wrong) has no point-biserial. With the sample variance, very small groups can give
 * a KR-20 above 1 (Σpq keeps divisor N): SEM is then null rather than the square root of a
 * negative number.
 */
import { extremeGroups, GROUP_RULE_TEXT, scoreKey, scoreOfKey, UPPER_LOWER_FRACTION } from "./extreme-groups";
import { canonicalSum, mean, pearson, standardDeviation, variance, type VarianceKind } from "./moments";

export type AnalyzeOptions = {
  /** Divisor of the total-score variance: N ("population", default) or N − 1 ("sample"). */
  variance?: VarianceKind;
};

export type ItemStatistics = {
  /** Column index of the item in the input. */
  index: number;
  /** Difficulty: mean fraction earned (proportion correct for a 0/1 item). */
  p: number;
  /** Item variance with divisor N: p(1 − p) for a 0/1 item. */
  variance: number;
  /** Pearson r of the item with the total score; null if the item or the total is constant. */
  pointBiserial: number | null;
  /** Pearson r of the item with the total of the *other* items; null if either is constant. */
  correctedPointBiserial: number | null;
  /** D = (upperCorrect − lowerCorrect) / groupSize; null below 2 examinees or when all tie. */
  discrimination: number | null;
  /** Correct answers (points as fractions of the item) in the upper group, ties shared. */
  upperCorrect: number | null;
  /** The same in the lower group. */
  lowerCorrect: number | null;
  /** n of each group (0 below 2 examinees). */
  groupSize: number;
};

export type ScoreFrequency = { score: number; count: number };

export type ResponseAnalysis = {
  examinees: number;
  /** K, the number of items (columns); also the maximum total. */
  itemCount: number;
  varianceKind: VarianceKind;
  /** Mean total score, in items; null without examinees. */
  mean: number | null;
  /** Variance of the totals with the declared divisor; null without enough examinees. */
  variance: number | null;
  sd: number | null;
  /** Σ of the item variances (Σpq for 0/1 items); null without examinees. */
  sumItemVariance: number | null;
  kr20: number | null;
  kr21: number | null;
  sem: number | null;
  groups: { fraction: number; size: number; rule: string };
  /** How many examinees had each total score, ascending (scores rounded to a millionth of an item). */
  distribution: ScoreFrequency[];
  items: ItemStatistics[];
};

/** KR-20 may exceed 1 by rounding alone when all items are identical; beyond this it is real. */
const RELIABILITY_ROUNDING = 1e-12;

export function analyzeResponses(scores: readonly (readonly number[])[], options: AnalyzeOptions = {}): ResponseAnalysis {
  const varianceKind = options.variance ?? "population";
  if (varianceKind !== "population" && varianceKind !== "sample") {
    throw new RangeError(`The variance must be "population" (divide by N) or "sample" (divide by N − 1), not ${JSON.stringify(varianceKind)}.`);
  }
  validateScores(scores);

  const examinees = scores.length;
  const itemCount = examinees > 0 ? scores[0].length : 0;
  const totals = scores.map((row) => canonicalSum(row));
  const columns = Array.from({ length: itemCount }, (_, j) => scores.map((row) => row[j]));

  const meanTotal = mean(totals);
  const keys = totals.map(scoreKey);
  const everyoneTied = keys.every((key) => key === keys[0]);
  // Totals that tie (equal to a millionth of an item) but differ in the last bit — 0/5 + 3/5
  // is 0.6, 1/5 + 2/5 is 0.6000000000000001 — are one score: without this, the rounding noise
  // would pass for a spread and give a KR-20 of −10¹⁵ instead of none. The common value is the
  // (order-independent) mean.
  const tiedTotals = everyoneTied ? totals.map(() => meanTotal as number) : totals;
  const totalVariance = variance(tiedTotals, varianceKind);
  const sd = standardDeviation(tiedTotals, varianceKind);
  const itemVariances = columns.map((column) => variance(column, "population") as number);
  const sumItemVariance = examinees > 0 ? canonicalSum(itemVariances) : null;

  const reliable = itemCount >= 2 && totalVariance !== null && totalVariance > 0;
  const k = itemCount;
  const kr20 = reliable ? (k / (k - 1)) * (1 - (sumItemVariance as number) / totalVariance) : null;
  const m = meanTotal as number;
  const kr21 = reliable ? (k / (k - 1)) * (1 - (m * (k - m)) / (k * totalVariance)) : null;
  const sem = kr20 !== null && sd !== null && kr20 <= 1 + RELIABILITY_ROUNDING ? sd * Math.sqrt(Math.max(0, 1 - kr20)) : null;

  const groups = extremeGroups(totals, UPPER_LOWER_FRACTION);

  const items = columns.map((column, index): ItemStatistics => {
    const upperCorrect = groups.size > 0 ? groupCorrect(column, groups.upper, groups.size) : null;
    const lowerCorrect = groups.size > 0 ? groupCorrect(column, groups.lower, groups.size) : null;
    const discrimination =
      upperCorrect !== null && lowerCorrect !== null && !everyoneTied ? (upperCorrect - lowerCorrect) / groups.size : null;
    return {
      index,
      p: mean(column) as number,
      variance: itemVariances[index],
      pointBiserial: pearson(column, tiedTotals),
      correctedPointBiserial: pearson(
        column,
        tiedTotals.map((total, i) => total - column[i]),
      ),
      discrimination,
      upperCorrect,
      lowerCorrect,
      groupSize: groups.size,
    };
  });

  return {
    examinees,
    itemCount,
    varianceKind,
    mean: meanTotal,
    variance: totalVariance,
    sd,
    sumItemVariance,
    kr20,
    kr21,
    sem,
    groups: { fraction: UPPER_LOWER_FRACTION, size: groups.size, rule: GROUP_RULE_TEXT },
    distribution: distributionOf(keys),
    items,
  };
}

/**
 * Σ weight × score over one group, kept within [0, n]: shared weights such as 8/12 do not add
 * up to exactly 8 in binary (twelve of them make 8.000000000000002), and a group of n cannot
 * have more than n correct — nor a D above 1.
 */
function groupCorrect(column: readonly number[], weights: readonly number[], size: number): number {
  return Math.min(size, canonicalSum(column.map((s, i) => s * weights[i])));
}

function distributionOf(keys: readonly number[]): ScoreFrequency[] {
  const counts = new Map<number, number>();
  for (const key of keys) counts.set(key, (counts.get(key) ?? 0) + 1);
  return [...counts.entries()].sort(([a], [b]) => a - b).map(([key, count]) => ({ score: scoreOfKey(key), count }));
}

function validateScores(scores: readonly (readonly number[])[]) {
  if (!Array.isArray(scores as unknown)) throw new RangeError("Scores must be a list of examinees' rows.");
  scores.forEach((row, i) => {
    if (!Array.isArray(row as unknown)) throw new RangeError(`Examinee row ${i} is not a list of item scores.`);
    if (row.length !== scores[0].length) {
      throw new RangeError(`Examinee row ${i} has ${row.length} item scores but row 0 has ${scores[0].length}; every examinee needs a score on every item.`);
    }
    row.forEach((value, j) => {
      if (!(Number.isFinite(value) && value >= 0 && value <= 1)) {
        throw new RangeError(`Score [${i}][${j}] is ${String(value)}; each score is the fraction of the item's points earned, from 0 to 1.`);
      }
    });
  });
}
