// Independent cross-check against simple-statistics 7 (npm), a general-purpose statistics
// library that shares no code with ours. Its defaults, as documented: `variance` and
// `standardDeviation` divide by N, `sampleVariance` and `sampleStandardDeviation` by N − 1,
// and `sampleCorrelation` is Pearson's r.
import fc from "fast-check";
import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import { analyzeResponses, angoffCut, pearson } from "./index";

const WUENSCH = ["1111110110", "1011011101", "1111011001", "0010001000", "0000010010", "1110111111", "1101110111", "1111111101", "0101111101", "1101101110"].map((row) =>
  [...row].map(Number),
);

const column = (rows: number[][], j: number) => rows.map((row) => row[j]);
const totalsOf = (rows: number[][]) => rows.map((row) => ss.sum(row));
/** Coefficient alpha (KR-20 for 0/1 items) from simple-statistics' variances alone. */
function alphaBySimpleStatistics(rows: number[][], kind: "population" | "sample"): number {
  const k = rows[0].length;
  const itemVariance = ss.sum(Array.from({ length: k }, (_, j) => ss.variance(column(rows, j))));
  const totalVariance = kind === "population" ? ss.variance(totalsOf(rows)) : ss.sampleVariance(totalsOf(rows));
  return (k / (k - 1)) * (1 - itemVariance / totalVariance);
}

/** Relative-or-absolute closeness, for values of any size. */
function expectNear(actual: number | null, expected: number, tolerance = 1e-9) {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(tolerance * Math.max(1, Math.abs(expected)));
}

describe("cross-check on Wuensch's data (Wuensch, 'The Kuder-Richardson 20', ECU StatHelp) with simple-statistics", () => {
  const ours = analyzeResponses(WUENSCH);
  const totals = totalsOf(WUENSCH);

  it("mean, population and sample variance and SD of the totals", () => {
    expectNear(ours.mean, ss.mean(totals));
    expectNear(ours.variance, ss.variance(totals));
    expectNear(ours.sd, ss.standardDeviation(totals));
    const sample = analyzeResponses(WUENSCH, { variance: "sample" });
    expectNear(sample.variance, ss.sampleVariance(totals));
    expectNear(sample.sd, ss.sampleStandardDeviation(totals));
  });

  it("every item's point-biserial and corrected point-biserial are simple-statistics' Pearson r", () => {
    ours.items.forEach((item, j) => {
      const x = column(WUENSCH, j);
      expectNear(item.pointBiserial, ss.sampleCorrelation(x, totals));
      expectNear(
        item.correctedPointBiserial,
        ss.sampleCorrelation(
          x,
          totals.map((t, i) => t - x[i]),
        ),
      );
    });
  });

  it("KR-20 with either divisor equals K/(K−1)·(1 − Σ item variances / total variance) from simple-statistics' variances", () => {
    expectNear(ours.kr20, alphaBySimpleStatistics(WUENSCH, "population"));
    expectNear(analyzeResponses(WUENSCH, { variance: "sample" }).kr20, alphaBySimpleStatistics(WUENSCH, "sample"));
  });

  it("S9 data: our pearson and simple-statistics' sampleCorrelation agree (mathjs documentation example)", () => {
    const x = [1, 2.2, 3, 4.8, 5];
    const y = [4, 5.3, 6.6, 7, 8];
    expectNear(pearson(x, y), ss.sampleCorrelation(x, y), 1e-12);
  });
});

// Random response matrices: 0/1 items and partial-credit fractions (halves, thirds, quarters,
// sevenths), 2–30 examinees, 2–10 items.
const fraction = fc.oneof(
  fc.constantFrom(0, 1),
  fc.constantFrom(2, 3, 4, 7).chain((d) => fc.integer({ min: 0, max: d }).map((n) => n / d)),
);
const matrix = fc
  .record({ n: fc.integer({ min: 2, max: 30 }), k: fc.integer({ min: 2, max: 10 }) })
  .chain(({ n, k }) => fc.array(fc.array(fraction, { minLength: k, maxLength: k }), { minLength: n, maxLength: n }));

describe("cross-check on random response matrices with simple-statistics (fast-check)", () => {
  it("mean, both variances, SD, item p, point-biserials and KR-20 agree", () => {
    fc.assert(
      fc.property(matrix, (rows) => {
        const totals = totalsOf(rows);
        const population = analyzeResponses(rows);
        const sample = analyzeResponses(rows, { variance: "sample" });
        expectNear(population.mean, ss.mean(totals));
        expectNear(population.variance, ss.variance(totals));
        expectNear(sample.variance, ss.sampleVariance(totals));
        expectNear(sample.sd, ss.sampleStandardDeviation(totals));
        population.items.forEach((item, j) => {
          const x = column(rows, j);
          expectNear(item.p, ss.mean(x));
          expectNear(item.variance, ss.variance(x));
          // Compared where both variables really vary: totals equal in exact arithmetic can differ
          // in the last bit (1/5 + 2/5 vs 3/5), which we treat as a tie and simple-statistics does not.
          const rest = totals.map((t, i) => t - x[i]);
          if (ss.variance(x) > 1e-9 && ss.variance(totals) > 1e-9) expectNear(item.pointBiserial, ss.sampleCorrelation(x, totals), 1e-9);
          if (ss.variance(x) > 1e-9 && ss.variance(rest) > 1e-9) expectNear(item.correctedPointBiserial, ss.sampleCorrelation(x, rest), 1e-9);
        });
        if (ss.variance(totals) > 1e-9) {
          expectNear(population.kr20, alphaBySimpleStatistics(rows, "population"), 1e-9);
          expectNear(sample.kr20, alphaBySimpleStatistics(rows, "sample"), 1e-9);
        }
      }),
      { numRuns: 300 },
    );
  });

  it("our pearson equals sampleCorrelation on random non-constant pairs", () => {
    const pairs = fc.integer({ min: 2, max: 40 }).chain((n) =>
      fc.tuple(
        fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: n, maxLength: n }),
        fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: n, maxLength: n }),
      ),
    );
    fc.assert(
      fc.property(pairs, ([x, y]) => {
        fc.pre(ss.sampleStandardDeviation(x) > 0.1 && ss.sampleStandardDeviation(y) > 0.1);
        expectNear(pearson(x, y), ss.sampleCorrelation(x, y), 1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it("Angoff: judges' cuts are simple-statistics' sums, the panel's cut their mean, the spread their SD", () => {
    const ratings = fc
      .record({ judges: fc.integer({ min: 1, max: 12 }), items: fc.integer({ min: 1, max: 30 }) })
      .chain(({ judges, items }) =>
        fc.array(fc.array(fc.integer({ min: 0, max: 100 }).map((n) => n / 100), { minLength: items, maxLength: items }), { minLength: judges, maxLength: judges }),
      );
    fc.assert(
      fc.property(ratings, (rows) => {
        const ours = angoffCut(rows);
        const sums = rows.map((row) => ss.sum(row));
        ours.judgeCuts.forEach((cut, i) => expectNear(cut, sums[i]));
        expectNear(ours.cut, ss.mean(sums));
        expectNear(ours.cutPercent, (ss.mean(sums) / rows[0].length) * 100);
        expectNear(ours.sd, ss.standardDeviation(sums));
      }),
      { numRuns: 200 },
    );
  });
});
