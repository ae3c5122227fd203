/**
 * Exam authoring for educators (issue 5, item 1): the exam list, one exam with its versions,
 * writing an exam, saving an edit, publishing and retiring, and the attempts of an exam.
 * Assigning: exam-assignments.server.ts.
 *
 * Versions. Every save makes a new version row, numbered on from the highest; no version row is
 * ever changed after it is written, published or not. An unpublished version is kept (not
 * replaced) so the history shows every draft an educator saved; it is simply never live.
 * `exams.currentVersionId` is the LIVE version — the published one new attempts use — and stays
 * null until the first publish. Only the newest version can be published, so a newer draft is
 * never overtaken by an older one. Publishing checks the blueprint against the bank's published
 * items (`blueprintProblems` over `loadPool`) and refuses, naming each topic short of items.
 *
 * Every query takes the viewer's organisation id first; another organisation's exam is "not found".
 */
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { blueprintProblems, blueprintSchema, blueprintTotal, type Blueprint, type DrawProblem } from "~/domain/exams";
import type { ExamSettings } from "~/routes/bank/exam-form";
import { recordAudit } from "../audit.server";
import { database, type DbOrTx } from "../client.server";
import { assignments, attempts, exams, examVersions, itemVersions, people, topics, type ExamVersion } from "../schema";
import { loadPool } from "./exam-pool.server";

export type ExamStatus = "draft" | "published" | "retired";

export type ExamListRow = {
  id: string;
  title: string;
  status: ExamStatus;
  /** The published version new attempts use, or null before the first publish. */
  liveVersion: number | null;
  latestVersion: number;
  /** From the live version, else the latest. */
  timeLimitMinutes: number | null;
  passMarkPercent: number;
  items: number;
  openAssignments: number;
  attempts: number;
};

/** A version's blueprint as stored (JSON), read through the one schema; a bad row reads as empty. */
export function blueprintOf(v: Pick<ExamVersion, "blueprint">): Blueprint {
  const parsed = blueprintSchema.safeParse(v.blueprint);
  return parsed.success ? parsed.data : { topics: {} };
}

export async function listExams(orgId: string): Promise<ExamListRow[]> {
  const { db } = await database();
  const [rows, versions, open, sat] = await Promise.all([
    db.select().from(exams).where(eq(exams.orgId, orgId)).orderBy(asc(exams.title), asc(exams.id)),
    db.select().from(examVersions).where(eq(examVersions.orgId, orgId)),
    db
      .select({ examId: assignments.examId, n: sql<number>`count(*)`.mapWith(Number) })
      .from(assignments)
      .where(and(eq(assignments.orgId, orgId), eq(assignments.kind, "exam"), eq(assignments.status, "open")))
      .groupBy(assignments.examId),
    db
      .select({ examId: examVersions.examId, n: sql<number>`count(*)`.mapWith(Number) })
      .from(attempts)
      .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
      .where(eq(attempts.orgId, orgId))
      .groupBy(examVersions.examId),
  ]);
  const openOf = new Map(open.map((o) => [o.examId, o.n]));
  const satOf = new Map(sat.map((s) => [s.examId, s.n]));
  return rows.map((e) => {
    const own = versions.filter((v) => v.examId === e.id).sort((a, b) => b.version - a.version);
    const live = own.find((v) => v.id === e.currentVersionId && v.publishedAt !== null) ?? null;
    const shown = live ?? own[0];
    return {
      id: e.id,
      title: e.title,
      status: e.status,
      liveVersion: live?.version ?? null,
      latestVersion: own[0]?.version ?? 1,
      timeLimitMinutes: shown?.timeLimitMinutes ?? null,
      passMarkPercent: shown?.passMarkPercent ?? 0,
      items: shown ? blueprintTotal(blueprintOf(shown)) : 0,
      openAssignments: openOf.get(e.id) ?? 0,
      attempts: satOf.get(e.id) ?? 0,
    };
  });
}

export type ExamDetail = {
  id: string;
  title: string;
  status: ExamStatus;
  createdBy: string | null;
  live: ExamVersion | null;
  latest: ExamVersion;
  /** Newest first. */
  versions: ExamVersion[];
};

