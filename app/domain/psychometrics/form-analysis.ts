/**
 * Item analysis of an exam whose attempts may each have a different form (items drawn per
 * attempt from a blueprint), built on the classical statistics of ./item-analysis.ts.
 *
 * Input: one record per examinee (an attempt), listing the items of their form by item id with
 * the fraction of the item's points earned. Two cases:
 *
 * Same form (every examinee answered the same set of items, in any order): the examinee × item
 * matrix is complete and analyzeResponses does everything — KR-20, KR-21, SEM, and per item p,
 * point-biserial, corrected point-biserial and D — exactly as for a printed test.
 *
 * Random forms (each examinee saw a draw from the bank): the matrix has holes, so
 *   - each examinee's total X is the sum over their own form (all forms of one exam version have
 *     the same length K, so totals are on one scale: the number of items right out of K);
 *   - per item, everything is computed over the examinees who saw it: p is their mean score on
 *     it, the point-biserial is Pearson r of the item with their total, the corrected one with
 *     their total minus the item, and D uses upper and lower 27 % groups formed among them, ranked
 *     by total (the tie rule of ./extreme-groups.ts);
 *   - KR-21 needs only K, the mean and the variance of the totals, so it is computed as usual; it
 *     is the classical estimate for forms made by sampling items at random (Lord FM, "Sampling
 *     fluctuations resulting from the sampling of test items", Psychometrika 1955 — from memory);
 *   - KR-20 needs Σpq of one form. We use the Σpq (Σ item variances) of each examinee's own form,
 *     from the items' pooled statistics, averaged over the examinees: the Σpq of the average
 *     drawn form. With every form the same this is exactly KR-20; with random forms it is an
 *     approximation, and the page says so. SEM = SD · √(1 − that KR-20).
 *   - Forms of different lengths (not expected within one exam version) leave K, KR-20, KR-21
 *     and SEM undefined; per-item statistics still stand.
 * Every check of these against the plain module is in form-analysis.test.ts.
 */
import { extremeGroups, scoreKey, UPPER_LOWER_FRACTION } from "./extreme-groups";
import { analyzeResponses, type ScoreFrequency } from "./item-analysis";
import { canonicalSum, mean, pearson, standardDeviation, variance, type VarianceKind } from "./moments";

export type ExamineeForm = { items: readonly { itemId: string; score: number }[] };

export type FormItemStatistics = {
  itemId: string;
  /** Examinees whose form held the item. */
  seenBy: number;
  p: number;
  variance: number;
  pointBiserial: number | null;
  correctedPointBiserial: number | null;
  discrimination: number | null;
  upperCorrect: number | null;
  lowerCorrect: number | null;
  groupSize: number;
  /** Examinee indexes (input order) who saw the item, with their weight in its upper and lower groups. */
  members: { examinee: number; score: number; upper: number; lower: number }[];
};

export type FormAnalysis = {
  method: "same-form" | "random-forms";
  examinees: number;
  /** Items per form (K); null when forms differ in length. */
  formLength: number | null;
  varianceKind: VarianceKind;
  totals: number[];
  mean: number | null;
  variance: number | null;
  sd: number | null;
  /** Σ item variances of a form (the average over examinees' forms for random forms). */
  sumItemVariance: number | null;
  kr20: number | null;
  kr21: number | null;
  sem: number | null;
  distribution: ScoreFrequency[];
  items: FormItemStatistics[];
};

function validate(examinees: readonly ExamineeForm[]) {
  examinees.forEach((e, i) => {
    const seen = new Set<string>();
    for (const it of e.items) {
      if (seen.has(it.itemId)) throw new RangeError(`Examinee ${i} has item ${it.itemId} twice; an item is asked once per form.`);
      seen.add(it.itemId);
      if (!(Number.isFinite(it.score) && it.score >= 0 && it.score <= 1)) {
        throw new RangeError(`Examinee ${i}, item ${it.itemId}: the score is ${String(it.score)}; it must be the fraction of the item's points earned, from 0 to 1.`);
      }
    }
  });
}

function sameItemSet(examinees: readonly ExamineeForm[]): string[] | null {
  if (examinees.length === 0) return null;
  const first = examinees[0].items.map((i) => i.itemId).sort();
  for (const e of examinees) {
    const ids = e.items.map((i) => i.itemId).sort();
    if (ids.length !== first.length || ids.some((id, k) => id !== first[k])) return null;
  }
  return first;
}

