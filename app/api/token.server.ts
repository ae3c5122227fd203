/**
 * Bearer tokens for the API. A token is `tmk_` + 32 random bytes (base64url); only its SHA-256
 * is stored, with a short prefix to recognise it by (RFC 6750 bearer usage; OWASP ASVS 4.0.3
 * V3.5.2 and V2.10: secrets are not stored in clear). A token names one organisation, its
 * scopes, an optional expiry; revoking keeps the row for the audit trail.
 */
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, isNull } from "drizzle-orm";
import { database } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { apiTokens, organisations, people, type API_SCOPES } from "~/db/schema";
import { BAD_TOKENS_PER_CLIENT, clientKey, hitRateLimit, peekRateLimit, type RateLimitRule } from "~/auth/rate-limit.server";
import { apiError } from "./respond.server";
import type { ApiErrorCode } from "./schemas";

export type ApiScope = (typeof API_SCOPES)[number];
export type ApiCaller = { tokenId: string; orgId: string; timeZone: string; scopes: ApiScope[] };

/** 120 requests a minute per token (common practice, no source). */
export const API_RATE_LIMIT: RateLimitRule = { limit: 120, windowMs: 60_000 };
/** Names under which clients commonly put a token in the address; any of them is refused. */
export const QUERY_TOKEN_PARAMS = ["token", "access_token", "api_key", "apikey", "key", "bearer"];

const TOKEN_PREFIX = "tmk_";

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export function newTokenSecret(): { token: string; prefix: string; hash: string } {
  const token = TOKEN_PREFIX + randomBytes(32).toString("base64url");
  return { token, prefix: token.slice(0, TOKEN_PREFIX.length + 8), hash: hashToken(token) };
}

/** The first instant of the day after `isoDate` in `timeZone`: a token "expiring on" a date works through that day. */
export function endOfDayIn(timeZone: string, isoDate: string): Date {
  const [y, m, d] = isoDate.split("-").map(Number);
  const guess = Date.UTC(y, m - 1, d + 1);
  const offsetAt = (t: number) => {
    const parts = Object.fromEntries(
      new Intl.DateTimeFormat("en-GB", { timeZone, hourCycle: "h23", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", second: "2-digit" })
        .formatToParts(new Date(t))
        .map((p) => [p.type, p.value]),
    );
    return Date.UTC(+parts.year, +parts.month - 1, +parts.day, +parts.hour, +parts.minute, +parts.second) - t;
  };
  const first = guess - offsetAt(guess);
  return new Date(guess - offsetAt(first));
}

/**
 * Who is calling, from the Authorization header only. Throws the JSON Response to send when the
 * call may not go ahead: a token in the address (400), none or a bad one (401), a scope the
 * token lacks (403), too many calls (429 with Retry-After). A session cookie is never looked at.
 */
/**
 * The checks that need no database: no token in the address, and a bearer token in the header.
 * Returns the token. Thrown answers are JSON (400 token_in_query, 401 missing_token).
 */
export function bearerTokenOf(request: Request): string {
  const url = new URL(request.url);
  const inQuery = QUERY_TOKEN_PARAMS.find((p) => url.searchParams.has(p));
  if (inQuery) {
    throw apiError(400, "token_in_query", `A token in the address (?${inQuery}=) is refused: addresses end up in logs and histories. Send it as "Authorization: Bearer <token>" and revoke the one you sent.`, { field: inQuery });
  }
  const challenge = { "WWW-Authenticate": 'Bearer realm="tidemark-api"' };
  const header = request.headers.get("Authorization") ?? "";
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
  if (!match) throw apiError(401, "missing_token", 'Send an API token as "Authorization: Bearer <token>". An admin creates tokens under Admin → API.', { headers: challenge });
  return match[1];
}

export async function authenticate(request: Request, scope: ApiScope, now: Date = new Date()): Promise<ApiCaller> {
  const token = bearerTokenOf(request);
  // A client that keeps sending tokens we do not know is refused before the next one is looked up.
  const bad = { headers: { "WWW-Authenticate": 'Bearer realm="tidemark-api", error="invalid_token"' } };
  const badTokenKey = `api-bad-token:client:${clientKey(request)}`;
  const probing = await peekRateLimit(badTokenKey, BAD_TOKENS_PER_CLIENT, now);
  if (!probing.allowed) {
    throw apiError(429, "rate_limited", `Too many calls with unknown, revoked or expired tokens from this address. Try again in ${probing.retryAfterSeconds} s.`, {
      headers: { "Retry-After": String(Math.max(1, probing.retryAfterSeconds)) },
    });
  }
  const refuse = async (code: ApiErrorCode, message: string): Promise<never> => {
    await hitRateLimit(badTokenKey, BAD_TOKENS_PER_CLIENT, now);
    throw apiError(401, code, message, bad);
  };
  const { db, write } = await database();
  const [row] = await db
    .select({ token: apiTokens, timeZone: organisations.timeZone })
    .from(apiTokens)
    .innerJoin(organisations, eq(organisations.id, apiTokens.orgId))
    .where(eq(apiTokens.tokenHash, hashToken(token)));
  if (!row) return refuse("invalid_token", "This token is not known. Check it was copied whole.");
  if (row.token.revokedAt) return refuse("token_revoked", "This token was revoked. Ask an admin for a new one.");
  if (row.token.expiresAt && row.token.expiresAt.getTime() <= now.getTime()) return refuse("token_expired", "This token has expired. Ask an admin for a new one.");
  if (!row.token.scopes.includes(scope)) {
    throw apiError(403, "insufficient_scope", `This token lacks the "${scope}" scope this call needs.`, {
      headers: { "WWW-Authenticate": `Bearer realm="tidemark-api", error="insufficient_scope", scope="${scope}"` },
    });
  }
  const verdict = await hitRateLimit(`api-token:${row.token.id}`, API_RATE_LIMIT, now);
  if (!verdict.allowed) {
    throw apiError(429, "rate_limited", `Too many calls with this token: at most ${API_RATE_LIMIT.limit} a minute. Try again in ${verdict.retryAfterSeconds} s.`, {
      headers: { "Retry-After": String(Math.max(1, verdict.retryAfterSeconds)) },
    });
  }
  // "Last used" to the minute is enough for an admin, and spares a write per call.
  if (!row.token.lastUsedAt || now.getTime() - row.token.lastUsedAt.getTime() > 60_000) {
    await write(async (tx) => {
      await tx.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.token.id));
    }, { quiet: true });
  }
  return { tokenId: row.token.id, orgId: row.token.orgId, timeZone: row.timeZone, scopes: row.token.scopes };
}

