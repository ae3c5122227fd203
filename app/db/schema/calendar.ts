import { sql } from "drizzle-orm";
import { index, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id, instant } from "./columns";
import { organisations, people } from "./core";

export const CALENDAR_FEED_KINDS = ["person", "units"] as const;
export type CalendarFeedKind = (typeof CALENDAR_FEED_KINDS)[number];

/**
 * Private calendar addresses (issue 10 §3). The token in the address is never stored: it is
 * HMAC-SHA-256(server secret, feed id + `salt`), so My plan can show the address again, and the
 * feed is found by `tokenHash` (SHA-256 of the token). A copy of the database alone therefore
 * gives no working address. Resetting revokes the row and starts a new one with a new salt.
 */
export const calendarFeeds = sqliteTable(
  "calendar_feeds",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    personId: text("person_id").notNull().references(() => people.id),
    kind: text("kind", { enum: CALENDAR_FEED_KINDS }).notNull(),
    /** 32 random bytes, base64url: the per-feed input to the token's HMAC. */
    salt: text("salt").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    createdAt: createdAt(),
    /** Set by a reset (or when the server secret changed): the address stops working. */
    revokedAt: instant("revoked_at"),
  },
  (t) => [
    index("calendar_feeds_person").on(t.personId),
    // One working address per person and kind.
    uniqueIndex("calendar_feeds_live").on(t.personId, t.kind).where(sql`revoked_at is null`),
  ],
);
export type CalendarFeed = typeof calendarFeeds.$inferSelect;