/** One exam of the organisation with every version, or null. */
export async function getExam(orgId: string, examId: string, db?: DbOrTx): Promise<ExamDetail | null> {
  const d = db ?? (await database()).db;
  const [row] = await d
    .select({ exam: exams, createdBy: people.name })
    .from(exams)
    .leftJoin(people, eq(people.id, exams.createdBy))
    .where(and(eq(exams.orgId, orgId), eq(exams.id, examId)));
  if (!row) return null;
  const versions = await d
    .select()
    .from(examVersions)
    .where(and(eq(examVersions.orgId, orgId), eq(examVersions.examId, examId)))
    .orderBy(desc(examVersions.version));
  if (versions.length === 0) return null;
  const live = versions.find((v) => v.id === row.exam.currentVersionId && v.publishedAt !== null) ?? null;
  return { id: row.exam.id, title: row.exam.title, status: row.exam.status, createdBy: row.createdBy, live, latest: versions[0], versions };
}

function versionValues(s: ExamSettings) {
  return {
    description: s.description,
    blueprint: s.blueprint,
    timeLimitMinutes: s.timeLimitMinutes,
    passMarkPercent: s.passMarkPercent,
    attemptsAllowed: s.attemptsAllowed,
    shuffleItems: s.shuffleItems,
    shuffleOptions: s.shuffleOptions,
    reviewPolicy: s.reviewPolicy,
    multipleResponseScoring: s.multipleResponseScoring,
    orderingScoring: s.orderingScoring,
    availableFrom: s.availableFrom,
    availableUntil: s.availableUntil,
  };
}

/** A new draft exam at version 1. */
export async function createExam(orgId: string, actorId: string, settings: ExamSettings, now = new Date()): Promise<string> {
  const { write } = await database();
  return write(async (tx) => {
    const [exam] = await tx.insert(exams).values({ orgId, title: settings.title, status: "draft", createdBy: actorId, createdAt: now, updatedAt: now }).returning({ id: exams.id });
    await tx.insert(examVersions).values({ orgId, examId: exam.id, version: 1, ...versionValues(settings), createdAt: now });
    await recordAudit(tx, { orgId, actorId, action: "exam.created", entityType: "exam", entityId: exam.id, detail: { version: 1, title: settings.title, items: blueprintTotal(settings.blueprint) } }, now);
    return exam.id;
  });
}

export type SaveResult = { ok: true; version: number; live: number | null } | { ok: false; reason: "not-found" };

/** An edit is saved as a new version; the live version (if any) stays as it is until this one is published. */
export async function saveExamVersion(orgId: string, actorId: string, examId: string, settings: ExamSettings, now = new Date()): Promise<SaveResult> {
  const { write } = await database();
  return write(async (tx) => {
    const exam = await getExam(orgId, examId, tx);
    if (!exam) return { ok: false, reason: "not-found" };
    const version = exam.latest.version + 1;
    await tx.insert(examVersions).values({ orgId, examId, version, ...versionValues(settings), createdAt: now });
    await tx.update(exams).set({ title: settings.title, updatedAt: now }).where(eq(exams.id, examId));
    await recordAudit(
      tx,
      {
        orgId,
        actorId,
        action: "exam.version-saved",
        entityType: "exam",
        entityId: examId,
        detail: { version, from: exam.latest.version, liveVersion: exam.live?.version ?? null, ...(exam.title !== settings.title ? { title: settings.title, previousTitle: exam.title } : {}) },
      },
      now,
    );
    return { ok: true, version, live: exam.live?.version ?? null };
  });
}

/** Topic slug → the organisation's name for it. */
async function topicNames(db: DbOrTx, orgId: string): Promise<Map<string, string>> {
  const rows = await db.select({ slug: topics.slug, name: topics.name }).from(topics).where(eq(topics.orgId, orgId));
  return new Map(rows.map((r) => [r.slug, r.name]));
}

/** Feasibility problems in the organisation's words: topics by name, not slug. */
export async function feasibility(orgId: string, blueprint: Blueprint, db?: DbOrTx): Promise<DrawProblem[]> {
  const d = db ?? (await database()).db;
  const [pool, names] = await Promise.all([loadPool(d, orgId), topicNames(d, orgId)]);
  return blueprintProblems(blueprint, pool).map((p) => {
    const name = names.get(p.topic);
    return name && p.message.startsWith(p.topic) ? { topic: p.topic, message: `${name}${p.message.slice(p.topic.length)}` } : p;
  });
}

export type PublishResult = { ok: true; version: number; restored: boolean } | { ok: false; reason: string };

/**
 * Publishes the newest version. A retired exam whose newest version is already published is
 * simply published again. Refused while the bank cannot fill the blueprint.
 */
