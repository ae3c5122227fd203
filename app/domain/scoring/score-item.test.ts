import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { gradeResponse, type Key, type Response } from "~/domain/bank/present";
import { ALL_OR_NOTHING_POLICY, orderingFraction, scoreItem, type ScoringPolicy } from "./index";

const PARTIAL: ScoringPolicy = { multiple: "partial", ordering: "partial" };
const POLICIES: [string, ScoringPolicy][] = [
  ["all-or-nothing", ALL_OR_NOTHING_POLICY],
  ["partial", PARTIAL],
];

const single: Key = { kind: "single", correct: 2, text: "c" };
const numeric: Key = { kind: "numeric", answer: 33.3, tolerance: 0.1, unit: "mL/cmH2O", text: "33.3 mL/cmH2O (± 0.1)" };
const wave: Key = { kind: "waveform-point", fromS: 4.9, toS: 5.1, text: "between 4.9 s and 5.1 s" };
const multiple = (correct: number[]): Key => ({ kind: "multiple", correct, text: "" });
const ordering = (n: number): Key => ({ kind: "ordering", order: Array.from({ length: n }, (_, i) => i), text: "" });
const choose = (...choices: number[]): Response => ({ kind: "multiple", choices });
const arrange = (...order: number[]): Response => ({ kind: "ordering", order });

describe("items scored the same under every policy", () => {
  // Single best answer, numeric and waveform point have no partial credit (PRODUCT.md item types).
  it.each(POLICIES)("%s: single best answer, numeric within tolerance, waveform point inside the window", (_, policy) => {
    expect(scoreItem(single, { kind: "single", choice: 2 }, policy)).toBe(1);
    expect(scoreItem(single, { kind: "single", choice: 0 }, policy)).toBe(0);
    // 33.4 − 33.3 is 0.10000000000000142 in binary: only the 1e-9 slack lets an answer exactly
    // at the tolerance pass (the same slack as gradeResponse in present.ts).
    expect(33.4 - 33.3).toBeGreaterThan(0.1);
    expect(scoreItem(numeric, { kind: "numeric", value: 33.4 }, policy)).toBe(1);
    expect(scoreItem(numeric, { kind: "numeric", value: 33.2 }, policy)).toBe(1);
    expect(scoreItem(numeric, { kind: "numeric", value: 33.41 }, policy)).toBe(0);
    expect(scoreItem(numeric, { kind: "numeric", value: Number.NaN }, policy)).toBe(0);
    expect(scoreItem(numeric, { kind: "numeric", value: Number.POSITIVE_INFINITY }, policy)).toBe(0);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: 4.9 }, policy)).toBe(1);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: 5.1 }, policy)).toBe(1);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: 5.0 }, policy)).toBe(1);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: 4.89 }, policy)).toBe(0);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: 5.11 }, policy)).toBe(0);
    expect(scoreItem(wave, { kind: "waveform-point", timeS: Number.NaN }, policy)).toBe(0);
  });

  const everyKey: Key[] = [single, multiple([0, 2]), numeric, ordering(4), wave];
  const rightAnswers: Response[] = [{ kind: "single", choice: 2 }, choose(0, 2), { kind: "numeric", value: 33.3 }, arrange(0, 1, 2, 3), { kind: "waveform-point", timeS: 5 }];

  it.each(POLICIES)("%s: no answer scores 0, a response of another kind scores 0, the right answer scores 1", (_, policy) => {
    everyKey.forEach((key, i) => {
      expect(scoreItem(key, null, policy)).toBe(0);
      expect(scoreItem(key, rightAnswers[i], policy)).toBe(1);
      rightAnswers.forEach((r, j) => {
        if (j !== i) expect(scoreItem(key, r, policy), `${key.kind} answered as ${r.kind}`).toBe(0);
      });
    });
  });
});

