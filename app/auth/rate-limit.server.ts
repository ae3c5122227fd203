import { eq, sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import { rateLimitHits } from "~/db/schema";

export type RateLimitRule = { limit: number; windowMs: number };
export type RateLimitVerdict = { allowed: boolean; retryAfterSeconds: number; remaining: number };

/**
 * Fixed-window counter kept in the database so limits hold across restarts. One statement
 * per hit (an upsert that resets a stale window), queued with the other writes.
 */
export async function hitRateLimit(key: string, rule: RateLimitRule, now: Date = new Date()): Promise<RateLimitVerdict> {
  const { write } = await database();
  const nowMs = now.getTime();
  const windowStart = nowMs - (nowMs % rule.windowMs);
  const row = await write(async (tx) => {
    await tx
      .insert(rateLimitHits)
      .values({ key, windowStart, count: 1 })
      .onConflictDoUpdate({
        target: rateLimitHits.key,
        set: {
          count: sql`CASE WHEN ${rateLimitHits.windowStart} = ${windowStart} THEN ${rateLimitHits.count} + 1 ELSE 1 END`,
          windowStart,
        },
      });
    const [r] = await tx.select().from(rateLimitHits).where(eq(rateLimitHits.key, key));
    return r;
    // Quiet: a hit counter is never shown by a cached read (Team pages), so it must not empty them.
  }, { quiet: true });
  const allowed = row.count <= rule.limit;
  return {
    allowed,
    remaining: Math.max(0, rule.limit - row.count),
    retryAfterSeconds: allowed ? 0 : Math.ceil((windowStart + rule.windowMs - nowMs) / 1000),
  };
}

/** Whether a key is over its limit now, without counting a hit (checked before a guess is tried). */
export async function peekRateLimit(key: string, rule: RateLimitRule, now: Date = new Date()): Promise<RateLimitVerdict> {
  const { db } = await database();
  const nowMs = now.getTime();
  const windowStart = nowMs - (nowMs % rule.windowMs);
  const [row] = await db.select().from(rateLimitHits).where(eq(rateLimitHits.key, key));
  const count = row && row.windowStart === windowStart ? row.count : 0;
  const allowed = count < rule.limit;
  return { allowed, remaining: Math.max(0, rule.limit - count), retryAfterSeconds: allowed ? 0 : Math.ceil((windowStart + rule.windowMs - nowMs) / 1000) };
}

/**
 * Wrong signing PINs (or unknown signers) from one device, whoever the signer: the per-person
 * lock (5 wrong, app/auth/signing-pin.server.ts) stops guessing one person's PIN; this stops a
 * device trying a few guesses on each of many people (OWASP ASVS 4.0.3 V2.2.1 anti-automation).
 * A shared unit tablet signing all day makes far fewer mistakes than this.
 */
export const WRONG_PINS_PER_CLIENT: RateLimitRule = { limit: 10, windowMs: 15 * 60_000 };

/** Failed API token look-ups from one client (unknown, revoked or expired tokens). */
export const BAD_TOKENS_PER_CLIENT: RateLimitRule = { limit: 20, windowMs: 15 * 60_000 };

/**
 * Who is asking, as a rate-limit key. Our server (scripts/serve.mjs) puts the client's address
 * in x-tidemark-client, replacing any such header a client sent; behind reverse proxies it takes
 * the address the outermost trusted proxy saw (TRUST_PROXY = number of proxies), never the
 * left-most X-Forwarded-For entry, which the client writes itself.
 */
export function clientKey(request: Request): string {
  return addressKey(request.headers.get("x-tidemark-client") ?? "unknown-client");
}

/**
 * An address as a key: an IPv4-mapped IPv6 address as plain IPv4; an IPv6 address by its /64
 * prefix, because one host or home network commonly holds a whole /64 and could otherwise
 * rotate addresses to escape a limit (RFC 6177, 2011, on /48–/64 end-site assignments).
 */
export function addressKey(address: string): string {
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(address);
  if (mapped) return mapped[1];
  if (!address.includes(":")) return address;
  const [head, tail = ""] = address.toLowerCase().split("::");
  const left = head ? head.split(":") : [];
  const right = tail ? tail.split(":") : [];
  const groups = address.includes("::") ? [...left, ...Array(Math.max(0, 8 - left.length - right.length)).fill("0"), ...right] : left;
  return `${groups.slice(0, 4).map((g) => g.replace(/^0+(?=.)/, "")).join(":")}::/64`;
}
