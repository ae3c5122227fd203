// Item analysis over forms (same or randomly drawn): checked against Wuensch's published data
// (Wuensch KL, "The Kuder-Richardson 20", East Carolina University StatHelp, KR20.txt) and against
// simple-statistics 7 (npm; `variance` divides by N, `sampleCorrelation` is Pearson's r), which
// shares no code with ours.
import * as ss from "simple-statistics";
import { describe, expect, it } from "vitest";
import { analyzeForms, FLAG_THRESHOLDS, itemFlags, type ExamineeForm } from "./form-analysis";
import { analyzeResponses } from "./item-analysis";

const WUENSCH = ["1111110110", "1011011101", "1111011001", "0010001000", "0000010010", "1110111111", "1101110111", "1111111101", "0101111101", "1101101110"].map((row) =>
  [...row].map(Number),
);
const ids = Array.from({ length: 10 }, (_, j) => `item-${j + 1}`);

/** Each examinee's form, items listed in a different order per examinee (as a shuffled form). */
const asForms = (rows: number[][]): ExamineeForm[] =>
  rows.map((row, i) => ({ items: row.map((score, j) => ({ itemId: ids[j], score })).sort((a, b) => ((a.itemId.length * 7 + i) % 3) - ((b.itemId.length * 7 + i) % 3) || (a.itemId < b.itemId ? 1 : -1)) }));

function near(actual: number | null, expected: number, tolerance = 1e-9) {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(tolerance);
}

describe("the same form for everyone (Wuensch's ten students × ten items)", () => {
  const forms = analyzeForms(asForms(WUENSCH));
  const plain = analyzeResponses(WUENSCH);

  it("is recognised as one form whatever the order items were asked in", () => {
    expect(forms.method).toBe("same-form");
    expect(forms.formLength).toBe(10);
  });

  it("gives Wuensch's published values: mean 6.6, population variance 5.84, KR-20 0.6963, KR-21 0.6842", () => {
    near(forms.mean, 6.6);
    near(forms.variance, 5.84);
    near(forms.kr20, 0.6963, 5e-5);
    near(forms.kr21, 0.6842, 5e-5);
  });

  it("matches the plain module item by item (item 1: p 0.7, point-biserial 0.7946, corrected 0.7059)", () => {
    const first = forms.items.find((i) => i.itemId === "item-1")!;
    near(first.p, 0.7);
    near(first.pointBiserial, 0.7946, 5e-5);
    near(first.correctedPointBiserial, 0.7059, 5e-5);
    for (const item of forms.items) {
      const j = ids.indexOf(item.itemId);
      expect(item.p).toBe(plain.items[j].p);
      expect(item.discrimination).toBe(plain.items[j].discrimination);
      expect(item.seenBy).toBe(10);
    }
  });
});

