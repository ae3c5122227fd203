/**
 * Every performance target the earlier issues set, in one list: the whole-product table that
 * `npm run bench` prints last and the `summary` array of bench-results.json both judge their
 * figures against these, and nothing else. Reported, never asserted (timing belongs in the
 * bench, not in the test suite).
 *
 * Where each comes from (the issue's own words, paraphrased):
 *   #3  "reports the time to simulate 60 s of each mode (target: under 5 ms per mode on this
 *       machine) and the page's JavaScript size (target: the Bench route adds under 60 KB gzipped)";
 *   #5  "save p95 under 50 ms with 300 examinees; lost = 0; grading a 50-item attempt under 5 ms";
 *   #8  the Team matrix request "p95 under 50 ms; within 3× the bare query";
 *   #9  "a full reminder run over 2,000 people (target under 5 s) and one certificate PDF
 *       (target under 200 ms)".
 * Issue 2 (the sign-in page and Today) and issue 10 (the API) set no figure; STACK.md's reference
 * ceilings are context, not targets.
 */

export type Comparison = "<" | "≤" | "=";

export type Target = {
  /** Stable key, used by the summary rows and kept in bench-results.json. */
  id: string;
  issue: number;
  /** What is judged, as the table shows it beside the figure, e.g. "p95 < 50 ms". */
  text: string;
  comparison: Comparison;
  limit: number;
  unit: "ms" | "KB" | "×" | "answers";
  /** How the figure is read, for the README and the JSON. */
  note: string;
};

export const TARGETS = [
  { id: "sim-60s-median", issue: 3, text: "median < 5 ms per 60 s simulated", comparison: "<", limit: 5, unit: "ms", note: "median of the timed runs of one mode's 60 s scenario" },
  { id: "bench-bundle-gzip", issue: 3, text: "< 60 KB gzipped", comparison: "<", limit: 60, unit: "KB", note: "JavaScript the Bench route adds beyond the shell, gzipped, lazy chunks included" },
  { id: "autosave-p95", issue: 5, text: "save p95 < 50 ms (300 examinees)", comparison: "<", limit: 50, unit: "ms", note: "judged only when at least 300 examinees saved; a scaled run is 'not judged'" },
  { id: "autosave-lost", issue: 5, text: "lost = 0", comparison: "=", limit: 0, unit: "answers", note: "acknowledged saves with no answer in the database afterwards" },
  { id: "grading-50-items", issue: 5, text: "p95 < 5 ms per 50-item grade", comparison: "<", limit: 5, unit: "ms", note: "scoreAttempt on one 50-item attempt, p95 of the timed runs" },
  { id: "team-matrix-p95", issue: 8, text: "request p95 < 50 ms (one manager)", comparison: "<", limit: 50, unit: "ms", note: "one manager alone on one connection, as the target describes; the crowd of 20 is context" },
  { id: "team-matrix-vs-sql", issue: 8, text: "p95 ≤ 3× bare SQL p95", comparison: "≤", limit: 3, unit: "×", note: "request p95 ÷ the p95 of readMatrixRows timed in-process" },
  { id: "certificate-pdf-p95", issue: 9, text: "p95 < 200 ms", comparison: "<", limit: 200, unit: "ms", note: "one certificate PDF render after a warm-up" },
  { id: "reminder-run", issue: 9, text: "daily run < 5 s (5000 ms)", comparison: "<", limit: 5000, unit: "ms", note: "the daily reminder run over the 2,000-person organisation" },
] as const satisfies readonly Target[];

export type TargetId = (typeof TARGETS)[number]["id"];

export function target(id: TargetId): Target {
  const found = TARGETS.find((t) => t.id === id);
  if (!found) throw new Error(`No bench target "${id}".`);
  return found;
}

export type Verdict = "met" | "NOT met" | "not judged";

export type Judgement = {
  target: TargetId;
  issue: number;
  text: string;
  /** The figure judged, in the target's unit; null when it could not be measured. */
  value: number | null;
  unit: Target["unit"];
  verdict: Verdict;
  /** Why a figure was not judged, e.g. "scaled run: 40 examinees, the target is for 300". */
  reason?: string;
};

/** Judges one figure against one target. A missing or non-finite figure, or a reason given, is "not judged". */
export function judge(id: TargetId, value: number | null | undefined, notJudgedBecause?: string): Judgement {
  const t = target(id);
  const base = { target: t.id as TargetId, issue: t.issue, text: t.text, unit: t.unit };
  if (value === null || value === undefined || !Number.isFinite(value)) {
    return { ...base, value: null, verdict: "not judged", reason: notJudgedBecause ?? "not measured" };
  }
  if (notJudgedBecause) return { ...base, value, verdict: "not judged", reason: notJudgedBecause };
  const ok = t.comparison === "<" ? value < t.limit : t.comparison === "≤" ? value <= t.limit : value === t.limit;
  return { ...base, value, verdict: ok ? "met" : "NOT met" };
}

/** A row's overall result: "no target" without judgements, "NOT met" if any is, "met" only when all are. */
export function overall(judgements: Judgement[]): "met" | "NOT met" | "not judged" | "no target" {
  if (judgements.length === 0) return "no target";
  if (judgements.some((j) => j.verdict === "NOT met")) return "NOT met";
  if (judgements.every((j) => j.verdict === "met")) return "met";
  return "not judged";
}
