/**
 * The question bank's reads: the filtered item list, one item with its versions, one version's
 * content, and the organisation's topics. Every query takes the viewer's organisation id first.
 * Writes: bank-write.server.ts.
 */
import { and, asc, desc, eq, inArray, or, sql, type SQL } from "drizzle-orm";
import { SCENARIO_TEMPLATES, type TemplateId } from "~/domain/bench";
import type { ItemContent, ItemType } from "~/domain/bank/item-content";
import { database, type DbOrTx } from "../client.server";
import { items, itemVersions, itemVersionTopics, people, topics } from "../schema";
import type { ItemStatus } from "~/domain/bank/lifecycle";

export type BankFilter = { q: string; topic: string; type: string; status: string; author: string; sort: "changed" | "oldest" };

export type BankListRow = {
  id: string;
  stem: string;
  type: ItemType;
  status: ItemStatus;
  version: number;
  liveVersion: number | null;
  scenario: boolean;
  /** For scenario items: the bench template's title (the stem may be only placeholders). */
  templateTitle: string | null;
  topics: string[];
  author: string | null;
  updatedAt: Date;
};

function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export async function listTopics(orgId: string, db?: DbOrTx) {
  const d = db ?? (await database()).db;
  return d.select({ id: topics.id, slug: topics.slug, name: topics.name }).from(topics).where(eq(topics.orgId, orgId)).orderBy(asc(topics.name));
}

export async function listAuthors(orgId: string) {
  const { db } = await database();
  return db
    .selectDistinct({ id: people.id, name: people.name })
    .from(items)
    .innerJoin(people, eq(people.id, items.authorId))
    .where(eq(items.orgId, orgId))
    .orderBy(asc(people.name));
}

/** Topic slugs per version id. */
export async function topicsOf(db: DbOrTx, versionIds: string[]): Promise<Map<string, string[]>> {
  const out = new Map<string, string[]>();
  if (versionIds.length === 0) return out;
  const rows = await db
    .select({ versionId: itemVersionTopics.itemVersionId, slug: topics.slug })
    .from(itemVersionTopics)
    .innerJoin(topics, eq(topics.id, itemVersionTopics.topicId))
    .where(inArray(itemVersionTopics.itemVersionId, versionIds))
    .orderBy(asc(topics.slug));
  for (const r of rows) out.set(r.versionId, [...(out.get(r.versionId) ?? []), r.slug]);
  return out;
}

/** The highest published version of each item (what new attempts draw). */
function liveVersionSql() {
  return sql<number | null>`(select max(${itemVersions.version}) from ${itemVersions} where ${itemVersions.itemId} = ${items.id} and ${itemVersions.publishedAt} is not null)`;
}

export async function listItems(orgId: string, filter: BankFilter): Promise<BankListRow[]> {
  const { db } = await database();
  const where: SQL[] = [eq(items.orgId, orgId)];
  if (filter.q) {
    const p = likePattern(filter.q);
    where.push(or(sql`${itemVersions.stem} like ${p} escape '\\'`, sql`${itemVersions.reference} like ${p} escape '\\'`)!);
  }
  if (filter.type) where.push(eq(itemVersions.type, filter.type as ItemType));
  if (filter.status) where.push(eq(items.status, filter.status as ItemStatus));
  if (filter.author) where.push(eq(items.authorId, filter.author));
  if (filter.topic) {
    where.push(
      sql`exists (select 1 from ${itemVersionTopics} join ${topics} on ${topics.id} = ${itemVersionTopics.topicId} where ${itemVersionTopics.itemVersionId} = ${itemVersions.id} and ${topics.slug} = ${filter.topic})`,
    );
  }
  const rows = await db
    .select({
      id: items.id,
      versionId: itemVersions.id,
      stem: itemVersions.stem,
      type: itemVersions.type,
      status: items.status,
      version: itemVersions.version,
      liveVersion: liveVersionSql(),
      scenario: itemVersions.scenario,
      author: people.name,
      updatedAt: items.updatedAt,
    })
    .from(items)
    .innerJoin(itemVersions, eq(itemVersions.id, items.currentVersionId))
    .leftJoin(people, eq(people.id, items.authorId))
    .where(and(...where))
    .orderBy(filter.sort === "oldest" ? asc(items.updatedAt) : desc(items.updatedAt), asc(items.id));
  const topicMap = await topicsOf(db, rows.map((r) => r.versionId));
  return rows.map((r) => ({
    id: r.id,
    stem: r.stem,
    type: r.type,
    status: r.status,
    version: r.version,
    liveVersion: r.liveVersion,
    scenario: r.scenario !== null,
    templateTitle: r.scenario ? (SCENARIO_TEMPLATES[(r.scenario as { templateId: TemplateId }).templateId]?.title ?? null) : null,
    topics: topicMap.get(r.versionId) ?? [],
    author: r.author,
    updatedAt: r.updatedAt,
  }));
}

