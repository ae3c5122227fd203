import { index, integer, primaryKey, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id, instant, updatedAt } from "./columns";
import { organisations, people } from "./core";

export const ITEM_TYPES = ["single", "multiple", "numeric", "waveform-point", "ordering"] as const;
export const ITEM_STATUSES = ["draft", "in-review", "published", "retired"] as const;

export const topics = sqliteTable(
  "topics",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    slug: text("slug").notNull(),
    name: text("name").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("topics_org_slug").on(t.orgId, t.slug)],
);

/** An item is the stable identity of a question; its wording lives in versions. */
export const items = sqliteTable(
  "items",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    status: text("status", { enum: ITEM_STATUSES }).notNull().default("draft"),
    currentVersionId: text("current_version_id"),
    authorId: text("author_id").references(() => people.id),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("items_org").on(t.orgId)],
);

export const itemVersions = sqliteTable(
  "item_versions",
  {
    id: id(),
    orgId: text("org_id").notNull().references(() => organisations.id),
    itemId: text("item_id").notNull().references(() => items.id),
    version: integer("version").notNull(),
    type: text("type", { enum: ITEM_TYPES }).notNull(),
    stem: text("stem").notNull(),
    /** Type-specific content: options and key, numeric answer and tolerance, window, order. JSON. */
    body: text("body", { mode: "json" }).notNull(),
    /** For scenario items: the bench template id and parameter ranges. JSON. */
    scenario: text("scenario", { mode: "json" }),
    rationale: text("rationale").notNull(),
    reference: text("reference").notNull(),
    createdBy: text("created_by").references(() => people.id),
    reviewedBy: text("reviewed_by").references(() => people.id),
    publishedAt: instant("published_at"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("item_versions_item_version").on(t.itemId, t.version)],
);

export const itemVersionTopics = sqliteTable(
  "item_version_topics",
  {
    itemVersionId: text("item_version_id").notNull().references(() => itemVersions.id),
    topicId: text("topic_id").notNull().references(() => topics.id),
  },
  (t) => [primaryKey({ columns: [t.itemVersionId, t.topicId] })],
);

export type Item = typeof items.$inferSelect;
export type ItemVersion = typeof itemVersions.$inferSelect;
export type Topic = typeof topics.$inferSelect;
