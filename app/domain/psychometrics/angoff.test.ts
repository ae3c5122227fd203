import { describe, expect, it } from "vitest";
import { angoffCut, angoffCutForForm } from "./index";

// Three judges × five items, estimates of the chance that a minimally competent therapist
// answers each item correctly. Expected values worked by hand from the rule in Livingston SA,
// Zieky MJ, "Passing Scores", ETS 1982: a judge's cut is the sum of their estimates, the
// panel's cut the mean of the judges' cuts.
const PANEL = [
  [0.6, 0.7, 0.8, 0.5, 0.9], // 3.5
  [0.5, 0.6, 0.9, 0.4, 0.8], // 3.2
  [0.7, 0.8, 0.7, 0.6, 1.0], // 3.8
];

describe("angoffCut (Livingston & Zieky, 'Passing Scores', ETS 1982)", () => {
  const result = angoffCut(PANEL);

  it("each judge's cut is the sum of their estimates", () => {
    expect(result.judgeCuts).toEqual([expect.closeTo(3.5, 12), expect.closeTo(3.2, 12), expect.closeTo(3.8, 12)]);
  });

  it("the panel's cut is the mean of the judges' cuts: 3.5 of 5 items, 70 %", () => {
    expect(result.cut).toBeCloseTo(3.5, 12);
    expect(result.cutPercent).toBeCloseTo(70, 10);
    expect(result.judges).toBe(3);
    expect(result.itemCount).toBe(5);
  });

  it("reports the spread of the judges' cuts with its divisor declared", () => {
    expect(result.min).toBeCloseTo(3.2, 12);
    expect(result.max).toBeCloseTo(3.8, 12);
    expect(result.varianceKind).toBe("population");
    expect(result.sd).toBeCloseTo(Math.sqrt(0.06), 12); // deviations 0, −0.3, +0.3 over N = 3
    expect(angoffCut(PANEL, { variance: "sample" }).sd).toBeCloseTo(0.3, 12); // over N − 1 = 2
    expect(angoffCut([PANEL[0]], { variance: "sample" }).sd).toBeNull();
  });

  it("gives the panel's mean estimate per item", () => {
    expect(result.itemMeans).toEqual([0.6, 0.7, 0.8, 0.5, 0.9].map((m) => expect.closeTo(m, 12)));
  });

  it("keeps the panel's cut inside the judges' range when binary rounding would push it out (three judges at 0.1)", () => {
    const cut = angoffCut([[0.1], [0.1], [0.1]]);
    expect(cut.cut).toBe(0.1);
    expect(cut.sd).toBe(0);
  });
});

describe("angoffCut refuses bad ratings with a specific message", () => {
  it.each([
    ["no judges", [], "There are no judges' ratings: an Angoff cut needs at least one judge."],
    ["no items", [[], []], "The judges rated no items: an Angoff cut needs at least one item."],
    [
      "a judge who skipped an item",
      [
        [0.5, 0.5, 0.5],
        [0.5, 0.5],
      ],
      "Judge row 1 rated 2 items but row 0 rated 3; every judge must rate every item.",
    ],
    [
      "an estimate above 1 (a percentage typed as a number)",
      [
        [0.5, 0.5],
        [0.5, 70],
      ],
      "Rating [1][1] is 70; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1.",
    ],
    ["a negative estimate", [[-0.1]], "Rating [0][0] is -0.1; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1."],
    ["a missing estimate", [[Number.NaN]], "Rating [0][0] is NaN; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1."],
  ])("%s", (_, ratings, message) => {
    expect(() => angoffCut(ratings)).toThrow(new RangeError(message));
  });
});

// Ratings kept per bank item (item id → judge id → estimate). Each random form drawn from the
// bank has its own Angoff cut (Coscarelli et al., 2006): the judges' estimates for the items on
// that form. Expected values worked by hand.
const BANK: Record<string, Record<string, number>> = {
  q1: { j1: 0.6, j2: 0.5, j3: 0.7 },
  q2: { j1: 0.7, j2: 0.6, j3: 0.8 },
  q3: { j1: 0.8, j2: 0.9, j3: 0.7 },
  q4: { j1: 0.5, j2: 0.4, j3: 0.6 },
  q5: { j1: 0.9, j2: 0.8 }, // j3 did not rate q5
  q6: {},
};

