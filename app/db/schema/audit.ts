import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";

/**
 * Append-only, hash-chained record of every sign-off and change. `hash` covers the event's
 * fields and the previous event's hash, so changing or removing any event breaks the chain.
 */
export const auditEvents = sqliteTable(
  "audit_events",
  {
    seq: integer("seq").primaryKey({ autoIncrement: true }),
    orgId: text("org_id"),
    actorId: text("actor_id"),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    detail: text("detail").notNull().default("{}"),
    /** ISO instant, kept as text so the hashed form is exactly what is stored. */
    at: text("at").notNull(),
    prevHash: text("prev_hash").notNull(),
    hash: text("hash").notNull(),
  },
  (t) => [index("audit_events_org").on(t.orgId), index("audit_events_entity").on(t.entityType, t.entityId)],
);

export type AuditEvent = typeof auditEvents.$inferSelect;
