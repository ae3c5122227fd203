import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { itemContent, TOPIC_SLUGS, type ItemContent } from "~/domain/bank/item-content";
import { presentItem, type Key, type Response } from "~/domain/bank/present";
import { ALL_OR_NOTHING_POLICY, scoreAttempt, type GradedItemInput, type ScoringPolicy } from "./index";

const PARTIAL: ScoringPolicy = { multiple: "partial", ordering: "partial" };
const singleKey = (correct: number): Key => ({ kind: "single", correct, text: "" });
const right = (position: number, topics = ["modes"], points?: number): GradedItemInput => ({ position, key: singleKey(1), response: { kind: "single", choice: 1 }, topics, points });
const wrong = (position: number, topics = ["modes"], points?: number): GradedItemInput => ({ position, key: singleKey(1), response: { kind: "single", choice: 0 }, topics, points });
const positions = (from: number, count: number) => Array.from({ length: count }, (_, i) => from + i);

describe("scoreAttempt: pass mark", () => {
  // At or above the pass mark passes (common practice, no source).
  it.each([
    ["16 of 20 against 80 %: exactly on the mark passes", 16, 20, 80, 80, true],
    ["15 of 20 against 80 %", 15, 20, 80, 75, false],
    ["57 of 100 against 57 %", 57, 100, 57, 57, true],
    ["56 of 100 against 57 %", 56, 100, 57, 56, false],
    ["20 of 20 against 100 %", 20, 20, 100, 100, true],
    ["0 of 20 against a 0 % mark", 0, 20, 0, 0, true],
    ["7 of 9 against 77.78 % (7/9 is 77.777…)", 7, 9, 77.78, 700 / 9, false],
    ["7 of 9 against 77.7 %", 7, 9, 77.7, 700 / 9, true],
  ] as const)("%s", (_, got, of, mark, percent, passed) => {
    const items = [...positions(1, got).map((p) => right(p)), ...positions(got + 1, of - got).map((p) => wrong(p))];
    const score = scoreAttempt(items, { passMarkPercent: mark, policy: ALL_OR_NOTHING_POLICY });
    expect(score.raw).toBe(got);
    expect(score.max).toBe(of);
    expect(score.percent).toBeCloseTo(percent, 12);
    expect(score.passed).toBe(passed);
  });

  it("partial credits that add up to the mark only approximately in binary still pass it", () => {
    // 1 + 1/3 + 1/3 + 1/3 is 1.9999999999999998 in binary: 39.99999999999999 % of 5 points.
    const third: GradedItemInput[] = [2, 3, 4].map((position) => ({ position, key: { kind: "multiple", correct: [0, 1, 2], text: "" }, response: { kind: "multiple", choices: [position - 2] }, topics: ["modes"] }));
    const score = scoreAttempt([right(1), ...third, wrong(5)], { passMarkPercent: 40, policy: PARTIAL });
    expect(score.items.map((i) => i.fraction)).toEqual([1, 1 / 3, 1 / 3, 1 / 3, 0]);
    expect(score.percent).toBeLessThan(40);
    expect(score.percent).toBeCloseTo(40, 9);
    expect(score.passed).toBe(true);
    expect(scoreAttempt([right(1), ...third, wrong(5)], { passMarkPercent: 40.001, policy: PARTIAL }).passed).toBe(false);
  });

  it("an attempt worth no points scores 0 % and is not passed, even against a 0 % mark", () => {
    for (const items of [[], [right(1, ["modes"], 0), wrong(2, ["modes"], 0)]]) {
      const score = scoreAttempt(items, { passMarkPercent: 0, policy: ALL_OR_NOTHING_POLICY });
      expect(score).toMatchObject({ raw: 0, max: 0, percent: 0, passed: false });
    }
    // A topic with no points has a 0 % subscore, not NaN.
    expect(scoreAttempt([right(1, ["modes"], 0)], { passMarkPercent: 50, policy: ALL_OR_NOTHING_POLICY }).subscores).toEqual([{ topic: "modes", raw: 0, max: 0, percent: 0 }]);
  });

  it.each([
    ["a pass mark above 100", { passMarkPercent: 120 }, [right(1)], /pass mark must be a percentage from 0 to 100 \(got 120\)/],
    ["a negative pass mark", { passMarkPercent: -5 }, [right(1)], /from 0 to 100 \(got -5\)/],
    ["a pass mark that is not a number", { passMarkPercent: Number.NaN }, [right(1)], /got NaN/],
    ["a position used twice", { passMarkPercent: 80 }, [right(1), wrong(1)], /Position 1 appears twice/],
    ["negative points", { passMarkPercent: 80 }, [right(1, ["modes"], -1)], /position 1 must be worth zero or more points \(got -1\)/],
  ] as const)("refuses %s with a clear message", (_, opts, items, message) => {
    expect(() => scoreAttempt([...items], { ...opts, policy: ALL_OR_NOTHING_POLICY })).toThrow(message);
  });
});

