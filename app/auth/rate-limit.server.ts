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

/**
 * Who is asking. Our server (scripts/serve.mjs) puts the socket's address in
 * x-tidemark-client after removing any such header the client sent; behind a proxy set
 * TRUST_PROXY=1 to use the first X-Forwarded-For address instead.
 */
export function clientKey(request: Request): string {
  if (process.env.TRUST_PROXY === "1") {
    const forwarded = request.headers.get("X-Forwarded-For")?.split(",")[0]?.trim();
    if (forwarded) return forwarded;
  }
  return request.headers.get("x-tidemark-client") ?? "unknown-client";
}