export async function publishExam(orgId: string, actorId: string, examId: string, now = new Date()): Promise<PublishResult> {
  const { write } = await database();
  return write(async (tx) => {
    const exam = await getExam(orgId, examId, tx);
    if (!exam) return { ok: false, reason: "not-found" };
    const latest = exam.latest;
    if (latest.publishedAt !== null && exam.status === "published" && exam.live?.id === latest.id) {
      return { ok: false, reason: `Version ${latest.version} is already the published version.` };
    }
    const problems = await feasibility(orgId, blueprintOf(latest), tx);
    if (problems.length > 0) {
      return { ok: false, reason: `Version ${latest.version} cannot be published yet — the bank cannot fill its blueprint: ${problems.map((p) => p.message).join(" ")} Publish more items of ${problems.length === 1 ? "that topic" : "those topics"} or ask for fewer.` };
    }
    const restored = latest.publishedAt !== null;
    if (!restored) await tx.update(examVersions).set({ publishedAt: now }).where(eq(examVersions.id, latest.id));
    await tx.update(exams).set({ status: "published", currentVersionId: latest.id, updatedAt: now }).where(eq(exams.id, examId));
    await recordAudit(
      tx,
      { orgId, actorId, action: "exam.published", entityType: "exam", entityId: examId, detail: { version: latest.version, previousLive: exam.live?.version ?? null, from: exam.status, restored } },
      now,
    );
    return { ok: true, version: latest.version, restored };
  });
}

export type RetireResult = { ok: true } | { ok: false; reason: string };

/** No new attempts start; past attempts and results keep their version. */
export async function retireExam(orgId: string, actorId: string, examId: string, now = new Date()): Promise<RetireResult> {
  const { write } = await database();
  return write(async (tx) => {
    const exam = await getExam(orgId, examId, tx);
    if (!exam) return { ok: false, reason: "not-found" };
    if (exam.status !== "published") return { ok: false, reason: exam.status === "retired" ? "This exam is already retired." : "Only a published exam can be retired; a draft is simply never published." };
    await tx.update(exams).set({ status: "retired", updatedAt: now }).where(eq(exams.id, examId));
    await recordAudit(tx, { orgId, actorId, action: "exam.retired", entityType: "exam", entityId: examId, detail: { liveVersion: exam.live?.version ?? null } }, now);
    return { ok: true };
  });
}

export type ExamAttemptRow = {
  id: string;
  personName: string;
  version: number;
  attemptNumber: number;
  startedAt: Date;
  submittedAt: Date | null;
  closedReason: "submitted" | "deadline" | null;
  scorePercent: number | null;
  passed: boolean | null;
};

/** Every attempt at any version of the exam, newest first. */
export async function listExamAttempts(orgId: string, examId: string): Promise<ExamAttemptRow[]> {
  const { db } = await database();
  return db
    .select({
      id: attempts.id,
      personName: people.name,
      version: examVersions.version,
      attemptNumber: attempts.attemptNumber,
      startedAt: attempts.startedAt,
      submittedAt: attempts.submittedAt,
      closedReason: attempts.closedReason,
      scorePercent: attempts.scorePercent,
      passed: attempts.passed,
    })
    .from(attempts)
    .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, attempts.personId), eq(people.orgId, orgId)))
    .where(and(eq(attempts.orgId, orgId), eq(examVersions.examId, examId)))
    .orderBy(desc(attempts.startedAt), desc(attempts.id));
}

/**
 * What the exam form offers: the organisation's topics with how many published items each has
 * (so the educator sees what is feasible), and the published items for the fixed-item picker.
 */
export async function examFormChoices(orgId: string) {
  const { db } = await database();
  const [pool, topicRows] = await Promise.all([
    loadPool(db, orgId),
    db.select({ slug: topics.slug, name: topics.name }).from(topics).where(eq(topics.orgId, orgId)).orderBy(asc(topics.name)),
  ]);
  const stems = pool.length
    ? await db
        .select({ id: itemVersions.id, stem: itemVersions.stem })
        .from(itemVersions)
        .where(and(eq(itemVersions.orgId, orgId), inArray(itemVersions.id, pool.map((p) => p.itemVersionId))))
    : [];
  const stemOf = new Map(stems.map((s) => [s.id, s.stem]));
  return {
    topics: topicRows.map((t) => ({ ...t, published: pool.filter((p) => p.topics.includes(t.slug)).length })),
    items: pool.map((p) => ({ itemId: p.itemId, stem: firstWords(stemOf.get(p.itemVersionId) ?? ""), topics: p.topics })),
  };
}

/** The first dozen words of a stem, for a picker label. */
export function firstWords(stem: string, words = 12): string {
  const parts = stem.replace(/\{prompt\}/g, "").trim().split(/\s+/).filter(Boolean);
  if (parts.length === 0) return "(a scenario item from the bench)";
  return parts.length > words ? `${parts.slice(0, words).join(" ")}…` : parts.join(" ");
}