export function analyzeForms(examinees: readonly ExamineeForm[], options: { variance?: VarianceKind } = {}): FormAnalysis {
  const varianceKind = options.variance ?? "population";
  validate(examinees);
  const ids = sameItemSet(examinees);
  const totals = examinees.map((e) => canonicalSum(e.items.map((i) => i.score)));

  if (ids) {
    const matrix = examinees.map((e) => {
      const of = new Map(e.items.map((i) => [i.itemId, i.score]));
      return ids.map((id) => of.get(id) as number);
    });
    const a = analyzeResponses(matrix, { variance: varianceKind });
    const groups = extremeGroups(a.examinees > 0 ? matrix.map((r) => canonicalSum(r)) : [], UPPER_LOWER_FRACTION);
    return {
      method: "same-form",
      examinees: a.examinees,
      formLength: a.itemCount,
      varianceKind,
      totals,
      mean: a.mean,
      variance: a.variance,
      sd: a.sd,
      sumItemVariance: a.sumItemVariance,
      kr20: a.kr20,
      kr21: a.kr21,
      sem: a.sem,
      distribution: a.distribution,
      items: a.items.map((s) => ({
        itemId: ids[s.index],
        seenBy: a.examinees,
        p: s.p,
        variance: s.variance,
        pointBiserial: s.pointBiserial,
        correctedPointBiserial: s.correctedPointBiserial,
        discrimination: s.discrimination,
        upperCorrect: s.upperCorrect,
        lowerCorrect: s.lowerCorrect,
        groupSize: s.groupSize,
        members: matrix.map((row, i) => ({ examinee: i, score: row[s.index], upper: groups.upper[i], lower: groups.lower[i] })),
      })),
    };
  }

  // Random forms: per item over those who saw it.
  const byItem = new Map<string, { examinee: number; score: number }[]>();
  examinees.forEach((e, i) => {
    for (const it of e.items) {
      const list = byItem.get(it.itemId);
      if (list) list.push({ examinee: i, score: it.score });
      else byItem.set(it.itemId, [{ examinee: i, score: it.score }]);
    }
  });
  const items: FormItemStatistics[] = [...byItem.entries()]
    .sort(([x], [y]) => (x < y ? -1 : x > y ? 1 : 0))
    .map(([itemId, seen]) => {
      const s = seen.map((m) => m.score);
      const x = seen.map((m) => totals[m.examinee]);
      const keys = x.map(scoreKey);
      const tied = keys.every((k) => k === keys[0]);
      const groups = extremeGroups(x, UPPER_LOWER_FRACTION);
      const weighted = (weights: number[]) => Math.min(groups.size, canonicalSum(s.map((v, i) => v * weights[i])));
      const upperCorrect = groups.size > 0 ? weighted(groups.upper) : null;
      const lowerCorrect = groups.size > 0 ? weighted(groups.lower) : null;
      return {
        itemId,
        seenBy: seen.length,
        p: mean(s) as number,
        variance: variance(s, "population") as number,
        pointBiserial: tied ? null : pearson(s, x),
        correctedPointBiserial: pearson(
          s,
          x.map((t, i) => t - s[i]),
        ),
        discrimination: upperCorrect !== null && lowerCorrect !== null && !tied ? (upperCorrect - lowerCorrect) / groups.size : null,
        upperCorrect,
        lowerCorrect,
        groupSize: groups.size,
        members: seen.map((m, i) => ({ ...m, upper: groups.upper[i], lower: groups.lower[i] })),
      };
    });

  const lengths = new Set(examinees.map((e) => e.items.length));
  const k = lengths.size === 1 ? [...lengths][0] : null;
  const keys = totals.map(scoreKey);
  const everyoneTied = keys.every((key) => key === keys[0]);
  const m = mean(totals);
  const v = everyoneTied && totals.length > 0 ? 0 : variance(totals, varianceKind);
  const sd = everyoneTied && totals.length > 0 ? 0 : standardDeviation(totals, varianceKind);
  const itemVariance = new Map(items.map((i) => [i.itemId, i.variance]));
  const sumItemVariance = examinees.length > 0 ? (mean(examinees.map((e) => canonicalSum(e.items.map((i) => itemVariance.get(i.itemId) as number)))) as number) : null;
  const reliable = k !== null && k >= 2 && v !== null && v > 0;
  const kr20 = reliable ? (k / (k - 1)) * (1 - (sumItemVariance as number) / v) : null;
  const kr21 = reliable ? (k / (k - 1)) * (1 - ((m as number) * (k - (m as number))) / (k * v)) : null;
  const sem = kr20 !== null && sd !== null && kr20 <= 1 ? sd * Math.sqrt(1 - kr20) : null;
  const counts = new Map<number, number>();
  for (const key of keys) counts.set(key, (counts.get(key) ?? 0) + 1);
  const distribution = [...counts.entries()].sort(([a], [b]) => a - b).map(([key, count]) => ({ score: key / 1_000_000, count }));
  return { method: "random-forms", examinees: examinees.length, formLength: k, varianceKind, totals, mean: m, variance: v, sd, sumItemVariance, kr20, kr21, sem, distribution, items };
}

