/**
 * Sums, means, variances and Pearson's r for the item analysis — written so that the result
 * depends only on the *multiset* of values, never on the order the examinees were read in.
 *
 * Why: floating-point addition is not associative (0.1 + 0.2 + 0.3 ≠ 0.3 + 0.2 + 0.1 in the
 * last bit), so a naive running sum over partial-credit fractions such as 1/3 could give a
 * different KR-20 in the 16th digit when the same attempts come back from the database in
 * another order. `canonicalSum` sorts its addends first, so the same multiset always meets the
 * same sequence of additions (common practice, no source).
 */

/** How a variance is divided: by N (population, as the classical worked examples) or N − 1. */
export type VarianceKind = "population" | "sample";

/** Sum of the values after sorting them ascending: the same multiset gives the same bits. */
export function canonicalSum(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  let total = 0;
  for (const value of sorted) total += value;
  return total;
}

/** Arithmetic mean; null for no values. */
export function mean(values: readonly number[]): number | null {
  return values.length === 0 ? null : canonicalSum(values) / values.length;
}

/** Whether every value is the same (then its spread is exactly 0, whatever the mean's rounding). */
export function isConstant(values: readonly number[]): boolean {
  return values.every((v) => v === values[0]);
}

/**
 * Sum of squared deviations from the mean (two-pass, for accuracy); null for no values. Exactly
 * 0 for constant values: the mean of three 0.1s is 0.10000000000000002 in binary, and the tiny
 * deviations it leaves must not pass for a real spread.
 */
function sumOfSquares(values: readonly number[]): number | null {
  const m = mean(values);
  if (m === null) return null;
  if (isConstant(values)) return 0;
  return canonicalSum(values.map((v) => (v - m) * (v - m)));
}

/**
 * Variance of the values. Population: Σ(x − x̄)² / N (defined from one value on, where it is 0).
 * Sample: Σ(x − x̄)² / (N − 1) (null below two values). Null for no values.
 */
export function variance(values: readonly number[], kind: VarianceKind = "population"): number | null {
  const ss = sumOfSquares(values);
  if (ss === null) return null;
  if (kind === "population") return ss / values.length;
  return values.length < 2 ? null : ss / (values.length - 1);
}

/** Square root of `variance(values, kind)`; null where the variance is. */
export function standardDeviation(values: readonly number[], kind: VarianceKind = "population"): number | null {
  const v = variance(values, kind);
  return v === null ? null : Math.sqrt(v);
}

/**
 * Pearson's product-moment correlation r = Σ(x − x̄)(y − ȳ) / √(Σ(x − x̄)² · Σ(y − ȳ)²).
 * The N or N − 1 divisor cancels, so there is no variance kind to choose. Null when it is
 * undefined: fewer than two pairs, or either variable constant. The result is clamped to
 * [−1, 1], which only ever removes a last-bit rounding excess (|r| ≤ 1 by Cauchy–Schwarz).
 * Throws a RangeError for lists of different lengths or non-finite values.
 */
export function pearson(x: readonly number[], y: readonly number[]): number | null {
  if (x.length !== y.length) {
    throw new RangeError(`Pearson's r needs pairs: x has ${x.length} values but y has ${y.length}.`);
  }
  for (const [name, list] of [["x", x], ["y", y]] as const) {
    const bad = list.findIndex((v) => !Number.isFinite(v));
    if (bad >= 0) throw new RangeError(`Pearson's r needs finite numbers: ${name}[${bad}] is ${String(list[bad])}.`);
  }
  if (x.length < 2 || isConstant(x) || isConstant(y)) return null;
  const mx = mean(x) as number;
  const my = mean(y) as number;
  const dx = x.map((v) => v - mx);
  const dy = y.map((v) => v - my);
  const sxx = canonicalSum(dx.map((d) => d * d));
  const syy = canonicalSum(dy.map((d) => d * d));
  const sxy = canonicalSum(dx.map((d, i) => d * dy[i]));
  const r = sxy / Math.sqrt(sxx * syy);
  return Math.min(1, Math.max(-1, r));
}