// ── Admin: list, create, revoke ────────────────────────────────────────────────────────────
export type TokenListRow = {
  id: string;
  name: string;
  prefix: string;
  scopes: ApiScope[];
  expiresAt: Date | null;
  revokedAt: Date | null;
  lastUsedAt: Date | null;
  createdAt: Date;
  createdByName: string | null;
};

export async function listTokens(orgId: string): Promise<TokenListRow[]> {
  const { db } = await database();
  return db
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      scopes: apiTokens.scopes,
      expiresAt: apiTokens.expiresAt,
      revokedAt: apiTokens.revokedAt,
      lastUsedAt: apiTokens.lastUsedAt,
      createdAt: apiTokens.createdAt,
      createdByName: people.name,
    })
    .from(apiTokens)
    .leftJoin(people, eq(people.id, apiTokens.createdBy))
    .where(eq(apiTokens.orgId, orgId))
    .orderBy(desc(apiTokens.createdAt));
}

export type NewToken = { name: string; scopes: ApiScope[]; expiresOn: string | null };

/** Creates a token and returns it: the only time it exists outside the caller's hands. */
export async function createToken(orgId: string, actorId: string, input: NewToken, now: Date = new Date()): Promise<{ id: string; token: string; prefix: string }> {
  const { db, write } = await database();
  const [org] = await db.select({ timeZone: organisations.timeZone }).from(organisations).where(eq(organisations.id, orgId));
  const secret = newTokenSecret();
  const expiresAt = input.expiresOn ? endOfDayIn(org?.timeZone ?? "UTC", input.expiresOn) : null;
  const id = await write(async (tx) => {
    const [row] = await tx
      .insert(apiTokens)
      .values({ orgId, name: input.name, tokenHash: secret.hash, prefix: secret.prefix, scopes: input.scopes, expiresAt, createdBy: actorId, createdAt: now })
      .returning({ id: apiTokens.id });
    await recordAudit(tx, {
      orgId,
      actorId,
      action: "api-token.created",
      entityType: "api-token",
      entityId: row.id,
      detail: { name: input.name, prefix: secret.prefix, scopes: input.scopes, expiresOn: input.expiresOn },
    }, now);
    return row.id;
  });
  return { id, token: secret.token, prefix: secret.prefix };
}

export async function revokeToken(orgId: string, actorId: string, tokenId: string, now: Date = new Date()): Promise<"revoked" | "not-found"> {
  const { write } = await database();
  return write(async (tx) => {
    const [row] = await tx
      .update(apiTokens)
      .set({ revokedAt: now })
      .where(and(eq(apiTokens.orgId, orgId), eq(apiTokens.id, tokenId), isNull(apiTokens.revokedAt)))
      .returning({ id: apiTokens.id, prefix: apiTokens.prefix, name: apiTokens.name });
    if (!row) return "not-found" as const;
    await recordAudit(tx, { orgId, actorId, action: "api-token.revoked", entityType: "api-token", entityId: row.id, detail: { name: row.name, prefix: row.prefix } }, now);
    return "revoked" as const;
  });
}