describe("scoreAttempt: items, points and subscores", () => {
  const items: GradedItemInput[] = [
    // Given out of position order on purpose: the result lists them by position.
    { position: 3, key: { kind: "ordering", order: [0, 1, 2, 3], text: "" }, response: { kind: "ordering", order: [1, 0, 2, 3] }, topics: ["modes", "cycle-variables"], points: 3 },
    { position: 1, key: { kind: "multiple", correct: [0, 2], text: "" }, response: { kind: "multiple", choices: [0] }, topics: ["alarm-reasoning"], points: 2 },
    { position: 2, key: { kind: "numeric", answer: 18, tolerance: 0.5, unit: "mL/cmH2O", text: "" }, response: null, topics: ["lung-mechanics", "modes", "lung-mechanics"] },
    { position: 4, key: { kind: "waveform-point", fromS: 4.9, toS: 5.1, text: "" }, response: { kind: "waveform-point", timeS: 5 }, topics: ["waveform-reading"] },
  ];

  it("partial policy: points weight each fraction; an unanswered item counts in the maximum; an item counts in each of its topics once", () => {
    const score = scoreAttempt(items, { passMarkPercent: 50, policy: PARTIAL });
    // Ordering: one adjacent swap of four steps, τ = 4/6 (Kendall 1938) × 3 points = 2.
    // Multiple: one of two keyed ticked, (1 − 0)/2 × 2 points = 1. Numeric unanswered: 0 of 1.
    expect(score.items).toEqual([
      { position: 1, fraction: 0.5, earned: 1, points: 2 },
      { position: 2, fraction: 0, earned: 0, points: 1 },
      { position: 3, fraction: expect.closeTo(2 / 3, 12), earned: expect.closeTo(2, 12), points: 3 },
      { position: 4, fraction: 1, earned: 1, points: 1 },
    ]);
    expect(score.raw).toBeCloseTo(4, 12);
    expect(score.max).toBe(7);
    expect(score.percent).toBeCloseTo(400 / 7, 10);
    expect(score.passed).toBe(true);
    expect(score.subscores.map((s) => s.topic)).toEqual(["alarm-reasoning", "cycle-variables", "lung-mechanics", "modes", "waveform-reading"]);
    const by = Object.fromEntries(score.subscores.map((s) => [s.topic, s]));
    expect(by["alarm-reasoning"]).toEqual({ topic: "alarm-reasoning", raw: 1, max: 2, percent: 50 });
    expect(by["lung-mechanics"]).toEqual({ topic: "lung-mechanics", raw: 0, max: 1, percent: 0 }); // listed twice, counted once
    expect(by.modes.raw).toBeCloseTo(2, 12);
    expect(by.modes.max).toBe(4);
    expect(by.modes.percent).toBeCloseTo(50, 10);
    expect(by["waveform-reading"]).toEqual({ topic: "waveform-reading", raw: 1, max: 1, percent: 100 });
  });

  it("all-or-nothing policy: the same answers earn only the exact ones", () => {
    const score = scoreAttempt(items, { passMarkPercent: 50, policy: ALL_OR_NOTHING_POLICY });
    expect(score.items.map((i) => i.earned)).toEqual([0, 0, 0, 1]);
    expect(score).toMatchObject({ raw: 1, max: 7, passed: false });
  });
});

// ---------------------------------------------------------------------------------------------
// Properties (fast-check)

const perm = (n: number) => fc.shuffledSubarray(Array.from({ length: n }, (_, i) => i), { minLength: n, maxLength: n });

const keyArb: fc.Arbitrary<Key> = fc.oneof(
  fc.integer({ min: 0, max: 5 }).map(singleKey),
  fc.uniqueArray(fc.integer({ min: 0, max: 7 }), { minLength: 1, maxLength: 5 }).map((c): Key => ({ kind: "multiple", correct: [...c].sort((a, b) => a - b), text: "" })),
  fc.record({ answer: fc.double({ min: -100, max: 2000, noNaN: true }), tolerance: fc.constantFrom(0, 0.1, 0.5, 2) }).map((k): Key => ({ kind: "numeric", ...k, unit: "mL", text: "" })),
  fc.integer({ min: 3, max: 8 }).map((n): Key => ({ kind: "ordering", order: Array.from({ length: n }, (_, i) => i), text: "" })),
  fc.record({ fromS: fc.double({ min: 0, max: 10, noNaN: true }), width: fc.double({ min: 0.05, max: 1, noNaN: true }) }).map((w): Key => ({ kind: "waveform-point", fromS: w.fromS, toS: w.fromS + w.width, text: "" })),
);

