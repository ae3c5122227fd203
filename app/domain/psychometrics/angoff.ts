/**
 * Modified Angoff cut scores.
 *
 * Each judge estimates, for each item, the chance (0 to 1) that a minimally competent
 * candidate answers it correctly. A judge's cut is the sum of their item estimates; the
 * panel's cut is the mean of the judges' cuts (Livingston SA, Zieky MJ, "Passing Scores",
 * ETS 1982). Cuts are in items (raw score on a test of K one-point items); cutPercent is
 * cut / K × 100.
 *
 * Random forms: when each examinee's form is drawn from a bank, each drawn form has its own
 * Angoff cut — the sum, over the items actually on the form, of the panel's estimates
 * (Coscarelli et al., 2006).
 * `angoffCutForForm` computes it from ratings kept per bank item.
 */
import { canonicalSum, mean, standardDeviation, type VarianceKind } from "./moments";

export type AngoffOptions = {
  /** Divisor of the spread of judges' cuts: N (default, "population") or N − 1 ("sample"). */
  variance?: VarianceKind;
};

export type AngoffCut = {
  judges: number;
  itemCount: number;
  /** Each judge's cut (sum of their estimates), in the order of the rows given. */
  judgeCuts: number[];
  /** The panel's cut: mean of the judges' cuts, in items. */
  cut: number;
  /** cut / itemCount × 100. */
  cutPercent: number;
  /** Lowest and highest judge's cut. */
  min: number;
  max: number;
  varianceKind: VarianceKind;
  /** Standard deviation of the judges' cuts with the declared divisor; null for "sample" with one judge. */
  sd: number | null;
  /** Mean estimate per item across judges, in item order. */
  itemMeans: number[];
};

/**
 * The panel's cut from a judges × items matrix of estimates in [0, 1]. Throws a RangeError
 * naming the problem for no judges, no items, a judge who did not rate every item, or an
 * estimate outside [0, 1].
 *
 * The mean is clamped to [min, max] of the judges' cuts: mathematically it always lies there,
 * and the clamp only removes a last-bit rounding excess (three judges at 0.1 average to
 * 0.10000000000000002 in binary).
 */
export function angoffCut(ratings: readonly (readonly number[])[], options: AngoffOptions = {}): AngoffCut {
  const varianceKind = options.variance ?? "population";
  if (varianceKind !== "population" && varianceKind !== "sample") {
    throw new RangeError(`The variance must be "population" (divide by N) or "sample" (divide by N − 1), not ${JSON.stringify(varianceKind)}.`);
  }
  if (!Array.isArray(ratings as unknown) || ratings.length === 0) {
    throw new RangeError("There are no judges' ratings: an Angoff cut needs at least one judge.");
  }
  ratings.forEach((row, judge) => {
    if (!Array.isArray(row as unknown)) throw new RangeError(`Judge row ${judge} is not a list of item ratings.`);
  });
  const itemCount = ratings[0].length;
  if (itemCount === 0) throw new RangeError("The judges rated no items: an Angoff cut needs at least one item.");
  ratings.forEach((row, judge) => {
    if (row.length !== itemCount) {
      throw new RangeError(`Judge row ${judge} rated ${row.length} items but row 0 rated ${itemCount}; every judge must rate every item.`);
    }
    row.forEach((value, item) => {
      if (!(Number.isFinite(value) && value >= 0 && value <= 1)) {
        throw new RangeError(
          `Rating [${judge}][${item}] is ${String(value)}; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1.`,
        );
      }
    });
  });

  const judgeCuts = ratings.map((row) => canonicalSum(row));
  const min = Math.min(...judgeCuts);
  const max = Math.max(...judgeCuts);
  const cut = Math.min(max, Math.max(min, mean(judgeCuts) as number));
  return {
    judges: ratings.length,
    itemCount,
    judgeCuts,
    cut,
    cutPercent: (cut / itemCount) * 100,
    min,
    max,
    varianceKind,
    sd: standardDeviation(judgeCuts, varianceKind),
    itemMeans: Array.from({ length: itemCount }, (_, item) => mean(ratings.map((row) => row[item])) as number),
  };
}

/** Ratings kept per bank item: item id → judge id → estimate in [0, 1]. */
export type RatingsByItemId =
  | Readonly<Record<string, Readonly<Record<string, number>>>>
  | ReadonlyMap<string, ReadonlyMap<string, number>>;