describe("multiple response", () => {
  // All or nothing: the set ticked must be the keyed set (common practice, no source).
  it.each([
    ["exact set, any order", [0, 2], [2, 0], 1],
    ["the same box sent twice is one tick", [0, 2], [0, 2, 2], 1],
    ["one keyed option missing", [0, 2], [0], 0],
    ["one extra option", [0, 2], [0, 1, 2], 0],
    ["nothing ticked", [0, 2], [], 0],
  ] as const)("all or nothing — %s", (_, correct, choices, expected) => {
    expect(scoreItem(multiple([...correct]), choose(...choices), ALL_OR_NOTHING_POLICY)).toBe(expected);
  });

  // Plus/minus: +1 per keyed option ticked, −1 per other option ticked, never below 0, over the
  // number of keyed options. NCSBN, "What are the current scoring models?" (NCSBN help centre,
  // NCLEX "+/- scoring" of select-all-that-apply items); Betts J, Muntean W, Kim D, Kao S,
  // Educ Psychol Meas 2022;82(1):151–176 (the plus/minus method).
  it.each([
    // NCSBN's +/- illustration: all four keyed options ticked plus two incorrect ones → 2 of 4 points.
    ["four keyed, all four and two wrong ticked (NCSBN +/- illustration: 2 of 4)", [0, 1, 2, 3], [0, 1, 2, 3, 4, 5], 0.5],
    ["four keyed, three right and one wrong: (3 − 1)/4", [0, 1, 2, 3], [0, 1, 2, 6], 0.5],
    ["three keyed, two right: 2/3", [1, 3, 5], [1, 5], 2 / 3],
    ["three keyed, one right: 1/3", [1, 3, 5], [3], 1 / 3],
    ["two keyed of four options, all four ticked: (2 − 2)/2 = 0, ticking everything earns nothing", [0, 2], [0, 1, 2, 3], 0],
    ["two keyed, one right and two wrong: floored at 0, never negative", [0, 2], [0, 1, 3], 0],
    ["only wrong ticks", [0, 2], [1, 3], 0],
    ["exact set", [0, 2], [2, 0], 1],
    ["an id that is not an option counts as a wrong tick", [0, 2], [0, 2, 99], 0.5],
  ] as const)("partial — %s", (_, correct, choices, expected) => {
    expect(scoreItem(multiple([...correct]), choose(...choices), PARTIAL)).toBeCloseTo(expected, 12);
  });

  it("partial credit stays within 0 and 1, and is 1 exactly when the all-or-nothing score is", () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 0, max: 7 }), { minLength: 1 }), fc.array(fc.integer({ min: 0, max: 9 })), (correct, choices) => {
        const key = multiple([...correct].sort((a, b) => a - b));
        const partial = scoreItem(key, choose(...choices), PARTIAL);
        const whole = scoreItem(key, choose(...choices), ALL_OR_NOTHING_POLICY);
        expect(partial).toBeGreaterThanOrEqual(0);
        expect(partial).toBeLessThanOrEqual(1);
        expect(partial === 1).toBe(whole === 1);
      }),
    );
  });
});

