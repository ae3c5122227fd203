/**
 * The question bank's writes: create, edit (in place or as a new version), lifecycle steps and
 * import. Every write goes through the writer queue with its audit event in the same
 * transaction; the organisation id always comes from the signed-in educator.
 */
import { and, eq, inArray } from "drizzle-orm";
import { canonicalContent } from "~/domain/bank/interchange";
import type { ItemContent } from "~/domain/bank/item-content";
import { editMode, STEP_TARGET, whyNot, type LifecycleStep } from "~/domain/bank/lifecycle";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { items, itemVersions, itemVersionTopics, topics } from "../schema";
import { getItem } from "./bank.server";

async function topicIds(tx: Tx, orgId: string, slugs: readonly string[]): Promise<string[]> {
  if (slugs.length === 0) return [];
  const rows = await tx.select({ id: topics.id, slug: topics.slug }).from(topics).where(and(eq(topics.orgId, orgId), inArray(topics.slug, [...slugs])));
  const missing = slugs.filter((s) => !rows.some((r) => r.slug === s));
  if (missing.length) throw new Error(`Unknown topics for this organisation: ${missing.join(", ")}`);
  return rows.map((r) => r.id);
}

function versionValues(content: ItemContent) {
  const c = canonicalContent(content);
  return { type: c.type, stem: c.stem, body: c.body, scenario: c.scenario, rationale: c.rationale, reference: c.reference };
}

async function insertVersion(tx: Tx, orgId: string, itemId: string, version: number, content: ItemContent, actorId: string, now: Date) {
  const [row] = await tx
    .insert(itemVersions)
    .values({ orgId, itemId, version, ...versionValues(content), createdBy: actorId, createdAt: now })
    .returning({ id: itemVersions.id });
  const ids = await topicIds(tx, orgId, content.topics);
  if (ids.length) await tx.insert(itemVersionTopics).values(ids.map((topicId) => ({ itemVersionId: row.id, topicId })));
  return row.id;
}

/** Inside a caller's transaction: a new draft item at version 1 (create and import share it). */
export async function insertItem(tx: Tx, orgId: string, actorId: string, content: ItemContent, now: Date): Promise<string> {
  const [item] = await tx.insert(items).values({ orgId, status: "draft", authorId: actorId, createdAt: now, updatedAt: now }).returning({ id: items.id });
  const versionId = await insertVersion(tx, orgId, item.id, 1, content, actorId, now);
  await tx.update(items).set({ currentVersionId: versionId, updatedAt: now }).where(eq(items.id, item.id));
  return item.id;
}

export async function createItem(orgId: string, actorId: string, content: ItemContent, now = new Date()): Promise<string> {
  const { write } = await database();
  return write(async (tx) => {
    const id = await insertItem(tx, orgId, actorId, content, now);
    await recordAudit(tx, { orgId, actorId, action: "item.created", entityType: "item", entityId: id, detail: { version: 1, type: content.type } }, now);
    return id;
  });
}

export type EditResult = { ok: true; version: number; newVersion: boolean } | { ok: false; reason: string };

/** A draft changes in place; a published or retired item gains a new draft version. */
export async function editItem(orgId: string, actorId: string, itemId: string, content: ItemContent, now = new Date()): Promise<EditResult> {
  const { write } = await database();
  return write(async (tx) => {
    const item = await getItem(orgId, itemId, tx);
    if (!item) return { ok: false, reason: "not-found" };
    const mode = editMode(item.status);
    if (mode === "frozen") return { ok: false, reason: "This item is in review: its reviewer must return it to draft before it changes." };
    if (mode === "in-place") {
      const [cur] = await tx
        .select({ id: itemVersions.id, publishedAt: itemVersions.publishedAt })
        .from(itemVersions)
        .where(and(eq(itemVersions.orgId, orgId), eq(itemVersions.itemId, itemId), eq(itemVersions.version, item.currentVersion)));
      // A published version is never changed in place, whatever the status says.
      if (cur.publishedAt === null) {
        await tx.update(itemVersions).set({ ...versionValues(content), createdBy: actorId }).where(eq(itemVersions.id, cur.id));
        await tx.delete(itemVersionTopics).where(eq(itemVersionTopics.itemVersionId, cur.id));
        const ids = await topicIds(tx, orgId, content.topics);
        if (ids.length) await tx.insert(itemVersionTopics).values(ids.map((topicId) => ({ itemVersionId: cur.id, topicId })));
        await tx.update(items).set({ updatedAt: now }).where(eq(items.id, itemId));
        await recordAudit(tx, { orgId, actorId, action: "item.edited", entityType: "item", entityId: itemId, detail: { version: item.currentVersion } }, now);
        return { ok: true, version: item.currentVersion, newVersion: false };
      }
    }
    const version = Math.max(...item.versions.map((v) => v.version)) + 1;
    const versionId = await insertVersion(tx, orgId, itemId, version, content, actorId, now);
    await tx.update(items).set({ currentVersionId: versionId, status: "draft", updatedAt: now }).where(eq(items.id, itemId));
    await recordAudit(
      tx,
      { orgId, actorId, action: "item.versioned", entityType: "item", entityId: itemId, detail: { version, from: item.currentVersion, liveVersion: item.liveVersion } },
      now,
    );
    return { ok: true, version, newVersion: true };
  });
}

export type StepResult = { ok: true } | { ok: false; reason: string };

export async function applyStep(orgId: string, actorId: string, itemId: string, step: LifecycleStep, now = new Date()): Promise<StepResult> {
  const { write } = await database();
  return write(async (tx) => {
    const item = await getItem(orgId, itemId, tx);
    if (!item) return { ok: false, reason: "not-found" };
    const [cur] = await tx
      .select()
      .from(itemVersions)
      .where(and(eq(itemVersions.orgId, orgId), eq(itemVersions.itemId, itemId), eq(itemVersions.version, item.currentVersion)));
    const reason = whyNot(step, { status: item.status, versionAuthorId: cur.createdBy, hasPublishedVersion: item.liveVersion !== null, viewerId: actorId });
    if (reason) return { ok: false, reason };
    if (step === "publish") {
      await tx.update(itemVersions).set({ reviewedBy: actorId, publishedAt: now }).where(eq(itemVersions.id, cur.id));
    }
    if (step === "restore" && cur.publishedAt === null) {
      // A retired item whose latest version was never published returns to its last published one.
      const [live] = await tx
        .select({ id: itemVersions.id })
        .from(itemVersions)
        .where(and(eq(itemVersions.itemId, itemId), eq(itemVersions.version, item.liveVersion!)));
      await tx.update(items).set({ currentVersionId: live.id }).where(eq(items.id, itemId));
    }
    await tx.update(items).set({ status: STEP_TARGET[step], updatedAt: now }).where(eq(items.id, itemId));
    await recordAudit(
      tx,
      { orgId, actorId, action: `item.${step}`, entityType: "item", entityId: itemId, detail: { version: item.currentVersion, from: item.status, to: STEP_TARGET[step] } },
      now,
    );
    return { ok: true };
  });
}

/** Saves the given (already validated) contents as drafts, all or nothing, one audit event. */
export async function importItems(orgId: string, actorId: string, contents: readonly ItemContent[], source: string, now = new Date()): Promise<string[]> {
  const { write } = await database();
  return write(async (tx) => {
    const ids: string[] = [];
    for (const c of contents) ids.push(await insertItem(tx, orgId, actorId, c, now));
    await recordAudit(tx, { orgId, actorId, action: "item.imported", entityType: "item", entityId: null, detail: { count: ids.length, source, itemIds: ids } }, now);
    return ids;
  });
}
