/**
 * Deterministic identifiers for seeded rows. A re-run must produce the same ids, so ids are
 * derived from a stable key ("kv:person:17") instead of being random.
 */
import { createHash } from "node:crypto";

/**
 * A UUID-shaped id from SHA-256 of the key, marked as version 8 with the RFC variant bits —
 * RFC 9562 (IETF, 2024) §5.8 reserves UUIDv8 for custom, implementation-defined layouts.
 */
export function stableId(key: string): string {
  const hex = createHash("sha256").update(key).digest("hex").slice(0, 32).split("");
  hex[12] = "8";
  hex[16] = ((parseInt(hex[16], 16) & 0x3) | 0x8).toString(16);
  const s = hex.join("");
  return `${s.slice(0, 8)}-${s.slice(8, 12)}-${s.slice(12, 16)}-${s.slice(16, 20)}-${s.slice(20, 32)}`;
}

/** Ids under one organisation's prefix, e.g. `ids("kv")("person", 17)`. */
export function idsFor(prefix: string) {
  return (...parts: (string | number)[]) => stableId([prefix, ...parts].join(":"));
}
