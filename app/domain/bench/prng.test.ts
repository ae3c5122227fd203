import { describe, expect, it } from "vitest";
import { createRandom, mixSeed, mulberry32 } from "./prng";

function chiSquare(values: number[], bins: number): number {
  const counts = new Array<number>(bins).fill(0);
  for (const v of values) counts[Math.floor(v * bins)]++;
  const expected = values.length / bins;
  return counts.reduce((sum, c) => sum + (c - expected) ** 2 / expected, 0);
}

// χ² critical value for 9 degrees of freedom at p = 0.001 is 27.88 (standard χ² table).
const CHI2_9DF_P001 = 27.88;

describe("seeded random numbers", () => {
  it("replays the same sequence for the same seed, and a different one for another seed", () => {
    const a = createRandom(42);
    const b = createRandom(42);
    const c = createRandom(43);
    const seqA = Array.from({ length: 1000 }, () => a.next());
    expect(Array.from({ length: 1000 }, () => b.next())).toEqual(seqA);
    expect(Array.from({ length: 1000 }, () => c.next())).not.toEqual(seqA);
  });

  it("stays in [0, 1) and is close to uniform over 100 000 draws", () => {
    const next = mulberry32(2024);
    const values = Array.from({ length: 100_000 }, next);
    expect(Math.min(...values)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...values)).toBeLessThan(1);
    expect(values.reduce((s, v) => s + v, 0) / values.length).toBeCloseTo(0.5, 2);
    expect(chiSquare(values, 10)).toBeLessThan(CHI2_9DF_P001);
  });

  it("spreads neighbouring seeds: the first draws of seeds 1…2000 are uniform too", () => {
    // Why mixSeed exists: raw mulberry32's first outputs for seeds 1, 2, 3 lie close together.
    const firsts = Array.from({ length: 2000 }, (_, i) => createRandom(i + 1).next());
    expect(chiSquare(firsts, 10)).toBeLessThan(CHI2_9DF_P001);
  });

  it("mixSeed is one-to-one on the first 20 000 seeds", () => {
    const seen = new Set(Array.from({ length: 20_000 }, (_, i) => mixSeed(i)));
    expect(seen.size).toBe(20_000);
  });

  it("int() reaches both ends of its inclusive range and nothing outside", () => {
    const r = createRandom(5);
    const seen = new Set(Array.from({ length: 500 }, () => r.int(3, 6)));
    expect([...seen].sort()).toEqual([3, 4, 5, 6]);
  });

  it("refuses a seed that is not a finite number", () => {
    expect(() => createRandom(Number.NaN)).toThrow(/finite/);
  });
});
