import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { createdAt, id, instant } from "./columns";
import { organisations, people } from "./core";

export const sessions = sqliteTable(
  "sessions",
  {
    id: id(),
    personId: text("person_id").notNull().references(() => people.id),
    orgId: text("org_id").notNull().references(() => organisations.id),
    expiresAt: instant("expires_at").notNull(),
    endedAt: instant("ended_at"),
    userAgent: text("user_agent"),
    createdAt: createdAt(),
  },
  (t) => [index("sessions_person").on(t.personId)],
);

/**
 * Our own record of every one-time sign-in code issued. The sign-in strategy keeps its state in
 * a cookie a client can replay, so expiry, single use and the try limit are enforced here.
 */
export const signInCodes = sqliteTable(
  "sign_in_codes",
  {
    id: id(),
    email: text("email").notNull(),
    codeHash: text("code_hash").notNull(),
    /** Set only when the address belongs to an active person: no mail is sent otherwise. */
    personId: text("person_id").references(() => people.id),
    expiresAt: instant("expires_at").notNull(),
    consumedAt: instant("consumed_at"),
    attempts: integer("attempts").notNull().default(0),
    clientKey: text("client_key"),
    createdAt: createdAt(),
  },
  (t) => [index("sign_in_codes_email").on(t.email), index("sign_in_codes_hash").on(t.codeHash)],
);

/** Fixed-window counters for rate limits (code requests per address and per client, API…). */
export const rateLimitHits = sqliteTable("rate_limit_hits", {
  key: text("key").primaryKey(),
  windowStart: integer("window_start").notNull(),
  count: integer("count").notNull(),
});

export const API_SCOPES = ["read", "write"] as const;
export const apiTokens = sqliteTable(
  "api_tokens",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    name: text("name").notNull(),
    /** SHA-256 of the token; the token itself is shown once and never stored. */
    tokenHash: text("token_hash").notNull().unique(),
    prefix: text("prefix").notNull(),
    scopes: text("scopes", { mode: "json" }).$type<(typeof API_SCOPES)[number][]>().notNull(),
    expiresAt: instant("expires_at"),
    revokedAt: instant("revoked_at"),
    lastUsedAt: instant("last_used_at"),
    createdBy: text("created_by").references(() => people.id),
    createdAt: createdAt(),
  },
  (t) => [index("api_tokens_org").on(t.orgId)],
);

/** Uploaded files (credential scans, imports). Stored on disk under data/files; checked by content. */
export const files = sqliteTable(
  "files",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    ownerId: text("owner_id").references(() => people.id),
    purpose: text("purpose", { enum: ["credential-scan", "item-import", "roster-import", "other"] }).notNull(),
    mimeType: text("mime_type").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    storagePath: text("storage_path").notNull(),
    originalName: text("original_name"),
    createdAt: createdAt(),
  },
  (t) => [index("files_org").on(t.orgId)],
);

export type Session = typeof sessions.$inferSelect;
export type SignInCode = typeof signInCodes.$inferSelect;
