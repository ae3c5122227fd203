/**
 * The score of one submitted attempt: each item's earned points, the raw score, the percentage,
 * pass or fail against the exam's pass mark, and a subscore per topic. Pure and deterministic:
 * the same items give the same result whatever order they are passed in (everything is summed
 * in position order, so even floating-point rounding cannot depend on the order).
 */
import type { Key, Response } from "~/domain/bank/present";
import { scoreItem, type ScoringPolicy } from "./score-item";

export type GradedItemInput = {
  /** The item's place in the attempt (unique within the attempt). */
  position: number;
  key: Key;
  /** Null when the therapist left the item unanswered. */
  response: Response | null;
  /** Topic slugs; an item counts in each of its topics' subscores. */
  topics: string[];
  /** What the item is worth (default 1). */
  points?: number;
};

export type ItemScore = { position: number; fraction: number; earned: number; points: number };
export type TopicSubscore = { topic: string; raw: number; max: number; percent: number };

export type AttemptScore = {
  /** One per item, in position order. */
  items: ItemScore[];
  /** Points earned. */
  raw: number;
  /** Points available. */
  max: number;
  /** raw × 100 / max at full precision (0 when max is 0); round only for display. */
  percent: number;
  passed: boolean;
  /** One per topic present, sorted by topic slug. */
  subscores: TopicSubscore[];
};

export type ScoreAttemptOptions = { passMarkPercent: number; policy: ScoringPolicy };

/**
 * Slack when comparing the percentage with the pass mark, so binary rounding never fails a
 * score that is exactly on the mark (partial credits such as 1/3 and 1/10 do not add up exactly
 * in binary; 57/100 × 100 is 56.99999999999999). Far below any real difference: one point in
 * 10 000 is 0.01 %.
 */
export const PASS_MARK_SLACK = 1e-9;

const percentOf = (raw: number, max: number) => (max > 0 ? (raw * 100) / max : 0);

/**
 * Whether a score reaches the pass mark: raw × 100 / max ≥ pass mark − 1e-9. "At or above the
 * mark passes" (16 of 20 passes an 80 % mark) is common practice, no source. An attempt worth
 * no points (max 0) is not passed: there is nothing to pass on.
 */
export function reachesPassMark(raw: number, max: number, passMarkPercent: number): boolean {
  return max > 0 && percentOf(raw, max) >= passMarkPercent - PASS_MARK_SLACK;
}

export function scoreAttempt(items: GradedItemInput[], options: ScoreAttemptOptions): AttemptScore {
  const { passMarkPercent, policy } = options;
  if (!Number.isFinite(passMarkPercent) || passMarkPercent < 0 || passMarkPercent > 100) {
    throw new RangeError(`The pass mark must be a percentage from 0 to 100 (got ${passMarkPercent}).`);
  }
  const seen = new Set<number>();
  for (const item of items) {
    if (!Number.isFinite(item.position)) throw new RangeError(`An item's position must be a number (got ${item.position}).`);
    if (seen.has(item.position)) throw new RangeError(`Position ${item.position} appears twice in the attempt.`);
    seen.add(item.position);
    const points = item.points ?? 1;
    if (!Number.isFinite(points) || points < 0) throw new RangeError(`The item at position ${item.position} must be worth zero or more points (got ${points}).`);
  }

  const ordered = [...items].sort((a, b) => a.position - b.position);
  const byTopic = new Map<string, { raw: number; max: number }>();
  const scored: ItemScore[] = [];
  let raw = 0;
  let max = 0;
  for (const item of ordered) {
    const points = item.points ?? 1;
    const fraction = scoreItem(item.key, item.response, policy);
    const earned = fraction * points;
    scored.push({ position: item.position, fraction, earned, points });
    raw += earned;
    max += points;
    for (const topic of new Set(item.topics)) {
      const t = byTopic.get(topic) ?? { raw: 0, max: 0 };
      t.raw += earned;
      t.max += points;
      byTopic.set(topic, t);
    }
  }

  const subscores = [...byTopic.entries()]
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([topic, t]) => ({ topic, raw: t.raw, max: t.max, percent: percentOf(t.raw, t.max) }));

  return { items: scored, raw, max, percent: percentOf(raw, max), passed: reachesPassMark(raw, max, passMarkPercent), subscores };
}
