/**
 * Drawing one attempt's form from the bank: which items, in which order, each with its own seed
 * for option shuffling and scenario numbers. Pure and deterministic: the same pool, blueprint and
 * attempt seed give the same form, so an attempt is replayed and graded exactly from its seed.
 */
import { createRandom, mixSeed, type Random } from "~/domain/bench";
import { DIFFICULTY_BANDS, blueprintTotal, type Blueprint, type DifficultyBand } from "./blueprint";

/** One published item the draw may choose: its current version, topics (slugs) and band. */
export type PoolItem = { itemId: string; itemVersionId: string; topics: readonly string[]; band: DifficultyBand | null };

/** One place on the form: the item version asked, the topic it was drawn for and its own seed. */
export type FormEntry = { position: number; itemId: string; itemVersionId: string; topic: string; itemSeed: number; fixed: boolean };

export type DrawProblem = { topic: string; message: string };

function shuffle<T>(list: readonly T[], random: Random): T[] {
  const out = [...list];
  // Fisher–Yates (Knuth, The Art of Computer Programming vol. 2, Algorithm P).
  for (let i = out.length - 1; i > 0; i--) {
    const j = random.int(0, i);
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** Largest-remainder split of n places across the bands in proportion to the mix. */
export function splitByMix(n: number, mix: Record<DifficultyBand, number>): Record<DifficultyBand, number> {
  const exact = DIFFICULTY_BANDS.map((b) => (n * mix[b]) / 100);
  const whole = exact.map(Math.floor);
  let left = n - whole.reduce((s, x) => s + x, 0);
  const order = exact.map((x, i) => ({ i, r: x - Math.floor(x) })).sort((a, b) => b.r - a.r || a.i - b.i);
  for (const { i } of order) {
    if (left <= 0) break;
    whole[i]++;
    left--;
  }
  return { easy: whole[0], medium: whole[1], hard: whole[2] };
}

/**
 * What stops a blueprint from being drawn from this pool: a topic with fewer distinct items than
 * it asks for (counting each item once across topics), or a fixed item not in the pool.
 */
export function blueprintProblems(blueprint: Blueprint, pool: readonly PoolItem[]): DrawProblem[] {
  const problems: DrawProblem[] = [];
  const byId = new Map(pool.map((p) => [p.itemId, p]));
  for (const id of blueprint.fixed ?? []) {
    if (!byId.has(id)) problems.push({ topic: "fixed", message: `Fixed item ${id.slice(0, 8)} is not a published item of this bank.` });
  }
  // Greedy in blueprint order is exact enough for a warning: each topic takes items no earlier topic took.
  const taken = new Set<string>();
  for (const [topic, n] of Object.entries(blueprint.topics)) {
    if (!n) continue;
    const available = pool.filter((p) => p.topics.includes(topic) && !taken.has(p.itemId));
    if (available.length < n) problems.push({ topic, message: `${topic} asks for ${n} items; the bank has ${available.length} published that are not already drawn for another topic.` });
    available.slice(0, n).forEach((p) => taken.add(p.itemId));
  }
  return problems;
}

/**
 * Draws a form. Fixed items come first and fill a place of their first blueprint topic with room
 * (or an extra place when none has room). Each topic's remaining places are split by the
 * difficulty mix; a band that runs short is filled from the other bands (nearest first), and an
 * item with no band yet counts as medium. With `shuffleItems` the whole form is shuffled;
 * without it, items keep blueprint topic order. Throws when the pool cannot fill the blueprint
 * (check `blueprintProblems` first).
 */
export function drawForm(blueprint: Blueprint, pool: readonly PoolItem[], seed: number, options: { shuffleItems: boolean }): FormEntry[] {
  const random = createRandom(seed);
  const byId = new Map(pool.map((p) => [p.itemId, p]));
  const used = new Set<string>();
  const room = new Map(Object.entries(blueprint.topics).map(([t, n]) => [t, n ?? 0]));
  const picked: Omit<FormEntry, "position" | "itemSeed">[] = [];

  for (const id of blueprint.fixed ?? []) {
    const item = byId.get(id);
    if (!item) throw new Error(`Fixed item ${id} is not in the pool.`);
    const topic = [...room.keys()].find((t) => item.topics.includes(t) && (room.get(t) ?? 0) > 0);
    if (topic) room.set(topic, room.get(topic)! - 1);
    picked.push({ itemId: item.itemId, itemVersionId: item.itemVersionId, topic: topic ?? item.topics[0] ?? "fixed", fixed: true });
    used.add(item.itemId);
  }

  const nearest: Record<DifficultyBand, DifficultyBand[]> = { easy: ["easy", "medium", "hard"], medium: ["medium", "easy", "hard"], hard: ["hard", "medium", "easy"] };
  for (const [topic, places] of room) {
    if (places <= 0) continue;
    const candidates = shuffle(pool.filter((p) => p.topics.includes(topic) && !used.has(p.itemId)), random);
    if (candidates.length < places) throw new Error(`Topic ${topic} needs ${places} items; ${candidates.length} are available.`);
    const want = blueprint.difficulty ? splitByMix(places, blueprint.difficulty) : null;
    const chosen: PoolItem[] = [];
    if (want) {
      const bandOf = (p: PoolItem): DifficultyBand => p.band ?? "medium";
      for (const band of DIFFICULTY_BANDS) {
        for (let k = 0; k < want[band]; k++) {
          const next = nearest[band].map((b) => candidates.find((c) => bandOf(c) === b && !chosen.includes(c))).find(Boolean);
          chosen.push(next!);
        }
      }
    } else {
      chosen.push(...candidates.slice(0, places));
    }
    for (const c of chosen) {
      used.add(c.itemId);
      picked.push({ itemId: c.itemId, itemVersionId: c.itemVersionId, topic, fixed: false });
    }
  }

  const ordered = options.shuffleItems ? shuffle(picked, random) : picked;
  return ordered.map((p, position) => ({ ...p, position, itemSeed: mixSeed(seed + 7919 * (position + 1)) }));
}

export { blueprintTotal };
