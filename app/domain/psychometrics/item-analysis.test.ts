import { describe, expect, it } from "vitest";
import { analyzeResponses, extremeGroups, extremeGroupSize, GROUP_RULE_TEXT } from "./index";

// Wuensch KL, "The Kuder-Richardson 20", East Carolina University StatHelp (KR20.txt): ten
// students (A–J) × ten items, 1 = correct.
const WUENSCH_ROWS: Record<string, string> = {
  A: "1111110110",
  B: "1011011101",
  C: "1111011001",
  D: "0010001000",
  E: "0000010010",
  F: "1110111111",
  G: "1101110111",
  H: "1111111101",
  I: "0101111101",
  J: "1101101110",
};
const WUENSCH = Object.values(WUENSCH_ROWS).map((row) => [...row].map(Number));

describe("analyzeResponses on Wuensch's KR-20 data set", () => {
  const population = analyzeResponses(WUENSCH);
  const sample = analyzeResponses(WUENSCH, { variance: "sample" });

  it("S1: item p values, mean 6.6, Σpq 2.18, population variance 5.84 (Wuensch, 'The Kuder-Richardson 20', ECU StatHelp, published)", () => {
    expect(population.examinees).toBe(10);
    expect(population.itemCount).toBe(10);
    expect(population.items.map((item) => item.p)).toEqual([0.7, 0.7, 0.6, 0.7, 0.6, 0.8, 0.7, 0.7, 0.5, 0.6].map((p) => expect.closeTo(p, 12)));
    expect(population.mean).toBeCloseTo(6.6, 12);
    expect(population.sumItemVariance).toBeCloseTo(2.18, 12);
    expect(population.varianceKind).toBe("population");
    expect(population.variance).toBeCloseTo(5.84, 12);
    expect(population.sd).toBeCloseTo(Math.sqrt(5.84), 12);
  });

  it("S1: totals 8 7 7 2 2 9 8 9 7 7, shown as the score distribution (Wuensch, published)", () => {
    // Totals by student A–J: 8 7 7 2 2 9 8 9 7 7 → two 2s, four 7s, two 8s, two 9s.
    expect(population.distribution).toEqual([
      { score: 2, count: 2 },
      { score: 7, count: 4 },
      { score: 8, count: 2 },
      { score: 9, count: 2 },
    ]);
  });

  it("S1: each 0/1 item's variance is pq (Kuder & Richardson, Psychometrika 1937)", () => {
    for (const item of population.items) expect(item.variance).toBeCloseTo(item.p * (1 - item.p), 15);
  });

  it("S2: KR-20 0.6963 with the population variance, 0.7378 with N − 1 (computed from Wuensch)", () => {
    expect(population.kr20).toBeCloseTo(0.6963, 4);
    expect(population.kr20).toBeCloseTo((10 / 9) * (1 - 2.18 / 5.84), 12);
    expect(sample.varianceKind).toBe("sample");
    expect(sample.variance).toBeCloseTo((5.84 * 10) / 9, 12);
    expect(sample.kr20).toBeCloseTo(0.7378, 4);
  });

  it("S3: KR-21 0.6842 with the population variance (computed from Wuensch)", () => {
    expect(population.kr21).toBeCloseTo(0.6842, 4);
    expect(population.kr21).toBeCloseTo((10 / 9) * (1 - (6.6 * (10 - 6.6)) / (10 * 5.84)), 12);
  });

  it("S4: item 1 point-biserial 0.7946, corrected 0.7059 (computed from Wuensch; Brown, Shiken 2001; LeBlanc & Cox, TQMP 2017)", () => {
    expect(population.items[0].pointBiserial).toBeCloseTo(0.7946, 4);
    expect(population.items[0].correctedPointBiserial).toBeCloseTo(0.7059, 4);
    // The point-biserial is a Pearson r, so it does not depend on the variance kind.
    expect(sample.items[0].pointBiserial).toBe(population.items[0].pointBiserial);
  });

  it("SEM = SD·√(1 − KR-20) with the declared variance (formula: Lane, Online Statistics Education, glossary)", () => {
    expect(population.sem).toBeCloseTo(Math.sqrt(5.84) * Math.sqrt(1 - (10 / 9) * (1 - 2.18 / 5.84)), 12);
    expect(population.sem).toBeCloseTo(1.3317, 4);
  });

  it("discrimination with the tie rule: item 1 D = 0.75 (worked by hand from Wuensch's data with the rule in extreme-groups.ts)", () => {
    // N = 10 → n = round(2.7) = 3. Top: F 9, H 9, then A and G tie at 8 for one place (½ each).
    // Bottom: D 2, E 2, then B, C, I, J tie at 7 for one place (¼ each).
    // Item 1: upper 1 + 1 + ½(1 + 1) = 3; lower 0 + 0 + ¼(1 + 1 + 0 + 1) = 0.75; D = 2.25 / 3.
    const item = population.items[0];
    expect(item.groupSize).toBe(3);
    expect(item.upperCorrect).toBe(3);
    expect(item.lowerCorrect).toBe(0.75);
    expect(item.discrimination).toBe(0.75);
    expect(population.groups).toEqual({ fraction: 0.27, size: 3, rule: GROUP_RULE_TEXT });
  });
});