describe("random forms (not everyone sees every item)", () => {
  // Six examinees, forms of three items drawn from five. Totals: 3, 2, 2, 1, 1, 0.
  const examinees: ExamineeForm[] = [
    { items: [{ itemId: "a", score: 1 }, { itemId: "b", score: 1 }, { itemId: "c", score: 1 }] },
    { items: [{ itemId: "a", score: 1 }, { itemId: "d", score: 1 }, { itemId: "e", score: 0 }] },
    { items: [{ itemId: "b", score: 1 }, { itemId: "c", score: 0 }, { itemId: "e", score: 1 }] },
    { items: [{ itemId: "a", score: 0 }, { itemId: "c", score: 1 }, { itemId: "d", score: 0 }] },
    { items: [{ itemId: "b", score: 0 }, { itemId: "d", score: 1 }, { itemId: "e", score: 0 }] },
    { items: [{ itemId: "a", score: 0 }, { itemId: "b", score: 0 }, { itemId: "e", score: 0 }] },
  ];
  const r = analyzeForms(examinees);
  const totals = [3, 2, 2, 1, 1, 0];

  it("analyses each item over the examinees who saw it, against their own totals", () => {
    expect(r.method).toBe("random-forms");
    const a = r.items.find((i) => i.itemId === "a")!;
    // Item a was seen by examinees 1, 2, 4 and 6 (scores 1, 1, 0, 0; totals 3, 2, 1, 0).
    expect(a.seenBy).toBe(4);
    near(a.p, 0.5);
    near(a.pointBiserial, ss.sampleCorrelation([1, 1, 0, 0], [3, 2, 1, 0]), 1e-12);
    near(a.correctedPointBiserial, ss.sampleCorrelation([1, 1, 0, 0], [2, 1, 1, 0]), 1e-12);
    // 27 % of 4 is 1.08 → groups of 1: the top (total 3) got it right, the bottom (0) wrong.
    expect(a.groupSize).toBe(1);
    near(a.discrimination, 1);
  });

  it("takes mean, variance and KR-21 from the totals (K = 3), and KR-20 from the average form's Σpq", () => {
    near(r.mean, ss.mean(totals), 1e-12);
    near(r.variance, ss.variance(totals), 1e-12);
    const k = 3;
    const m = ss.mean(totals);
    const v = ss.variance(totals);
    near(r.kr21, (k / (k - 1)) * (1 - (m * (k - m)) / (k * v)), 1e-12);
    const itemVar = new Map(r.items.map((i) => [i.itemId, ss.variance(examinees.flatMap((e) => e.items.filter((x) => x.itemId === i.itemId).map((x) => x.score)))]));
    const averageSum = ss.mean(examinees.map((e) => ss.sum(e.items.map((x) => itemVar.get(x.itemId)!))));
    near(r.kr20, (k / (k - 1)) * (1 - averageSum / v), 1e-12);
    near(r.sem, Math.sqrt(v) * Math.sqrt(1 - (r.kr20 as number)), 1e-12);
  });

  it("refuses an item asked twice on one form, and scores outside 0…1, with a clear message", () => {
    expect(() => analyzeForms([{ items: [{ itemId: "a", score: 1 }, { itemId: "a", score: 0 }] }])).toThrow(/item a twice/);
    expect(() => analyzeForms([{ items: [{ itemId: "a", score: 2 }] }])).toThrow(/from 0 to 1/);
  });

  it("says nothing about reliability when forms differ in length", () => {
    const uneven = analyzeForms([{ items: [{ itemId: "a", score: 1 }] }, { items: [{ itemId: "b", score: 0 }, { itemId: "c", score: 1 }] }]);
    expect(uneven.formLength).toBeNull();
    expect([uneven.kr20, uneven.kr21, uneven.sem]).toEqual([null, null, null]);
  });
});

describe("flags (thresholds: common practice, no source)", () => {
  const base = { p: 0.6, correctedPointBiserial: 0.35 };
  it("flags nothing for a middling, discriminating item", () => {
    expect(itemFlags(base, 0, 16)).toEqual([]);
  });
  it("flags p above 0.90 and below 0.30, but not at the thresholds themselves", () => {
    expect(itemFlags({ ...base, p: 0.91 }, 0, 4)).toEqual(["too-easy"]);
    expect(itemFlags({ ...base, p: FLAG_THRESHOLDS.tooEasyAbove }, 0, 4)).toEqual([]);
    expect(itemFlags({ ...base, p: 0.29 }, 0, 30)).toEqual(["too-hard"]);
    expect(itemFlags({ ...base, p: FLAG_THRESHOLDS.tooHardBelow }, 0, 30)).toEqual([]);
  });
  it("calls a corrected r below 0.20 weak and below 0 negative (one or the other)", () => {
    expect(itemFlags({ ...base, correctedPointBiserial: 0.19 }, 0, 16)).toEqual(["weak-discrimination"]);
    expect(itemFlags({ ...base, correctedPointBiserial: -0.05 }, 0, 16)).toEqual(["negative-discrimination"]);
    expect(itemFlags({ ...base, correctedPointBiserial: null }, 0, 16)).toEqual([]);
  });
  it("flags an option nobody chose once at least 10 answered the item wrong, not before", () => {
    expect(itemFlags(base, 1, 10)).toEqual(["unused-option"]);
    expect(itemFlags(base, 1, 9)).toEqual([]);
  });
});
