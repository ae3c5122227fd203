/**
 * Scoring of timed exams — public API (pure TypeScript: runs in the browser and on the server).
 *
 *   scoreItem(key, response | null, policy): number — fraction of one item's points, in [0, 1].
 *       ScoringPolicy = { multiple: "all-or-nothing" | "partial"; ordering: "exact" | "partial" }.
 *       Partial multiple response: plus/minus rule; partial ordering: Kendall's τ floored at 0.
 *   parseNumericAnswer(text, unit): { ok: true; value } | { ok: false; message } — what a
 *       therapist typed into a numeric item (decimal comma, optional unit), or why it is refused.
 *   scoreAttempt(items, { passMarkPercent, policy }): AttemptScore — per-item earned points,
 *       raw, max, percent (full precision), passed (≥ mark, 1e-9 slack), subscores by topic.
 */
export { ALL_OR_NOTHING_POLICY, NUMERIC_SLACK, multipleFraction, orderingFraction, scoreItem, type ScoringPolicy } from "./score-item";
export { normaliseUnit, parseNumericAnswer, type NumericAnswer } from "./numeric-answer";
export {
  PASS_MARK_SLACK,
  reachesPassMark,
  scoreAttempt,
  type AttemptScore,
  type GradedItemInput,
  type ItemScore,
  type ScoreAttemptOptions,
  type TopicSubscore,
} from "./score-attempt";
