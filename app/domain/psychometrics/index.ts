/**
 * Psychometrics — item analysis and Angoff cut scores (pure TypeScript: no framework, database
 * or React; runs in the browser and on the server).
 *
 *   analyzeResponses(scores, { variance? }): ResponseAnalysis — rows examinees, columns items,
 *       values the fraction of the item's points earned. Mean, variance (N by default, declared
 *       in varianceKind), SD, KR-20, KR-21, SEM, score distribution; per item p, point-biserial,
 *       corrected point-biserial, D with upper/lower correct and group size. Undefined → null.
 *   extremeGroups(totals, fraction = 0.27) / extremeGroupSize(N) — the 27 % groups: n =
 *       round(0.27 N) halves up, in [1, ⌊N/2⌋]; examinees tied at a group's edge share the places
 *       left equally (GROUP_RULE_TEXT says it in plain words for reports).
 *   angoffCut(ratings, { variance? }): AngoffCut — judges × items estimates in [0, 1]; judge cut =
 *       sum, panel cut = mean (Livingston & Zieky 1982), cutPercent, min, max, sd.
 *   angoffCutForForm(ratingsByItemId, formItemIds): FormAngoffCut — the cut of a drawn form;
 *       null with unratedItemIds when a form item has no rating.
 *   standardErrorOfMeasurement(sd, r), semBand(observed, sem, z = 1): { low, high }.
 *   pearson(x, y), mean, variance(values, kind), standardDeviation(values, kind).
 */
export {
  analyzeResponses,
  type AnalyzeOptions,
  type ItemStatistics,
  type ResponseAnalysis,
  type ScoreFrequency,
} from "./item-analysis";
export {
  extremeGroups,
  extremeGroupSize,
  GROUP_RULE_TEXT,
  SCORE_STEPS_PER_ITEM,
  scoreKey,
  scoreOfKey,
  UPPER_LOWER_FRACTION,
  type ExtremeGroups,
} from "./extreme-groups";
export {
  angoffCut,
  angoffCutForForm,
  type AngoffCut,
  type AngoffOptions,
  type FormAngoffCut,
  type RatingsByItemId,
} from "./angoff";
export { semBand, standardErrorOfMeasurement, type ScoreBand } from "./measurement-error";
export { canonicalSum, isConstant, mean, pearson, standardDeviation, variance, type VarianceKind } from "./moments";