// ---- Flags ------------------------------------------------------------------------------------

export type ItemFlag = "too-easy" | "too-hard" | "weak-discrimination" | "negative-discrimination" | "unused-option";

/**
 * Thresholds for flags. All are common practice, no source: the usual teaching bands for
 * classical item analysis (p above 0.90 or below 0.30; a corrected point-biserial below 0.20 is
 * weak, below 0 works against the test; a distractor no examinee chose does no work — judged only
 * once at least 10 examinees answered the item wrong, since with fewer wrong answers an unchosen
 * option says nothing; fewer than 20 answers to an item, or 30 examinees for an exam, are too few
 * for stable statistics — a caution beside the numbers, not a flag on the item).
 */
export const FLAG_THRESHOLDS = {
  tooEasyAbove: 0.9,
  tooHardBelow: 0.3,
  weakBelow: 0.2,
  negativeBelow: 0,
  minWrongForUnusedOption: 10,
  minItemAnswers: 20,
  minExaminees: 30,
} as const;

/**
 * The flags of one item. `unusedOptions`: wrong options no examinee chose; `wrongAnswers`: how
 * many examinees did not get the item right (unused options count only from 10 wrong answers).
 */
export function itemFlags(s: Pick<FormItemStatistics, "p" | "correctedPointBiserial">, unusedOptions: number, wrongAnswers: number): ItemFlag[] {
  const t = FLAG_THRESHOLDS;
  const flags: ItemFlag[] = [];
  if (s.p > t.tooEasyAbove) flags.push("too-easy");
  if (s.p < t.tooHardBelow) flags.push("too-hard");
  const r = s.correctedPointBiserial;
  if (r !== null && r < t.negativeBelow) flags.push("negative-discrimination");
  else if (r !== null && r < t.weakBelow) flags.push("weak-discrimination");
  if (unusedOptions > 0 && wrongAnswers >= t.minWrongForUnusedOption) flags.push("unused-option");
  return flags;
}

/** Plain words for each flag, shown beside the number. */
/** The caution shown beside an item seen by fewer than FLAG_THRESHOLDS.minItemAnswers examinees. */
export const FEW_ANSWERS_TEXT = "Fewer than 20 examinees saw this item: its numbers can move a lot with a few more answers.";

export const FLAG_TEXT: Record<ItemFlag, { label: string; explain: string }> = {
  "too-easy": { label: "Too easy", explain: "More than 90 % answered it right, so it tells little about who knows the material." },
  "too-hard": { label: "Too hard", explain: "Fewer than 30 % answered it right: check the key, the wording and whether it was taught." },
  "weak-discrimination": { label: "Weak discrimination", explain: "Its corrected point-biserial is below 0.20: doing well on it goes only weakly with doing well on the rest of the exam." },
  "negative-discrimination": { label: "Negative discrimination", explain: "Its corrected point-biserial is below 0: examinees who did well on the rest of the exam got it wrong more often. Check the key first." },
  "unused-option": { label: "Option nobody chose", explain: "At least one wrong option was chosen by no examinee, although 10 or more answered wrong, so it does no work as a distractor." },
};