describe("S5: discrimination index D", () => {
  it("upper group of 11 with 9 correct, lower group of 11 with 3 correct → D 0.545 (UCLA Teaching, 'Interpretation of Statistics'; 27 % groups: Kelley, via Lopez, Rasch Measurement Transactions 1998;12(1):626)", () => {
    // 40 examinees: examinee i answers 2i of 78 filler items, so totals are 2i or 2i + 1 and the
    // ranking is unambiguous; round(0.27 × 40) = round(10.8) = 11 per group.
    const N = 40;
    const fillers = 78;
    const rows = Array.from({ length: N }, (_, i) => {
      const top = i >= N - 11;
      const bottom = i < 11;
      const item = top ? (i >= N - 9 ? 1 : 0) : bottom ? (i < 3 ? 1 : 0) : 1;
      return [item, ...Array.from({ length: fillers }, (_, f) => (f < 2 * i ? 1 : 0))];
    });
    const item = analyzeResponses(rows).items[0];
    expect(item.groupSize).toBe(11);
    expect(item.upperCorrect).toBe(9);
    expect(item.lowerCorrect).toBe(3);
    expect(item.discrimination).toBeCloseTo(0.545, 3);
    expect(item.discrimination).toBeCloseTo(6 / 11, 15);
  });
});

describe("upper and lower 27 % groups: the rounding rule", () => {
  // The rule is ours (round half up, clamp to [1, ⌊N/2⌋]); Kelley's 27 % itself: Lopez, Rasch
  // Measurement Transactions 1998;12(1):626. Expected sizes worked by hand from the rule.
  it.each([
    [0, 0],
    [1, 0],
    [2, 1],
    [3, 1],
    [5, 1],
    [6, 2],
    [10, 3],
    [38, 10],
    [39, 11],
    [40, 11],
    [42, 11],
    [43, 12],
    [50, 14], // 13.5: a half, rounded up
    [100, 27],
    [150, 41], // 40.5: a half, rounded up
  ])("N = %i → n = %i", (examinees, size) => {
    expect(extremeGroupSize(examinees)).toBe(size);
  });

  it("never lets the groups overlap by size: a fraction of one half on 3 examinees gives 1, not 2", () => {
    expect(extremeGroupSize(3, 0.5)).toBe(1);
  });

  it("refuses an impossible fraction or examinee count", () => {
    expect(() => extremeGroupSize(10, 0.6)).toThrow(new RangeError("The upper and lower group fraction must be above 0 and at most 0.5 (half the examinees), not 0.6."));
    expect(() => extremeGroupSize(10, 0)).toThrow(RangeError);
    expect(() => extremeGroupSize(2.5)).toThrow(new RangeError("The number of examinees must be a whole number of at least 0, not 2.5."));
  });
});