const anyResponse: fc.Arbitrary<Response | null> = fc.oneof(
  fc.constant(null),
  fc.integer({ min: 0, max: 5 }).map((choice): Response => ({ kind: "single", choice })),
  fc.array(fc.integer({ min: 0, max: 8 }), { maxLength: 8 }).map((choices): Response => ({ kind: "multiple", choices })),
  fc.double().map((value): Response => ({ kind: "numeric", value })),
  fc.integer({ min: 3, max: 8 }).chain(perm).map((order): Response => ({ kind: "ordering", order })),
  fc.double({ min: -1, max: 12, noNaN: true }).map((timeS): Response => ({ kind: "waveform-point", timeS })),
);

function rightAnswer(key: Key): Response {
  switch (key.kind) {
    case "single": return { kind: "single", choice: key.correct };
    case "multiple": return { kind: "multiple", choices: [...key.correct].reverse() };
    case "numeric": return { kind: "numeric", value: key.answer };
    case "ordering": return { kind: "ordering", order: key.order };
    case "waveform-point": return { kind: "waveform-point", timeS: (key.fromS + key.toS) / 2 };
  }
}

/** Near misses of the same kind: partly right multiple responses and orderings, off-by-a-bit numbers. */
function nearMiss(key: Key): fc.Arbitrary<Response> {
  switch (key.kind) {
    case "multiple": return fc.subarray([...key.correct, 6, 7]).map((choices): Response => ({ kind: "multiple", choices }));
    case "ordering": return perm(key.order.length).map((order): Response => ({ kind: "ordering", order }));
    case "numeric": return fc.double({ min: -3, max: 3, noNaN: true }).map((d): Response => ({ kind: "numeric", value: key.answer + d }));
    default: return anyResponse.map((r) => r ?? rightAnswer(key));
  }
}

const itemBodyArb = keyArb.chain((key) =>
  fc.record({
    key: fc.constant(key),
    response: fc.oneof(anyResponse, fc.constant(rightAnswer(key)), nearMiss(key)),
    topics: fc.subarray([...TOPIC_SLUGS], { minLength: 1, maxLength: 3 }),
    points: fc.option(fc.constantFrom(0, 0.5, 1, 2, 3, 1 / 3), { nil: undefined }),
  }),
);

const attemptArb: fc.Arbitrary<GradedItemInput[]> = fc
  .array(itemBodyArb, { maxLength: 60 })
  .chain((bodies) => fc.uniqueArray(fc.integer({ min: 1, max: 1000 }), { minLength: bodies.length, maxLength: bodies.length }).map((pos) => bodies.map((b, i) => ({ ...b, position: pos[i] }))));

const policyArb: fc.Arbitrary<ScoringPolicy> = fc.record({ multiple: fc.constantFrom("all-or-nothing", "partial"), ordering: fc.constantFrom("exact", "partial") });
const markArb = fc.integer({ min: 0, max: 100 });

