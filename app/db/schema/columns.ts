import { integer, text } from "drizzle-orm/sqlite-core";

/** Shared column helpers: every table gets a text id; timestamps are UTC instants in ms. */
export const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());

export const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());

export const updatedAt = () =>
  integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date())
    .$onUpdateFn(() => new Date());

/** Instants (UTC). Calendar dates are stored as 'YYYY-MM-DD' text instead: see `calendarDate`. */
export const instant = (name: string) => integer(name, { mode: "timestamp_ms" });

/** A calendar date in the organisation's time zone, ISO 'YYYY-MM-DD'. */
export const calendarDate = (name: string) => text(name);