describe("angoffCutForForm: the cut of the form actually drawn (Coscarelli et al., 2006)", () => {
  it("sums each judge's estimates over the form's items and averages the judges", () => {
    const form = angoffCutForForm(BANK, ["q3", "q1", "q2"]);
    // j1 0.8 + 0.6 + 0.7 = 2.1; j2 0.9 + 0.5 + 0.6 = 2.0; j3 0.7 + 0.7 + 0.8 = 2.2 → mean 2.1 of 3.
    expect(form.judgeIds).toEqual(["j1", "j2", "j3"]);
    expect(form.panel?.judgeCuts).toEqual([expect.closeTo(2.1, 12), expect.closeTo(2.0, 12), expect.closeTo(2.2, 12)]);
    expect(form.cut).toBeCloseTo(2.1, 12);
    expect(form.cutPercent).toBeCloseTo(70, 10);
    expect(form.unratedItemIds).toEqual([]);
    expect(form.excludedJudgeIds).toEqual([]);
    expect(form.reason).toBeNull();
  });

  it("two forms from the same bank get different cuts", () => {
    const easier = angoffCutForForm(BANK, ["q3", "q2"]); // 1.5, 1.5, 1.5 → 1.5 of 2, 75 %
    const harder = angoffCutForForm(BANK, ["q4", "q1"]); // 1.1, 0.9, 1.3 → 1.1 of 2, 55 %
    expect(easier.cutPercent).toBeCloseTo(75, 10);
    expect(harder.cutPercent).toBeCloseTo(55, 10);
  });

  it("leaves out of the form's panel a judge who skipped one of its items, and says so", () => {
    const form = angoffCutForForm(BANK, ["q5", "q4"]);
    // j1 0.9 + 0.5 = 1.4; j2 0.8 + 0.4 = 1.2 → 1.3; j3 has no estimate for q5.
    expect(form.judgeIds).toEqual(["j1", "j2"]);
    expect(form.excludedJudgeIds).toEqual(["j3"]);
    expect(form.cut).toBeCloseTo(1.3, 12);
  });

  it("gives no cut when an item of the form has no ratings at all, and lists the unrated items", () => {
    const form = angoffCutForForm(BANK, ["q1", "q6", "q7"]);
    expect(form).toMatchObject({
      formItemIds: ["q1", "q6", "q7"],
      unratedItemIds: ["q6", "q7"],
      panel: null,
      cut: null,
      cutPercent: null,
      reason: "2 items of this form have no Angoff ratings, so the form has no Angoff cut until they are rated.",
    });
    expect(angoffCutForForm(BANK, ["q6"]).reason).toBe("1 item of this form has no Angoff ratings, so the form has no Angoff cut until it is rated.");
  });

  it("gives no cut when every item is rated by someone but no judge rated them all", () => {
    const form = angoffCutForForm({ a: { j1: 0.5 }, b: { j2: 0.5 } }, ["a", "b"]);
    expect(form).toMatchObject({ judgeIds: [], excludedJudgeIds: ["j1", "j2"], cut: null, reason: "No judge rated every item of this form, so no judge has a cut for it." });
  });

  it("reads ratings from a Map as from a plain object", () => {
    const asMap = new Map(Object.entries(BANK).map(([item, byJudge]) => [item, new Map(Object.entries(byJudge))]));
    expect(angoffCutForForm(asMap, ["q3", "q1", "q2"])).toEqual(angoffCutForForm(BANK, ["q3", "q1", "q2"]));
  });

  it("treats an item id that is also an object property name as an ordinary, unrated id", () => {
    expect(angoffCutForForm(BANK, ["q1", "constructor"]).unratedItemIds).toEqual(["constructor"]);
  });

  it("refuses an empty form, an item listed twice, and an estimate outside 0 to 1", () => {
    expect(() => angoffCutForForm(BANK, [])).toThrow(new RangeError("The form has no items, so it has no Angoff cut."));
    expect(() => angoffCutForForm(BANK, ["q1", "q1"])).toThrow(new RangeError('Item "q1" is on the form twice; a form lists each item once.'));
    expect(() => angoffCutForForm({ q1: { j1: 1.2 } }, ["q1"])).toThrow(
      new RangeError('Judge "j1"\'s rating of item "q1" is 1.2; a rating is the chance that a minimally competent candidate answers the item correctly, from 0 to 1.'),
    );
  });
});
