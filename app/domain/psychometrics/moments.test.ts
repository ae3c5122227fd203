import { describe, expect, it } from "vitest";
import { canonicalSum, mean, pearson, standardDeviation, variance } from "./index";

describe("pearson", () => {
  it("S9: r of [1, 2.2, 3, 4.8, 5] and [4, 5.3, 6.6, 7, 8] = 0.9569941688503644 ± 1e−12 (mathjs documentation, corr example)", () => {
    const r = pearson([1, 2.2, 3, 4.8, 5], [4, 5.3, 6.6, 7, 8]) as number;
    expect(Math.abs(r - 0.9569941688503644)).toBeLessThanOrEqual(1e-12);
  });

  it("is null where r is undefined: fewer than two pairs, or a constant variable", () => {
    expect(pearson([], [])).toBeNull();
    expect(pearson([1], [2])).toBeNull();
    expect(pearson([1, 1, 1], [1, 2, 3])).toBeNull();
    // Three 0.1s average to 0.10000000000000002 in binary; the leftover deviations are not a spread.
    expect(pearson([0.1, 0.1, 0.1], [1, 2, 3])).toBeNull();
  });

  it("is exactly ±1 for a perfect straight line, never beyond", () => {
    expect(pearson([1, 2, 3], [2, 4, 6])).toBe(1);
    expect(pearson([1, 2, 3], [3, 2, 1])).toBe(-1);
  });

  it("refuses lists of different lengths and non-finite values", () => {
    expect(() => pearson([1, 2], [1])).toThrow(new RangeError("Pearson's r needs pairs: x has 2 values but y has 1."));
    expect(() => pearson([1, Number.POSITIVE_INFINITY], [1, 2])).toThrow(new RangeError("Pearson's r needs finite numbers: x[1] is Infinity."));
  });
});

describe("variance and standard deviation declare their divisor", () => {
  it("S10: sample SD of [2, 4, 4, 4, 5, 5, 7, 9] = 2.138, population SD 2.0 (simple-statistics test suite)", () => {
    const values = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(standardDeviation(values, "sample")).toBeCloseTo(2.138, 3);
    expect(standardDeviation(values, "population")).toBe(2);
    expect(standardDeviation(values)).toBe(2); // population is the default
    expect(variance(values, "sample")).toBeCloseTo(32 / 7, 14);
  });

  it("is null where undefined: no values at all, or one value with N − 1", () => {
    expect(variance([])).toBeNull();
    expect(variance([3])).toBe(0);
    expect(variance([3], "sample")).toBeNull();
    expect(mean([])).toBeNull();
  });

  it("is exactly 0 for constant values whose mean rounds (three 0.1s)", () => {
    expect(variance([0.1, 0.1, 0.1])).toBe(0);
  });
});

describe("canonicalSum", () => {
  it("gives the same bits whatever the order of its addends (a naive sum does not)", () => {
    const forward = [0.1, 0.2, 0.3];
    const backward = [0.3, 0.2, 0.1];
    expect(forward.reduce((a, b) => a + b, 0)).not.toBe(backward.reduce((a, b) => a + b, 0));
    expect(canonicalSum(forward)).toBe(canonicalSum(backward));
  });
});
