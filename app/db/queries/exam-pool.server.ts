/**
 * The items an exam may draw: every published (not retired) item of the organisation at its
 * highest published version, with its topics and, once enough people have answered it, its
 * difficulty band from the share who got it right (app/domain/exams/blueprint.ts `bandFor`).
 */
import { and, eq, inArray, isNotNull, sql } from "drizzle-orm";
import type { DbOrTx } from "~/db/client.server";
import { items, itemVersions, responses } from "~/db/schema";
import { bandFor, type PoolItem } from "~/domain/exams";
import { topicsOf } from "./bank.server";

export async function loadPool(db: DbOrTx, orgId: string): Promise<PoolItem[]> {
  const live = await db
    .select({ itemId: items.id, itemVersionId: itemVersions.id })
    .from(items)
    .innerJoin(itemVersions, eq(itemVersions.itemId, items.id))
    .where(
      and(
        eq(items.orgId, orgId),
        eq(items.status, "published"),
        isNotNull(itemVersions.publishedAt),
        sql`${itemVersions.version} = (select max(v2.version) from ${itemVersions} v2 where v2.item_id = ${items.id} and v2.published_at is not null)`,
      ),
    )
    .orderBy(items.createdAt, items.id);
  if (live.length === 0) return [];
  const versionIds = live.map((l) => l.itemVersionId);
  const [topicMap, stats] = await Promise.all([
    topicsOf(db, versionIds),
    db
      .select({ itemVersionId: responses.itemVersionId, n: sql<number>`count(*)`, right: sql<number>`sum(${responses.score})` })
      .from(responses)
      .where(and(eq(responses.orgId, orgId), inArray(responses.itemVersionId, versionIds), isNotNull(responses.score)))
      .groupBy(responses.itemVersionId),
  ]);
  const statOf = new Map(stats.map((s) => [s.itemVersionId, s]));
  return live.map((l) => {
    const s = statOf.get(l.itemVersionId);
    const n = Number(s?.n ?? 0);
    return { itemId: l.itemId, itemVersionId: l.itemVersionId, topics: topicMap.get(l.itemVersionId) ?? [], band: bandFor(n ? Number(s!.right) / n : null, n) };
  });
}