describe("upper and lower groups: the tie rule", () => {
  it("examinees tied at the edge share the places left equally (Wuensch totals, worked by hand)", () => {
    const totals = [8, 7, 7, 2, 2, 9, 8, 9, 7, 7]; // A–J
    const groups = extremeGroups(totals);
    expect(groups.size).toBe(3);
    expect(groups.upper).toEqual([0.5, 0, 0, 0, 0, 1, 0.5, 1, 0, 0]);
    expect(groups.lower).toEqual([0, 0.25, 0.25, 1, 1, 0, 0, 0, 0.25, 0.25]);
  });

  it("a tied block that reaches both edges enters both groups with the same weight, so its answers cancel in D", () => {
    // N = 8 → n = round(2.16) = 2; one place left in each group for six examinees tied at 4.
    const totals = [5, 4, 4, 4, 4, 4, 4, 0];
    const groups = extremeGroups(totals);
    expect(groups.size).toBe(2);
    expect(groups.upper).toEqual([1, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 0]);
    expect(groups.lower).toEqual([0, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 1 / 6, 1]);
  });

  it("totals equal in exact arithmetic tie even when binary rounding separates them (0.1 + 0.2 and 0.3)", () => {
    const groups = extremeGroups([0.1 + 0.2, 0.3, 1, 0]);
    // N = 4 → n = 1: the top place goes to 1, the bottom to 0; the two 0.3s are in neither.
    expect(groups.upper).toEqual([0, 0, 1, 0]);
    // With 3 examinees, n = 1 and the bottom place is shared by the two 0.3s.
    expect(extremeGroups([0.1 + 0.2, 0.3, 1]).lower).toEqual([0.5, 0.5, 0]);
  });

  it("refuses a total that is not a finite number", () => {
    expect(() => extremeGroups([1, Number.NaN])).toThrow(new RangeError("Total scores must be finite numbers: total 1 is NaN."));
  });
});

describe("partial-credit items are analysed on their fraction of the item's points", () => {
  it("KR-20 is coefficient alpha: 6/7 for a worked 3 × 2 example (worked by hand; Cronbach, Psychometrika 1951)", () => {
    // Totals 1.5, 1, 0: variance 7/18. Item variances 1/6 and 1/18: Σ 2/9. 2·(1 − (2/9)/(7/18)) = 6/7.
    const result = analyzeResponses([
      [1, 0.5],
      [0.5, 0.5],
      [0, 0],
    ]);
    expect(result.variance).toBeCloseTo(7 / 18, 15);
    expect(result.sumItemVariance).toBeCloseTo(2 / 9, 15);
    expect(result.kr20).toBeCloseTo(6 / 7, 14);
    expect(result.items.map((item) => item.p)).toEqual([0.5, expect.closeTo(1 / 3, 15)]);
  });

  it("a total made of thirds ties with a whole score in the distribution (1/3 + 2/3 counts as 1)", () => {
    const result = analyzeResponses([
      [1 / 3, 2 / 3],
      [1, 0],
      [0, 0],
    ]);
    expect(result.distribution).toEqual([
      { score: 0, count: 1 },
      { score: 1, count: 2 },
    ]);
  });
});

