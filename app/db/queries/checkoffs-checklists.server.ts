/**
 * Checklists (the educator's templates) and their versions. An edit after a check-off has used
 * the current version makes a new version; past check-offs keep the version they were done on.
 */
import { and, asc, count, desc, eq } from "drizzle-orm";
import type { Viewer } from "~/auth/context";
import type { Method } from "~/domain/checkoffs/methods";
import type { Step } from "~/domain/checkoffs/record";
import { recordAudit } from "../audit.server";
import { database } from "../client.server";
import { checklists, checklistVersions, checkoffs } from "../schema";

export type ChecklistSummary = { id: string; title: string; skill: string; status: string; version: number | null; method: string | null; steps: number; critical: number; uses: number };

export async function listChecklists(orgId: string): Promise<ChecklistSummary[]> {
  const { db } = await database();
  const rows = await db
    .select({ id: checklists.id, title: checklists.title, skill: checklists.skill, status: checklists.status, version: checklistVersions.version, method: checklistVersions.method, steps: checklistVersions.steps })
    .from(checklists)
    .leftJoin(checklistVersions, and(eq(checklistVersions.id, checklists.currentVersionId), eq(checklistVersions.orgId, orgId)))
    .where(eq(checklists.orgId, orgId))
    .orderBy(asc(checklists.title));
  const uses = await db
    .select({ checklistId: checklistVersions.checklistId, n: count() })
    .from(checkoffs)
    .innerJoin(checklistVersions, eq(checklistVersions.id, checkoffs.checklistVersionId))
    .where(eq(checkoffs.orgId, orgId))
    .groupBy(checklistVersions.checklistId);
  const used = new Map(uses.map((u) => [u.checklistId, u.n]));
  return rows.map((r) => ({
    id: r.id,
    title: r.title,
    skill: r.skill,
    status: r.status,
    version: r.version,
    method: r.method,
    steps: r.steps?.length ?? 0,
    critical: r.steps?.filter((s) => s.critical).length ?? 0,
    uses: used.get(r.id) ?? 0,
  }));
}

export type ChecklistDetail = {
  id: string;
  title: string;
  skill: string;
  status: string;
  current: { id: string; version: number; method: Method; steps: Step[]; references: string } | null;
  versions: { id: string; version: number; createdAt: Date; uses: number }[];
};

export async function getChecklist(orgId: string, checklistId: string): Promise<ChecklistDetail | null> {
  const { db } = await database();
  const [c] = await db.select().from(checklists).where(and(eq(checklists.orgId, orgId), eq(checklists.id, checklistId)));
  if (!c) return null;
  const versions = await db.select().from(checklistVersions).where(and(eq(checklistVersions.orgId, orgId), eq(checklistVersions.checklistId, checklistId))).orderBy(desc(checklistVersions.version));
  const uses = await db
    .select({ versionId: checkoffs.checklistVersionId, n: count() })
    .from(checkoffs)
    .where(eq(checkoffs.orgId, orgId))
    .groupBy(checkoffs.checklistVersionId);
  const used = new Map(uses.map((u) => [u.versionId, u.n]));
  const current = versions.find((v) => v.id === c.currentVersionId) ?? null;
  return {
    id: c.id,
    title: c.title,
    skill: c.skill,
    status: c.status,
    current: current ? { id: current.id, version: current.version, method: current.method, steps: current.steps, references: current.references } : null,
    versions: versions.map((v) => ({ id: v.id, version: v.version, createdAt: v.createdAt, uses: used.get(v.id) ?? 0 })),
  };
}

export type ChecklistInput = { title: string; skill: string; method: Method; steps: Step[]; references: string };

export async function createChecklist(viewer: Viewer, input: ChecklistInput, now = new Date()): Promise<string> {
  const { write } = await database();
  return write(async (tx) => {
    const [c] = await tx
      .insert(checklists)
      .values({ orgId: viewer.org.id, title: input.title, skill: input.skill, status: "published", createdBy: viewer.person.id, createdAt: now, updatedAt: now })
      .returning({ id: checklists.id });
    const [v] = await tx
      .insert(checklistVersions)
      .values({ orgId: viewer.org.id, checklistId: c.id, version: 1, method: input.method, steps: input.steps, references: input.references, createdAt: now })
      .returning({ id: checklistVersions.id });
    await tx.update(checklists).set({ currentVersionId: v.id }).where(eq(checklists.id, c.id));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checklist.created", entityType: "checklist", entityId: c.id, detail: { title: input.title, version: 1 } }, now);
    return c.id;
  });
}

/**
 * Saves an edit. The current version is changed in place only while no check-off uses it;
 * otherwise the edit becomes the next version. Returns the version now current.
 */
export async function saveChecklist(viewer: Viewer, checklistId: string, input: ChecklistInput, now = new Date()): Promise<{ version: number; newVersion: boolean } | null> {
  const { write } = await database();
  return write(async (tx) => {
    const [c] = await tx.select().from(checklists).where(and(eq(checklists.orgId, viewer.org.id), eq(checklists.id, checklistId)));
    if (!c) return null;
    const [current] = c.currentVersionId ? await tx.select().from(checklistVersions).where(eq(checklistVersions.id, c.currentVersionId)) : [];
    const [used] = current ? await tx.select({ n: count() }).from(checkoffs).where(eq(checkoffs.checklistVersionId, current.id)) : [{ n: 0 }];
    let version = current?.version ?? 1;
    let newVersion = false;
    if (current && used.n === 0) {
      await tx.update(checklistVersions).set({ method: input.method, steps: input.steps, references: input.references }).where(eq(checklistVersions.id, current.id));
    } else {
      const [latest] = await tx.select({ v: checklistVersions.version }).from(checklistVersions).where(eq(checklistVersions.checklistId, checklistId)).orderBy(desc(checklistVersions.version)).limit(1);
      version = (latest?.v ?? 0) + 1;
      newVersion = true;
      const [v] = await tx
        .insert(checklistVersions)
        .values({ orgId: viewer.org.id, checklistId, version, method: input.method, steps: input.steps, references: input.references, createdAt: now })
        .returning({ id: checklistVersions.id });
      await tx.update(checklists).set({ currentVersionId: v.id }).where(eq(checklists.id, checklistId));
    }
    await tx.update(checklists).set({ title: input.title, skill: input.skill, updatedAt: now }).where(eq(checklists.id, checklistId));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "checklist.saved", entityType: "checklist", entityId: checklistId, detail: { version, newVersion, steps: input.steps.length } }, now);
    return { version, newVersion };
  });
}
