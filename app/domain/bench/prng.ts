/**
 * Seeded pseudo-random numbers for everything in the bench that must replay exactly:
 * erratic breathing and the scenario generator (STYLE.md: "randomness that matters comes
 * from a seeded generator stored with the record that used it").
 *
 * Algorithm: mulberry32, a 32-bit-state generator by Tommy Ettinger (public domain, 2017;
 * attribution from memory).
 * It is small and fast, with a 2^32 period; its uniformity is checked in prng.test.ts and is
 * ample for teaching scenarios. It is NOT cryptographic. Only 32-bit
 * integer arithmetic (Math.imul, >>>) is used, so the sequence is identical in every
 * JavaScript engine, in the browser and on the server.
 */

export interface Random {
  /** Uniform number in [0, 1). */
  next(): number;
  /** Uniform number in [min, max). */
  between(min: number, max: number): number;
  /** Uniform integer in [min, max] (both inclusive). */
  int(min: number, max: number): number;
  /** One element of a non-empty list. */
  pick<T>(items: readonly T[]): T;
}

/** Normalises any finite number to an unsigned 32-bit seed. */
export function toSeed(seed: number): number {
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number (got ${seed})`);
  return Math.trunc(seed) >>> 0;
}

/** The raw mulberry32 stream: each call returns the next uniform number in [0, 1). */
export function mulberry32(seed: number): () => number {
  let state = toSeed(seed);
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * MurmurHash3's 32-bit finaliser (fmix32, Austin Appleby, public domain; from memory). mulberry32's first
 * outputs for neighbouring seeds (1, 2, 3 …) lie close together; passing the seed through
 * this bijective mixer first spreads them apart, so attempt seeds can simply count up.
 */
export function mixSeed(seed: number): number {
  let h = toSeed(seed);
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** The bench's random source: mulberry32 started from the mixed seed. */
export function createRandom(seed: number): Random {
  const next = mulberry32(mixSeed(seed));
  return {
    next,
    between: (min, max) => min + (max - min) * next(),
    int: (min, max) => min + Math.floor(next() * (max - min + 1)),
    pick: (items) => {
      if (items.length === 0) throw new RangeError("pick needs at least one item");
      return items[Math.floor(next() * items.length)];
    },
  };
}