describe("degenerate cases return null, never NaN", () => {
  it("no examinees", () => {
    expect(analyzeResponses([])).toEqual({
      examinees: 0,
      itemCount: 0,
      varianceKind: "population",
      mean: null,
      variance: null,
      sd: null,
      sumItemVariance: null,
      kr20: null,
      kr21: null,
      sem: null,
      groups: { fraction: 0.27, size: 0, rule: GROUP_RULE_TEXT },
      distribution: [],
      items: [],
    });
  });

  it("one examinee: a mean and a zero population variance, but no sample variance, reliability, correlation or groups", () => {
    const result = analyzeResponses([[1, 0, 1]]);
    expect(result.mean).toBe(2);
    expect(result.variance).toBe(0);
    expect(result.kr20).toBeNull();
    expect(result.kr21).toBeNull();
    expect(result.sem).toBeNull();
    expect(result.items[0]).toEqual({
      index: 0,
      p: 1,
      variance: 0,
      pointBiserial: null,
      correctedPointBiserial: null,
      discrimination: null,
      upperCorrect: null,
      lowerCorrect: null,
      groupSize: 0,
    });
    const sample = analyzeResponses([[1, 0, 1]], { variance: "sample" });
    expect(sample.variance).toBeNull();
    expect(sample.sd).toBeNull();
  });

  it("one item: no KR-20 or KR-21 (K/(K − 1) is undefined), and no corrected point-biserial (nothing left in the total)", () => {
    const result = analyzeResponses([[1], [0], [1]]);
    expect(result.kr20).toBeNull();
    expect(result.kr21).toBeNull();
    expect(result.sem).toBeNull();
    expect(result.items[0].pointBiserial).toBe(1);
    expect(result.items[0].correctedPointBiserial).toBeNull();
  });

  it("everyone has the same total: no reliability, SEM, point-biserial or discrimination", () => {
    const result = analyzeResponses([
      [1, 0],
      [0, 1],
      [1, 0],
    ]);
    expect(result.variance).toBe(0);
    expect(result.kr20).toBeNull();
    expect(result.kr21).toBeNull();
    expect(result.sem).toBeNull();
    for (const item of result.items) {
      expect(item.pointBiserial).toBeNull();
      expect(item.discrimination).toBeNull();
    }
  });

  it("totals equal to a millionth of an item are one score, even when binary rounding leaves them a last bit apart", () => {
    const rows = [
      [0, 3 / 5],
      [1 / 5, 2 / 5],
    ];
    expect(0 / 5 + 3 / 5).not.toBe(1 / 5 + 2 / 5); // 0.6 and 0.6000000000000001
    const result = analyzeResponses(rows);
    expect(result.variance).toBe(0);
    expect(result.kr20).toBeNull();
    expect(result.items[0].pointBiserial).toBeNull();
    expect(result.items[0].discrimination).toBeNull();
    // With the total the same for both, the rest of the test is exactly the item's complement.
    expect(result.items[0].correctedPointBiserial).toBe(-1);
  });

  it("an item everyone got right (or wrong) has no point-biserial; its D is 0", () => {
    const result = analyzeResponses([
      [1, 0, 1],
      [1, 0, 0],
      [1, 0, 1],
      [1, 0, 0],
    ]);
    for (const item of result.items.slice(0, 2)) {
      expect(item.pointBiserial).toBeNull();
      expect(item.correctedPointBiserial).toBeNull();
      expect(item.discrimination).toBe(0);
    }
    expect(result.items[2].pointBiserial).toBe(1);
  });

  it("two identical items: KR-20 exactly 1 and SEM 0 (population); with N − 1 on two examinees KR-20 is 1.5 and SEM is null", () => {
    // Σpq = 0.5 over σ² = 1 (N) or 2 (N − 1): 2·(1 − 0.5) = 1 and 2·(1 − 0.25) = 1.5 — the
    // classical "N − 1" KR-20 keeps Σpq with divisor N and can exceed 1 in tiny groups.
    const rows = [
      [1, 1],
      [0, 0],
    ];
    expect(analyzeResponses(rows)).toMatchObject({ kr20: 1, sem: 0 });
    expect(analyzeResponses(rows, { variance: "sample" })).toMatchObject({ kr20: 1.5, sem: null });
  });
});

describe("bad input is refused with a specific message", () => {
  it.each([
    [
      "a ragged row",
      [
        [1, 0, 1],
        [1, 0],
      ],
      "Examinee row 1 has 2 item scores but row 0 has 3; every examinee needs a score on every item.",
    ],
    [
      "a score above 1",
      [
        [1, 0],
        [1.5, 0],
      ],
      "Score [1][0] is 1.5; each score is the fraction of the item's points earned, from 0 to 1.",
    ],
    ["a negative score", [[0, -0.25]], "Score [0][1] is -0.25; each score is the fraction of the item's points earned, from 0 to 1."],
    ["a missing score", [[Number.NaN]], "Score [0][0] is NaN; each score is the fraction of the item's points earned, from 0 to 1."],
  ])("%s", (_, scores, message) => {
    expect(() => analyzeResponses(scores)).toThrow(new RangeError(message));
  });

  it("an unknown variance kind", () => {
    // @ts-expect-error — a caller outside TypeScript (a query string) could pass anything.
    expect(() => analyzeResponses([[1]], { variance: "unbiased" })).toThrow(
      new RangeError('The variance must be "population" (divide by N) or "sample" (divide by N − 1), not "unbiased".'),
    );
  });
});
