import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { analyzeResponses, angoffCut, angoffCutForForm, extremeGroups, type ResponseAnalysis } from "./index";

const fraction = fc.oneof(
  fc.constantFrom(0, 1),
  fc.constantFrom(2, 3, 4, 5, 7).chain((d) => fc.integer({ min: 0, max: d }).map((n) => n / d)),
);
const matrixOf = (value: fc.Arbitrary<number>, minN = 0, maxN = 30) =>
  fc
    .record({ n: fc.integer({ min: minN, max: maxN }), k: fc.integer({ min: 1, max: 10 }) })
    .chain(({ n, k }) => fc.array(fc.array(value, { minLength: k, maxLength: k }), { minLength: n, maxLength: n }));
const permutationOf = <T,>(rows: T[]) => fc.shuffledSubarray(rows, { minLength: rows.length, maxLength: rows.length });

describe("KR-20 of identical items rises with more examinees who differ", () => {
  /*
   * The exact property. Let S be the sum of the item variances and T the variance of the totals
   * (both with divisor N), so KR-20 = K/(K−1)·(1 − S/T). Adding one examinee whose deviation
   * from the item means is d (a K-vector) turns S into (N/(N+1))·(S + |d|²/(N+1)) and T into
   * (N/(N+1))·(T + (Σd)²/(N+1)) (the one-observation update of a covariance matrix). So S/T does
   * not rise — KR-20 does not fall — exactly when T·|d|² ≤ S·(Σd)². For an examinee who differs
   * from the group *by the same amount c on every item* (d = c·1), this reads T ≤ K·S, which
   * always holds (the variance of a sum of K parts is at most K times the sum of their variances,
   * by Cauchy–Schwarz), with equality only when KR-20 is already 1. Hence: such an examinee never
   * lowers KR-20 and raises it strictly whenever c ≠ 0 and KR-20 < 1.
   *
   * With 0/1 items, "the same amount on every item" needs items of identical difficulty (every
   * item answered correctly by the same number of examinees) and an examinee who answers all
   * items alike — all right (c = 1 − p) or all wrong (c = −p). Adding such an examinee keeps the
   * items' difficulties identical, so the argument repeats examinee after examinee.
   */
  it("0/1 items of identical difficulty: each examinee who answers all right or all wrong never lowers KR-20, and raises it while it is below 1", () => {
    // Items of identical difficulty: every answer pattern is given in all K rotations, so each
    // item sees each pattern's answers once.
    const base = fc
      .integer({ min: 2, max: 8 })
      .chain((k) => fc.array(fc.array(fc.constantFrom(0, 1), { minLength: k, maxLength: k }), { minLength: 1, maxLength: 4 }))
      .map((patterns) => patterns.flatMap((pattern) => pattern.map((_, shift) => pattern.map((__, j) => pattern[(j + shift) % pattern.length]))));
    fc.assert(
      fc.property(base, fc.array(fc.boolean(), { minLength: 1, maxLength: 12 }), (rows, added) => {
        const k = rows[0].length;
        let current = analyzeResponses(rows);
        const p = current.items[0].p;
        expect(current.items.every((item) => Math.abs(item.p - p) < 1e-12)).toBe(true);
        for (const allRight of added) {
          rows = [...rows, Array.from({ length: k }, () => (allRight ? 1 : 0))];
          const next = analyzeResponses(rows);
          if (current.kr20 !== null) {
            expect(next.kr20).not.toBeNull();
            expect(next.kr20 as number).toBeGreaterThanOrEqual(current.kr20 - 1e-12);
            const c = (allRight ? 1 : 0) - current.items[0].p;
            if (Math.abs(c) > 1e-9 && current.kr20 < 1 - 1e-9) expect(next.kr20 as number).toBeGreaterThan(current.kr20);
          }
          current = next;
        }
      }),
      { numRuns: 300 },
    );
  });

  it("any items, partial credit: an examinee scoring every item's mean plus the same amount never lowers KR-20", () => {
    const withExaminee = matrixOf(fraction, 2, 25).chain((rows) => fc.tuple(fc.constant(rows), fc.double({ min: 0, max: 1, noNaN: true })));
    fc.assert(
      fc.property(withExaminee, ([rows, t]) => {
        const before = analyzeResponses(rows);
        fc.pre(before.kr20 !== null);
        const means = before.items.map((item) => item.p);
        // c ranges over [−min p, 1 − max p], so every score stays in [0, 1] (clamped for rounding).
        const c = -Math.min(...means) + t * (1 - Math.max(...means) + Math.min(...means));
        const examinee = means.map((m) => Math.min(1, Math.max(0, m + c)));
        const after = analyzeResponses([...rows, examinee]);
        expect(after.kr20).not.toBeNull();
        expect(after.kr20 as number).toBeGreaterThanOrEqual((before.kr20 as number) - 1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it("items that are exact copies of one item: KR-20 is undefined while all examinees agree and exactly 1 (SEM 0) once one differs", () => {
    const copies = fc
      .record({ k: fc.integer({ min: 2, max: 8 }), column: fc.array(fraction, { minLength: 2, maxLength: 30 }) })
      .map(({ k, column }) => column.map((value) => Array.from({ length: k }, () => value)));
    fc.assert(
      fc.property(copies, (rows) => {
        const result = analyzeResponses(rows);
        const everyoneAgrees = rows.every((row) => row[0] === rows[0][0]);
        if (everyoneAgrees) {
          expect(result.kr20).toBeNull();
        } else {
          expect(result.kr20 as number).toBeCloseTo(1, 12);
          expect(result.sem as number).toBeCloseTo(0, 6);
        }
      }),
      { numRuns: 200 },
    );
  });
});

function expectNoNaN(value: unknown, path = "result") {
  if (typeof value === "number") expect(Number.isNaN(value), `${path} is NaN`).toBe(false);
  else if (Array.isArray(value)) value.forEach((v, i) => expectNoNaN(v, `${path}[${i}]`));
  else if (value && typeof value === "object") for (const [key, v] of Object.entries(value)) expectNoNaN(v, `${path}.${key}`);
}

describe("statistics stay in their ranges", () => {
  it("a point-biserial (plain or corrected) lies in [−1, 1]; so do D; p lies in [0, 1]; population KR-20 ≤ 1; nothing is NaN", () => {
    fc.assert(
      fc.property(matrixOf(fraction), fc.constantFrom("population" as const, "sample" as const), (rows, kind) => {
        const result = analyzeResponses(rows, { variance: kind });
        expectNoNaN(result);
        for (const item of result.items) {
          for (const r of [item.pointBiserial, item.correctedPointBiserial, item.discrimination]) {
            if (r !== null) {
              expect(r).toBeGreaterThanOrEqual(-1);
              expect(r).toBeLessThanOrEqual(1);
            }
          }
          expect(item.p).toBeGreaterThanOrEqual(0);
          expect(item.p).toBeLessThanOrEqual(1);
        }
        // Cauchy–Schwarz: the variance of the total is at most K times the sum of item variances.
        if (kind === "population" && result.kr20 !== null) expect(result.kr20).toBeLessThanOrEqual(1 + 1e-12);
      }),
      { numRuns: 400 },
    );
  });
});

describe("the order of examinees changes nothing", () => {
  it("permuting the examinees gives a deep-equal analysis, with either variance kind (ties at the group edges included)", () => {
    const case_ = matrixOf(fraction, 0, 40).chain((rows) => fc.tuple(fc.constant(rows), permutationOf(rows)));
    fc.assert(
      fc.property(case_, fc.constantFrom("population" as const, "sample" as const), ([rows, permuted], kind) => {
        const a: ResponseAnalysis = analyzeResponses(rows, { variance: kind });
        const b: ResponseAnalysis = analyzeResponses(permuted, { variance: kind });
        expect(b).toEqual(a);
      }),
      { numRuns: 400 },
    );
  });

  it("swapping two examinees swaps their group weights and nothing else", () => {
    const totals = fc.array(fc.integer({ min: 0, max: 6 }), { minLength: 2, maxLength: 40 });
    const case_ = totals.chain((t) => fc.tuple(fc.constant(t), fc.nat({ max: t.length - 1 }), fc.nat({ max: t.length - 1 })));
    fc.assert(
      fc.property(case_, ([t, i, j]) => {
        const swapped = [...t];
        [swapped[i], swapped[j]] = [swapped[j], swapped[i]];
        const a = extremeGroups(t);
        const b = extremeGroups(swapped);
        const swap = (w: number[]) => {
          const s = [...w];
          [s[i], s[j]] = [s[j], s[i]];
          return s;
        };
        expect(b).toEqual({ size: a.size, upper: swap(a.upper), lower: swap(a.lower) });
        // Each group weighs n examinees in all.
        expect(a.upper.reduce((x, y) => x + y, 0)).toBeCloseTo(a.size, 12);
        expect(a.lower.reduce((x, y) => x + y, 0)).toBeCloseTo(a.size, 12);
      }),
      { numRuns: 300 },
    );
  });
});

describe("Angoff properties", () => {
  const ratings = fc
    .record({ judges: fc.integer({ min: 1, max: 12 }), items: fc.integer({ min: 1, max: 40 }) })
    .chain(({ judges, items }) => fc.array(fc.array(fc.oneof(fraction, fc.double({ min: 0, max: 1, noNaN: true })), { minLength: items, maxLength: items }), { minLength: judges, maxLength: judges }));

  it("the panel's cut lies between the lowest and the highest judge's cut, and within 0 to 100 %", () => {
    fc.assert(
      fc.property(ratings, (rows) => {
        const result = angoffCut(rows);
        expect(result.cut).toBeGreaterThanOrEqual(Math.min(...result.judgeCuts));
        expect(result.cut).toBeLessThanOrEqual(Math.max(...result.judgeCuts));
        expect(result.cutPercent).toBeGreaterThanOrEqual(0);
        expect(result.cutPercent).toBeLessThanOrEqual(100);
      }),
      { numRuns: 400 },
    );
  });

  it("the order of judges does not change the panel's cut", () => {
    fc.assert(
      fc.property(
        ratings.chain((rows) => fc.tuple(fc.constant(rows), permutationOf(rows))),
        ([rows, permuted]) => {
          const a = angoffCut(rows);
          const b = angoffCut(permuted);
          expect(b.cut).toBe(a.cut);
          expect(b.sd).toBe(a.sd);
          expect([...b.judgeCuts].sort((x, y) => x - y)).toEqual([...a.judgeCuts].sort((x, y) => x - y));
        },
      ),
      { numRuns: 200 },
    );
  });

  it("the order of a form's items does not change its cut", () => {
    const bank = fc
      .record({ items: fc.integer({ min: 1, max: 15 }), judges: fc.integer({ min: 1, max: 5 }) })
      .chain(({ items, judges }) =>
        fc.array(fc.array(fraction, { minLength: judges, maxLength: judges }), { minLength: items, maxLength: items }).map((table) =>
          Object.fromEntries(table.map((row, i) => [`item-${i}`, Object.fromEntries(row.map((v, j) => [`judge-${j}`, v]))])),
        ),
      );
    fc.assert(
      fc.property(
        bank.chain((b) => fc.tuple(fc.constant(b), permutationOf(Object.keys(b)))),
        ([b, order]) => {
          expect(angoffCutForForm(b, order).cut).toBe(angoffCutForForm(b, Object.keys(b)).cut);
        },
      ),
      { numRuns: 200 },
    );
  });
});