describe("ordering", () => {
  it.each([
    ["the key's order", 4, [0, 1, 2, 3], 1],
    ["one adjacent swap", 4, [1, 0, 2, 3], 0],
    ["fully reversed", 4, [3, 2, 1, 0], 0],
  ] as const)("exact — %s", (_, n, order, expected) => {
    expect(scoreItem(ordering(n), arrange(...order), ALL_OR_NOTHING_POLICY)).toBe(expected);
  });

  // Kendall's τ = (concordant − discordant)/(n(n − 1)/2), floored at 0 (Kendall MG, "A new measure
  // of rank correlation", Biometrika 1938;30(1–2):81–93); the pair counts below are worked by hand.
  it.each([
    ["the key's order: τ = 1", 4, [0, 1, 2, 3], 1],
    ["fully reversed: τ = −1, floored to 0", 4, [3, 2, 1, 0], 0],
    ["fully reversed, eight steps", 8, [7, 6, 5, 4, 3, 2, 1, 0], 0],
    ["four steps, one adjacent swap: 5 concordant, 1 discordant → 4/6", 4, [1, 0, 2, 3], 2 / 3],
    ["five steps, one adjacent swap: 9 and 1 → 8/10", 5, [0, 1, 3, 2, 4], 0.8],
    ["three steps, one adjacent swap: 2 and 1 → 1/3", 3, [0, 2, 1], 1 / 3],
    ["four steps, first and last exchanged: 1 and 5 → 0", 4, [3, 1, 2, 0], 0],
    ["six steps, the last step first: 10 and 5 → 5/15", 6, [5, 0, 1, 2, 3, 4], 1 / 3],
  ] as const)("partial — %s", (_, n, order, expected) => {
    expect(scoreItem(ordering(n), arrange(...order), PARTIAL)).toBeCloseTo(expected, 12);
  });

  it.each([
    ["a step missing", [0, 1, 2]],
    ["a step twice", [0, 1, 1, 3]],
    ["an unknown step", [0, 1, 2, 9]],
    ["an extra step", [0, 1, 2, 3, 4]],
  ])("a response that is not every step once (%s) scores 0 under both policies", (_, order) => {
    expect(scoreItem(ordering(4), arrange(...order), PARTIAL)).toBe(0);
    expect(scoreItem(ordering(4), arrange(...order), ALL_OR_NOTHING_POLICY)).toBe(0);
  });

  /** Adjacent swaps bubble sort makes to put `order` back in the key's order. */
  function bubbleSwaps(order: number[]): number {
    const a = [...order];
    let swaps = 0;
    for (let pass = 0; pass < a.length; pass++) {
      for (let i = 0; i + 1 < a.length; i++) {
        if (a[i] > a[i + 1]) {
          [a[i], a[i + 1]] = [a[i + 1], a[i]];
          swaps += 1;
        }
      }
    }
    return swaps;
  }

  it("partial credit agrees with τ computed another way: discordant pairs = bubble-sort swaps", () => {
    // Each adjacent exchange of bubble sort removes exactly one inversion, so the swaps counted
    // equal the discordant pairs (Knuth DE, The Art of Computer Programming vol. 3, §5.2.2; from memory).
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 8 }).chain((n) => fc.shuffledSubarray(Array.from({ length: n }, (_, i) => i), { minLength: n, maxLength: n })),
        (order) => {
          const n = order.length;
          const tau = 1 - (4 * bubbleSwaps(order)) / (n * (n - 1));
          const keyOrder = Array.from({ length: n }, (_, i) => i);
          expect(orderingFraction(keyOrder, order)).toBeCloseTo(Math.max(0, tau), 12);
        },
      ),
    );
  });
});

describe("agreement with the bank's all-or-nothing grader", () => {
  const keyAndResponse = fc.oneof(
    fc.record({ correct: fc.integer({ min: 0, max: 5 }), choice: fc.integer({ min: 0, max: 5 }) }).map(({ correct, choice }): [Key, Response] => [
      { kind: "single", correct, text: "" },
      { kind: "single", choice },
    ]),
    fc
      .record({ correct: fc.uniqueArray(fc.integer({ min: 0, max: 5 }), { minLength: 1 }), choices: fc.uniqueArray(fc.integer({ min: 0, max: 5 })) })
      .map(({ correct, choices }): [Key, Response] => [multiple([...correct].sort((a, b) => a - b)), choose(...choices)]),
    fc
      .record({ answer: fc.double({ min: -1000, max: 1000, noNaN: true }), tolerance: fc.double({ min: 0, max: 10, noNaN: true }), value: fc.double({ noNaN: false }) })
      .map(({ answer, tolerance, value }): [Key, Response] => [{ kind: "numeric", answer, tolerance, unit: "mL", text: "" }, { kind: "numeric", value }]),
    fc
      .integer({ min: 3, max: 8 })
      .chain((n) => fc.shuffledSubarray(Array.from({ length: n }, (_, i) => i), { minLength: n, maxLength: n }))
      .map((order): [Key, Response] => [ordering(order.length), arrange(...order)]),
    fc
      .record({ fromS: fc.double({ min: 0, max: 10, noNaN: true }), width: fc.double({ min: 0.01, max: 2, noNaN: true }), timeS: fc.double({ min: -1, max: 13, noNaN: true }) })
      .map(({ fromS, width, timeS }): [Key, Response] => [{ kind: "waveform-point", fromS, toS: fromS + width, text: "" }, { kind: "waveform-point", timeS }]),
  );

  it("under the all-or-nothing policy scoreItem is 1 exactly when gradeResponse says right", () => {
    fc.assert(
      fc.property(keyAndResponse, ([key, response]) => {
        expect(scoreItem(key, response, ALL_OR_NOTHING_POLICY)).toBe(gradeResponse(key, response) ? 1 : 0);
      }),
      { numRuns: 500 },
    );
  });
});