export type VersionRow = typeof itemVersions.$inferSelect;

export function contentOf(v: VersionRow, topicSlugs: string[]): ItemContent {
  return {
    type: v.type,
    stem: v.stem,
    topics: topicSlugs as ItemContent["topics"],
    body: v.body as ItemContent["body"],
    scenario: (v.scenario ?? null) as ItemContent["scenario"],
    rationale: v.rationale,
    reference: v.reference,
  };
}

export type ItemDetail = {
  id: string;
  status: ItemStatus;
  authorId: string | null;
  authorName: string | null;
  currentVersion: number;
  liveVersion: number | null;
  versions: { version: number; createdBy: string | null; reviewedBy: string | null; publishedAt: Date | null; createdAt: Date }[];
};

/** One item of the organisation, or null (another organisation's item is "not found"). */
export async function getItem(orgId: string, itemId: string, db?: DbOrTx): Promise<ItemDetail | null> {
  const d = db ?? (await database()).db;
  const [row] = await d
    .select({ id: items.id, status: items.status, authorId: items.authorId, authorName: people.name, currentVersionId: items.currentVersionId })
    .from(items)
    .leftJoin(people, eq(people.id, items.authorId))
    .where(and(eq(items.orgId, orgId), eq(items.id, itemId)));
  if (!row) return null;
  const creator = sql<string | null>`(select ${people.name} from ${people} where ${people.id} = ${itemVersions.createdBy})`;
  const reviewer = sql<string | null>`(select ${people.name} from ${people} where ${people.id} = ${itemVersions.reviewedBy})`;
  const versions = await d
    .select({ id: itemVersions.id, version: itemVersions.version, createdBy: creator, reviewedBy: reviewer, publishedAt: itemVersions.publishedAt, createdAt: itemVersions.createdAt })
    .from(itemVersions)
    .where(and(eq(itemVersions.orgId, orgId), eq(itemVersions.itemId, itemId)))
    .orderBy(desc(itemVersions.version));
  const current = versions.find((v) => v.id === row.currentVersionId);
  const live = versions.find((v) => v.publishedAt !== null);
  return {
    id: row.id,
    status: row.status,
    authorId: row.authorId,
    authorName: row.authorName,
    currentVersion: current?.version ?? versions[0]?.version ?? 1,
    liveVersion: live?.version ?? null,
    versions: versions.map(({ id: _id, ...v }) => v),
  };
}

/** One version's row and content, or null. */
export async function getVersion(orgId: string, itemId: string, version: number, db?: DbOrTx) {
  const d = db ?? (await database()).db;
  const [v] = await d
    .select()
    .from(itemVersions)
    .where(and(eq(itemVersions.orgId, orgId), eq(itemVersions.itemId, itemId), eq(itemVersions.version, version)));
  if (!v) return null;
  const t = await topicsOf(d, [v.id]);
  return { row: v, content: contentOf(v, t.get(v.id) ?? []) };
}

/** Every item's current version content, in a stable order (export). */
export async function exportContents(orgId: string, filter: { status?: ItemStatus } = {}): Promise<ItemContent[]> {
  const { db } = await database();
  const where: SQL[] = [eq(items.orgId, orgId)];
  if (filter.status) where.push(eq(items.status, filter.status));
  const rows = await db
    .select({ v: itemVersions })
    .from(items)
    .innerJoin(itemVersions, eq(itemVersions.id, items.currentVersionId))
    .where(and(...where))
    .orderBy(asc(items.createdAt), asc(items.id));
  const t = await topicsOf(db, rows.map((r) => r.v.id));
  return rows.map((r) => contentOf(r.v, t.get(r.v.id) ?? []));
}
