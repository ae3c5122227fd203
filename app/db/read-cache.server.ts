import type { Database } from "./client.server";

/**
 * Results of costly organisation-wide reads (a manager's counts over 2,000 people, a Team page),
 * kept until the next loud write transaction this process commits — every write goes through the
 * writer queue, which counts them; a write marked `{ quiet: true }` (an exam answer saved, see
 * `createWriter` in client.server.ts) cannot change what these reads show and leaves them — and
 * for at most `MAX_AGE_MS`, so a write made by another process (a command-line job) shows within
 * that time. npm run bench measures the effect.
 */
export const MAX_AGE_MS = 30_000;
const MAX_ENTRIES = 500;

type Entry = { generation: number; at: number; value: Promise<unknown> };
const caches = new WeakMap<Database, Map<string, Entry>>();

export async function cachedRead<T>(database: Database, key: string, compute: () => Promise<T>, now: number = Date.now()): Promise<T> {
  let cache = caches.get(database);
  if (!cache) {
    cache = new Map();
    caches.set(database, cache);
  }
  const generation = database.generation();
  const hit = cache.get(key);
  if (hit && hit.generation === generation && now - hit.at < MAX_AGE_MS) return hit.value as Promise<T>;
  const value = compute();
  cache.set(key, { generation, at: now, value });
  // A failed read is not remembered.
  value.catch(() => {
    if (cache.get(key)?.value === value) cache.delete(key);
  });
  if (cache.size > MAX_ENTRIES) cache.delete(cache.keys().next().value as string);
  return value;
}