describe("scoreAttempt: properties", () => {
  it("a score is always between 0 and its maximum — per item, per topic and overall", () => {
    fc.assert(
      fc.property(attemptArb, policyArb, markArb, (items, policy, mark) => {
        const s = scoreAttempt(items, { passMarkPercent: mark, policy });
        for (const i of s.items) {
          expect(i.fraction).toBeGreaterThanOrEqual(0);
          expect(i.fraction).toBeLessThanOrEqual(1);
          expect(i.earned).toBeGreaterThanOrEqual(0);
          expect(i.earned).toBeLessThanOrEqual(i.points);
        }
        expect(s.raw).toBeGreaterThanOrEqual(0);
        expect(s.raw).toBeLessThanOrEqual(s.max + 1e-9);
        expect(s.percent).toBeGreaterThanOrEqual(0);
        expect(s.percent).toBeLessThanOrEqual(100 + 1e-9);
        for (const t of s.subscores) {
          expect(t.raw).toBeGreaterThanOrEqual(0);
          expect(t.raw).toBeLessThanOrEqual(t.max + 1e-9);
          expect(Number.isNaN(t.percent)).toBe(false);
        }
        expect(s.passed).toBe(s.max > 0 && s.percent >= mark - 1e-9);
      }),
      { numRuns: 300 },
    );
  });

  it("shuffling the order the items are given in changes nothing (not even the last binary digit)", () => {
    fc.assert(
      fc.property(
        attemptArb.chain((items) => fc.tuple(fc.constant(items), fc.shuffledSubarray(items, { minLength: items.length, maxLength: items.length }))),
        policyArb,
        markArb,
        ([items, shuffled], policy, mark) => {
          const a = scoreAttempt(items, { passMarkPercent: mark, policy });
          const b = scoreAttempt(shuffled, { passMarkPercent: mark, policy });
          expect(b.raw).toBe(a.raw);
          expect(b.percent).toBe(a.percent);
          expect(b.subscores).toEqual(a.subscores);
          expect(b).toEqual(a);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("grading is deterministic and leaves its input untouched", () => {
    fc.assert(
      fc.property(attemptArb, policyArb, markArb, (items, policy, mark) => {
        const before = structuredClone(items);
        const a = scoreAttempt(items, { passMarkPercent: mark, policy });
        const b = scoreAttempt(items, { passMarkPercent: mark, policy });
        expect(b).toEqual(a);
        expect(items).toEqual(before);
      }),
      { numRuns: 200 },
    );
  });
});

describe("scoreAttempt: the shuffle a seed applies never changes the score", () => {
  const base = { rationale: "Because.", reference: "Chatburn RL. Respir Care. 2014;59(11):1747–63.", scenario: null };
  const contents: ItemContent[] = [
    itemContent.parse({ ...base, type: "single", topics: ["cycle-variables"], stem: "Q1", body: { kind: "single", options: ["Time", "Flow", "Pressure", "Volume"], correct: 1 } }),
    itemContent.parse({ ...base, type: "multiple", topics: ["alarm-reasoning", "modes"], stem: "Q2", body: { kind: "multiple", options: ["a", "b", "c", "d", "e"], correct: [0, 2, 3] } }),
    itemContent.parse({ ...base, type: "ordering", topics: ["modes"], stem: "Q3", body: { kind: "ordering", steps: ["one", "two", "three", "four", "five"] } }),
    itemContent.parse({ ...base, type: "numeric", topics: ["lung-mechanics"], stem: "Q4", body: { kind: "numeric", answer: 18, unit: "mL/cmH2O", tolerance: 0.5, decimals: 1 } }),
  ];

  /** What the therapist means, in the words on screen: which option texts, which step order, what number. */
  const intentArb = fc.record({
    single: fc.integer({ min: 0, max: 3 }),
    multiple: fc.subarray([0, 1, 2, 3, 4]),
    ordering: perm(5),
    numeric: fc.double({ min: 15, max: 21, noNaN: true }),
  });
  type Intent = { single: number; multiple: number[]; ordering: number[]; numeric: number };

  /** Answers one seed's presentation by clicking the options whose text the therapist means. */
  function answer(seed: number, intent: Intent, policy: ScoringPolicy) {
    const items: GradedItemInput[] = contents.map((content, i) => {
      const { presented, key } = presentItem(content, seed);
      const body = content.body;
      const idOf = (text: string) => {
        const list = presented.kind === "ordering" ? presented.steps : presented.kind === "single" || presented.kind === "multiple" ? presented.options : [];
        return list.find((o) => o.text === text)!.id;
      };
      let response: Response;
      if (body.kind === "single") response = { kind: "single", choice: idOf(body.options[intent.single]) };
      else if (body.kind === "multiple") response = { kind: "multiple", choices: intent.multiple.map((o) => idOf(body.options[o])) };
      else if (body.kind === "ordering") response = { kind: "ordering", order: intent.ordering.map((s) => idOf(body.steps[s])) };
      else response = { kind: "numeric", value: intent.numeric };
      return { position: i + 1, key, response, topics: content.topics };
    });
    return scoreAttempt(items, { passMarkPercent: 75, policy });
  }

  it("the presentations really differ between seeds (otherwise the property below would prove nothing)", () => {
    const shown = (seed: number) => contents.slice(0, 3).map((c) => JSON.stringify(presentItem(c, seed).presented));
    expect(new Set([1, 2, 3, 4, 5, 6].map((s) => shown(s).join("|"))).size).toBeGreaterThan(1);
  });

  it("the same meant answers score the same under two seeds, for every policy", () => {
    fc.assert(
      fc.property(fc.nat(), fc.nat(), intentArb, policyArb, (seedA, seedB, intent, policy) => {
        expect(answer(seedB, intent, policy)).toEqual(answer(seedA, intent, policy));
      }),
      { numRuns: 200 },
    );
  });

  it("meaning the right texts in the right order scores full marks under any seed", () => {
    for (const seed of [0, 1, 7, 99, 4096]) {
      const score = answer(seed, { single: 1, multiple: [0, 2, 3], ordering: [0, 1, 2, 3, 4], numeric: 18 }, PARTIAL);
      expect(score).toMatchObject({ raw: 4, max: 4, percent: 100, passed: true });
    }
  });
});