export type FormAngoffCut = {
  /** The form's items, in the order given. */
  formItemIds: string[];
  /** Items of the form that no judge rated. Any of them makes the form's cut null. */
  unratedItemIds: string[];
  /** Judges who rated every item of the form, sorted by id: the panel for this form. */
  judgeIds: string[];
  /** Judges who rated some but not all of the form's items, sorted by id: left out of this form's panel. */
  excludedJudgeIds: string[];
  /** The panel's cut for this form (judgeCuts aligned with judgeIds); null when it cannot be computed. */
  panel: AngoffCut | null;
  cut: number | null;
  cutPercent: number | null;
  /** Why `panel` is null, in plain words; null when the cut was computed. */
  reason: string | null;
};

/**
 * The Angoff cut of the form actually drawn (Coscarelli et al., 2006): the panel's estimates
 * for exactly the items on the form, summed per judge and averaged over judges.
 *
 * Missing ratings are never filled in. A form item that no judge rated is listed in
 * `unratedItemIds` and the form gets no Angoff cut (`cut: null`, with a `reason`): putting in
 * another item's or the bank's mean estimate would present a guess as the panel's judgement.
 * The caller keeps whatever pass mark applied before and shows the list, so the items can be
 * rated. A judge who rated some but not all of the form's items has no cut for this form (a
 * judge's cut is the sum over every item, Livingston & Zieky 1982): they are left out of this
 * form's panel and listed in `excludedJudgeIds`. Ratings of bank items not on the form are
 * ignored. Throws a RangeError for an empty form, an item listed twice, or an estimate outside
 * [0, 1].
 */
export function angoffCutForForm(ratingsByItemId: RatingsByItemId, formItemIds: readonly string[], options: AngoffOptions = {}): FormAngoffCut {
  if (formItemIds.length === 0) throw new RangeError("The form has no items, so it has no Angoff cut.");
  const seen = new Set<string>();
  for (const id of formItemIds) {
    if (seen.has(id)) throw new RangeError(`Item ${JSON.stringify(id)} is on the form twice; a form lists each item once.`);
    seen.add(id);
  }

  const ratingsOf = (itemId: string): ReadonlyMap<string, number> => {
    if (ratingsByItemId instanceof Map) return ratingsByItemId.get(itemId) ?? new Map();
    const record = ratingsByItemId as Readonly<Record<string, Readonly<Record<string, number>>>>;
    return Object.hasOwn(record, itemId) ? new Map(Object.entries(record[itemId])) : new Map();
  };
  const formRatings = formItemIds.map((itemId) => {
    const byJudge = ratingsOf(itemId);
    for (const [judgeId, value] of byJudge) {
      if (!(Number.isFinite(value) && value >= 0 && value <= 1)) {
        throw new RangeError(
          `Judge ${JSON.stringify(judgeId)}'s rating of item ${JSON.stringify(itemId)} is ${String(value)}; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1.`,
        );
      }
    }
    return byJudge;
  });

  const unratedItemIds = formItemIds.filter((_, i) => formRatings[i].size === 0);
  const everyJudge = [...new Set(formRatings.flatMap((byJudge) => [...byJudge.keys()]))].sort(compareIds);
  const judgeIds = everyJudge.filter((judgeId) => formRatings.every((byJudge) => byJudge.has(judgeId)));
  const excludedJudgeIds = everyJudge.filter((judgeId) => !judgeIds.includes(judgeId));
  const base = { formItemIds: [...formItemIds], unratedItemIds, judgeIds, excludedJudgeIds };

  if (unratedItemIds.length > 0) {
    const n = unratedItemIds.length;
    return {
      ...base,
      panel: null,
      cut: null,
      cutPercent: null,
      reason: `${n} ${n === 1 ? "item" : "items"} of this form ${n === 1 ? "has" : "have"} no Angoff ratings, so the form has no Angoff cut until ${n === 1 ? "it is" : "they are"} rated.`,
    };
  }
  if (judgeIds.length === 0) {
    return {
      ...base,
      panel: null,
      cut: null,
      cutPercent: null,
      reason: "No judge rated every item of this form, so no judge has a cut for it.",
    };
  }
  const panel = angoffCut(
    judgeIds.map((judgeId) => formRatings.map((byJudge) => byJudge.get(judgeId) as number)),
    options,
  );
  return { ...base, panel, cut: panel.cut, cutPercent: panel.cutPercent, reason: null };
}

/** Code-unit order, the same on every machine (localeCompare is not). */
function compareIds(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
