/**
 * A small seeded pseudo-random generator for the demo scenario, so the same flags always build
 * the same database. mulberry32 (Tommy Ettinger's 32-bit generator, public domain; widely
 * reproduced, e.g. in the "bryc/code" PRNG notes, 2019): fast, 2^32 period, ample for picking
 * names and dates. Not for anything secret.
 */
import { createHash } from "node:crypto";

export type Prng = {
  /** A float in [0, 1). */
  next: () => number;
  /** An integer in [min, max], both inclusive. */
  int: (min: number, max: number) => number;
  /** true with probability p. */
  chance: (p: number) => boolean;
  pick: <T>(list: readonly T[]) => T;
};

export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A 32-bit seed from a stable key ("kv:person:17"), so each stream is independent of the others. */
export function seedFromKey(key: string): number {
  return createHash("sha256").update(key).digest().readUInt32BE(0);
}

/** A generator for one named stream: the same key always yields the same sequence. */
export function prngFor(key: string): Prng {
  const next = mulberry32(seedFromKey(key));
  const int = (min: number, max: number) => {
    if (!Number.isInteger(min) || !Number.isInteger(max) || max < min) throw new RangeError(`bad range ${min}..${max}`);
    return min + Math.floor(next() * (max - min + 1));
  };
  return {
    next,
    int,
    chance: (p) => next() < p,
    pick: (list) => {
      if (list.length === 0) throw new RangeError("pick from an empty list");
      return list[int(0, list.length - 1)];
    },
  };
}
