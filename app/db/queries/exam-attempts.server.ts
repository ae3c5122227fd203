/**
 * Timed exam attempts on the server: starting one (drawing its form from a stored seed),
 * saving each answer the moment it is given, closing at the server-held deadline, and grading
 * exactly once. The browser's countdown only shows the deadline; these functions enforce it.
 *
 * Every write goes through the one writer queue (`write`), so two submits of the same attempt
 * are serialised: the first grades it, the second finds it closed and returns the same result.
 */
import { and, asc, count, desc, eq, inArray, isNull, lt, sql } from "drizzle-orm";
import { database, type DbOrTx, type Tx } from "~/db/client.server";
import { recordAudit } from "~/db/audit.server";
import { assignments, attempts, domainEvents, exams, examVersions, itemVersions, requirements, responses, type Attempt } from "~/db/schema";
import type { ItemContent } from "~/domain/bank/item-content";
import { presentItem, type Key, type Presented, type Response } from "~/domain/bank/present";
import { acceptsAnswerAt, allowedSeconds, blueprintSchema, deadlineFor, drawForm, isPastDeadline, type FormEntry } from "~/domain/exams";
import { parseNumericAnswer, scoreAttempt, type AttemptScore, type ScoringPolicy } from "~/domain/scoring";
import { calendarDateIn, type IsoDate } from "~/domain/status";
import { activeAccommodationFor } from "./accommodations.server";
import { issueCertificateSoon, issuePendingCertificates } from "./certificates.server";
import { contentOf, topicsOf } from "./bank.server";
import { loadPool } from "./exam-pool.server";

/** What the save action needs of each place on the form, stored on the attempt at its start. */
export type FormShape =
  | { kind: "single" | "multiple"; optionIds: number[] }
  | { kind: "ordering"; stepIds: number[] }
  | { kind: "numeric"; unit: string }
  | { kind: "waveform-point"; fromS: number; toS: number };

export type StoredFormEntry = FormEntry & { shape: FormShape };

/** An answer as stored: the Response graded, plus the text typed for a numeric answer. */
export type StoredAnswer = Response | { kind: "numeric"; value: number; text: string };

/** What the browser sends: as graded, except a numeric answer arrives as typed text. */
export type SubmittedAnswer =
  | { kind: "single"; choice: number }
  | { kind: "multiple"; choices: number[] }
  | { kind: "numeric"; text: string }
  | { kind: "ordering"; order: number[] }
  | { kind: "waveform-point"; timeS: number };

export type Who = { orgId: string; personId: string; timeZone: string };

type VersionSettings = typeof examVersions.$inferSelect;

function policyOf(v: Pick<VersionSettings, "multipleResponseScoring" | "orderingScoring">): ScoringPolicy {
  return { multiple: v.multipleResponseScoring, ordering: v.orderingScoring };
}

/** Item contents for a set of version ids, with their topics. */
async function contentsFor(db: DbOrTx, orgId: string, versionIds: string[]): Promise<Map<string, ItemContent>> {
  if (versionIds.length === 0) return new Map();
  const rows = await db
    .select()
    .from(itemVersions)
    .where(and(eq(itemVersions.orgId, orgId), inArray(itemVersions.id, versionIds)));
  const topicMap = await topicsOf(db, versionIds);
  return new Map(rows.map((r) => [r.id, contentOf(r, topicMap.get(r.id) ?? [])]));
}

/**
 * The item as the therapist sees it in this attempt, and its key (never sent before grading).
 * Without option shuffling, options keep the author's order; ordering steps are always shuffled.
 */
export function presentEntry(content: ItemContent, entry: Pick<FormEntry, "itemSeed">, shuffleOptions: boolean): { presented: Presented; key: Key } {
  const { presented, key } = presentItem(content, entry.itemSeed);
  if (!shuffleOptions && (presented.kind === "single" || presented.kind === "multiple")) {
    return { presented: { ...presented, options: [...presented.options].sort((a, b) => a.id - b.id) }, key };
  }
  return { presented, key };
}

function shapeOf(presented: Presented, key: Key): FormShape {
  switch (presented.kind) {
    case "single":
    case "multiple":
      return { kind: presented.kind, optionIds: presented.options.map((o) => o.id) };
    case "ordering":
      return { kind: "ordering", stepIds: presented.steps.map((s) => s.id) };
    case "numeric":
      return { kind: "numeric", unit: presented.unit };
    case "waveform-point":
      return { kind: "waveform-point", fromS: presented.viewFromS, toS: presented.viewToS };
  }
  void key;
}

/** The live (highest published) version of a published exam of the organisation. */
export async function liveExamVersion(db: DbOrTx, orgId: string, examId: string) {
  const [row] = await db
    .select({ exam: exams, version: examVersions })
    .from(exams)
    .innerJoin(examVersions, eq(examVersions.examId, exams.id))
    .where(and(eq(exams.orgId, orgId), eq(exams.id, examId), eq(exams.status, "published"), sql`${examVersions.publishedAt} is not null`))
    .orderBy(desc(examVersions.version))
    .limit(1);
  return row ?? null;
}

/** The person's open assignment of this exam, if any (the soonest due). */
async function openAssignment(db: DbOrTx, orgId: string, personId: string, examId: string) {
  const [row] = await db
    .select()
    .from(assignments)
    .where(and(eq(assignments.orgId, orgId), eq(assignments.personId, personId), eq(assignments.examId, examId), eq(assignments.status, "open")))
    .orderBy(asc(assignments.dueOn))
    .limit(1);
  return row ?? null;
}

export type Eligibility =
  | { ok: true; attemptsUsed: number; attemptsAllowed: number; openAttemptId: string | null }
  | { ok: false; message: string; openAttemptId: string | null };

/**
 * May the person start a sitting of this exam today? Attempts are counted per cycle: since the
 * open assignment of this exam was given, or over all time when there is none.
 */
export async function eligibility(db: DbOrTx, who: Who, examId: string, version: VersionSettings, now: Date): Promise<Eligibility> {
  const today = calendarDateIn(who.timeZone, now);
  const mine = await db
    .select({ id: attempts.id, submittedAt: attempts.submittedAt, startedAt: attempts.startedAt, passed: attempts.passed })
    .from(attempts)
    .innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId))
    .where(and(eq(attempts.orgId, who.orgId), eq(attempts.personId, who.personId), eq(examVersions.examId, examId)))
    .orderBy(desc(attempts.startedAt));
  const open = mine.find((a) => a.submittedAt === null);
  if (open) return { ok: true, attemptsUsed: mine.length, attemptsAllowed: version.attemptsAllowed, openAttemptId: open.id };
  if (version.availableFrom && today < version.availableFrom) return { ok: false, message: `This exam opens on ${version.availableFrom}.`, openAttemptId: null };
  if (version.availableUntil && today > version.availableUntil) return { ok: false, message: `This exam closed on ${version.availableUntil}.`, openAttemptId: null };
  const assignment = await openAssignment(db, who.orgId, who.personId, examId);
  const cycle = assignment ? mine.filter((a) => a.startedAt.getTime() >= assignment.createdAt.getTime()) : mine;
  if (!assignment && cycle.some((a) => a.passed)) return { ok: false, message: "You have passed this exam. It opens again when it is next assigned to you.", openAttemptId: null };
  if (cycle.length >= version.attemptsAllowed) {
    return { ok: false, message: `You have used all ${version.attemptsAllowed} attempts allowed. Ask your educator to assign the exam again.`, openAttemptId: null };
  }
  return { ok: true, attemptsUsed: cycle.length, attemptsAllowed: version.attemptsAllowed, openAttemptId: null };
}

export type StartResult = { ok: true; attemptId: string; resumed: boolean } | { ok: false; message: string };

/** Starts a sitting (or returns the one already open): draws the form from a fresh seed. */
export async function startAttempt(who: Who, examId: string, layout: "one" | "all", now = new Date(), seed = randomSeed()): Promise<StartResult> {
  const { write } = await database();
  return write(async (tx) => {
    const live = await liveExamVersion(tx, who.orgId, examId);
    if (!live) return { ok: false, message: "This exam is not open to take." };
    const allowed = await eligibility(tx, who, examId, live.version, now);
    if (allowed.openAttemptId) return { ok: true, attemptId: allowed.openAttemptId, resumed: true };
    if (!allowed.ok) return { ok: false, message: allowed.message };

    const blueprint = blueprintSchema.parse(live.version.blueprint);
    const pool = await loadPool(tx, who.orgId);
    let form: FormEntry[];
    try {
      form = drawForm(blueprint, pool, seed, { shuffleItems: live.version.shuffleItems });
    } catch {
      return { ok: false, message: "The bank does not hold enough published items for this exam's blueprint. Tell your educator." };
    }
    const contents = await contentsFor(tx, who.orgId, form.map((f) => f.itemVersionId));
    const stored: StoredFormEntry[] = form.map((f) => {
      const { presented, key } = presentEntry(contents.get(f.itemVersionId)!, f, live.version.shuffleOptions);
      return { ...f, shape: shapeOf(presented, key) };
    });

    const accommodation = await activeAccommodationFor(tx, who.orgId, who.personId, calendarDateIn(who.timeZone, now));
    const seconds = allowedSeconds(
      live.version.timeLimitMinutes,
      accommodation ? (accommodation.kind === "untimed" ? { kind: "untimed" } : { kind: "multiplier", multiplier: accommodation.multiplier ?? 1 }) : null,
    );
    const assignment = await openAssignment(tx, who.orgId, who.personId, examId);
    const attemptId = crypto.randomUUID();
    await tx.insert(attempts).values({
      id: attemptId,
      orgId: who.orgId,
      personId: who.personId,
      examVersionId: live.version.id,
      assignmentId: assignment?.id ?? null,
      seed,
      attemptNumber: allowed.attemptsUsed + 1,
      form: stored,
      startedAt: now,
      deadlineAt: deadlineFor(now, seconds),
      allowedSeconds: seconds,
      accommodationId: accommodation?.id ?? null,
      layout,
      createdAt: now,
    });
    await tx.insert(responses).values(
      stored.map((f) => ({ orgId: who.orgId, attemptId, itemVersionId: f.itemVersionId, position: f.position, answer: null, flagged: false, savedAt: now })),
    );
    await recordAudit(
      tx,
      {
        orgId: who.orgId,
        actorId: who.personId,
        action: "attempt.started",
        entityType: "attempt",
        entityId: attemptId,
        detail: { examId, version: live.version.version, items: stored.length, seed, allowedSeconds: seconds, accommodationId: accommodation?.id ?? null },
      },
      now,
    );
    return { ok: true, attemptId, resumed: false };
  });
}

function randomSeed(): number {
  return crypto.getRandomValues(new Uint32Array(1))[0] >>> 1;
}

/** The attempt, only if it is the person's own in their organisation. */
export async function ownAttempt(db: DbOrTx, who: Pick<Who, "orgId" | "personId">, attemptId: string): Promise<Attempt | null> {
  const [row] = await db
    .select()
    .from(attempts)
    .where(and(eq(attempts.id, attemptId), eq(attempts.orgId, who.orgId), eq(attempts.personId, who.personId)));
  return row ?? null;
}

export type SaveResult =
  | { ok: true; position: number; savedAt: string }
  | { ok: false; status: 404 | 409 | 422; message: string; closed?: boolean };

/** Checks a submitted answer against the item as shown, and turns it into what is stored. */
export function checkAnswer(shape: FormShape, answer: SubmittedAnswer): { ok: true; stored: StoredAnswer } | { ok: false; message: string } {
  if (answer.kind !== shape.kind) return { ok: false, message: "This answer does not fit the question." };
  switch (answer.kind) {
    case "single": {
      const ids = (shape as { optionIds: number[] }).optionIds;
      return ids.includes(answer.choice) ? { ok: true, stored: answer } : { ok: false, message: "Choose one of the options shown." };
    }
    case "multiple": {
      const ids = (shape as { optionIds: number[] }).optionIds;
      const unique = new Set(answer.choices);
      if (unique.size !== answer.choices.length || answer.choices.some((c) => !ids.includes(c))) return { ok: false, message: "Choose among the options shown, each once." };
      return { ok: true, stored: { kind: "multiple", choices: [...unique].sort((a, b) => a - b) } };
    }
    case "ordering": {
      const ids = (shape as { stepIds: number[] }).stepIds;
      const same = answer.order.length === ids.length && [...answer.order].sort((a, b) => a - b).join(",") === [...ids].sort((a, b) => a - b).join(",");
      return same ? { ok: true, stored: answer } : { ok: false, message: "Put every step in order, each once." };
    }
    case "waveform-point": {
      const s = shape as { fromS: number; toS: number };
      if (!Number.isFinite(answer.timeS) || answer.timeS < s.fromS || answer.timeS > s.toS) return { ok: false, message: `Mark a point between ${s.fromS} s and ${s.toS} s.` };
      return { ok: true, stored: answer };
    }
    case "numeric": {
      const parsed = parseNumericAnswer(answer.text, (shape as { unit: string }).unit);
      return parsed.ok ? { ok: true, stored: { kind: "numeric", value: parsed.value, text: answer.text.trim() } } : { ok: false, message: parsed.message };
    }
  }
}

function lateMessage(deadlineAt: Date, timeZone: string): string {
  const at = new Intl.DateTimeFormat("en-GB", { timeZone, hour: "2-digit", minute: "2-digit", second: "2-digit" }).format(deadlineAt);
  return `Time ran out at ${at}. This answer arrived after the deadline and was not saved; the attempt was graded with the answers saved before then.`;
}

/**
 * Saves one answer (null clears it) and/or the flag of one place, for the person's own open
 * attempt. Late answers are refused, and the attempt is closed and graded on the spot.
 */
export async function saveAnswer(
  who: Who,
  attemptId: string,
  position: number,
  change: { answer?: SubmittedAnswer | null; flagged?: boolean },
  now = new Date(),
): Promise<SaveResult> {
  // Everything that can be checked without writing is checked on a pooled read, so the writer
  // queue holds only one guarded UPDATE per save (the exam load is many small writes at once).
  const { db, write } = await database();
  const attempt = await ownAttempt(db, who, attemptId);
  if (!attempt) return { ok: false, status: 404, message: "We could not find that attempt." };
  if (attempt.submittedAt) return { ok: false, status: 409, closed: true, message: "This attempt is closed; answers can no longer change." };
  if (!acceptsAnswerAt(attempt.deadlineAt, now)) {
    await finishAttempt(who.orgId, attemptId, "deadline", now);
    return { ok: false, status: 409, closed: true, message: lateMessage(attempt.deadlineAt!, who.timeZone) };
  }
  const entry = (attempt.form as StoredFormEntry[]).find((f) => f.position === position);
  if (!entry) return { ok: false, status: 422, message: "There is no such question in this attempt." };
  const set: Partial<typeof responses.$inferInsert> = { savedAt: now };
  if (change.answer !== undefined) {
    if (change.answer === null) set.answer = null;
    else {
      const checked = checkAnswer(entry.shape, change.answer);
      if (!checked.ok) return { ok: false, status: 422, message: checked.message };
      set.answer = checked.stored;
    }
  }
  if (change.flagged !== undefined) set.flagged = change.flagged;
  // The guard re-checks, inside the queue, that the attempt was not closed since the read above.
  // Quiet: an answer or a flag on an open attempt changes no status, so the Team pages' cached
  // assessment stays (createWriter in client.server.ts); closing and grading stay loud.
  const saved = await write((tx) =>
    tx
      .update(responses)
      .set(set)
      .where(
        and(
          eq(responses.attemptId, attemptId),
          eq(responses.position, position),
          sql`exists (select 1 from ${attempts} where ${attempts.id} = ${attemptId} and ${attempts.submittedAt} is null)`,
        ),
      )
      .returning({ position: responses.position }),
    { quiet: true },
  );
  if (saved.length === 0) return { ok: false, status: 409, closed: true, message: "This attempt was closed a moment ago; this answer was not saved." };
  return { ok: true, position, savedAt: now.toISOString() };
}

/** Remembers where the therapist is and how they prefer to see the exam. */
export async function saveView(who: Who, attemptId: string, view: { position?: number; layout?: "one" | "all" }): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const attempt = await ownAttempt(tx, who, attemptId);
    if (!attempt || attempt.submittedAt) return false;
    await tx
      .update(attempts)
      .set({ ...(view.position !== undefined ? { lastPosition: view.position } : {}), ...(view.layout ? { layout: view.layout } : {}) })
      .where(eq(attempts.id, attemptId));
    return true;
  }, { quiet: true }); // where the examinee is and how they see it: nothing a cached read shows
}

/** The stored answer as the scoring module reads it. */
export function responseOf(stored: unknown): Response | null {
  if (!stored || typeof stored !== "object") return null;
  const a = stored as StoredAnswer;
  if (a.kind === "numeric") return { kind: "numeric", value: a.value };
  return a as Response;
}

export type GradeOutcome = { attemptId: string; alreadyClosed: boolean; score: Pick<AttemptScore, "raw" | "max" | "percent" | "passed"> };

/** Grades a closed-or-closing attempt's saved answers (inside the write transaction). */
async function gradeInside(tx: Tx, attempt: Attempt, version: VersionSettings): Promise<AttemptScore> {
  const form = attempt.form as StoredFormEntry[];
  const [saved, contents] = await Promise.all([
    tx.select().from(responses).where(eq(responses.attemptId, attempt.id)),
    contentsFor(tx, attempt.orgId, form.map((f) => f.itemVersionId)),
  ]);
  const byPosition = new Map(saved.map((r) => [r.position, r]));
  const score = scoreAttempt(
    form.map((f) => {
      const content = contents.get(f.itemVersionId)!;
      return { position: f.position, key: presentEntry(content, f, version.shuffleOptions).key, response: responseOf(byPosition.get(f.position)?.answer), topics: content.topics };
    }),
    { passMarkPercent: version.passMarkPercent, policy: policyOf(version) },
  );
  for (const item of score.items) {
    await tx
      .update(responses)
      .set({ score: item.fraction })
      .where(and(eq(responses.attemptId, attempt.id), eq(responses.position, item.position)));
  }
  return score;
}

/**
 * Closes and grades an attempt exactly once: by the therapist's submit or at the deadline. A
 * second call (a double click, two devices, the sweeper) returns the first grading unchanged.
 */
export async function finishAttempt(orgId: string, attemptId: string, reason: "submitted" | "deadline", now = new Date()): Promise<GradeOutcome | null> {
  const { write } = await database();
  const outcome = await write(async (tx) => {
    const [row] = await tx
      .select({ attempt: attempts, version: examVersions })
      .from(attempts)
      .innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId))
      .where(and(eq(attempts.id, attemptId), eq(attempts.orgId, orgId)));
    if (!row) return null;
    const { attempt, version } = row;
    if (attempt.submittedAt) {
      return { attemptId, alreadyClosed: true, score: { raw: attempt.rawScore ?? 0, max: attempt.maxScore ?? 0, percent: attempt.scorePercent ?? 0, passed: attempt.passed ?? false } };
    }
    // A submit that arrives after the deadline and its grace did not beat the clock: the attempt
    // closed at its deadline (the answers saved by then are the same either way).
    const closedReason = reason === "submitted" && isPastDeadline(attempt.deadlineAt, now) ? "deadline" : reason;
    // A deadline close is dated at the deadline itself, not when the sweeper noticed.
    const closedAt = closedReason === "deadline" && attempt.deadlineAt ? new Date(Math.min(now.getTime(), attempt.deadlineAt.getTime())) : now;
    const score = await gradeInside(tx, attempt, version);
    const updated = await tx
      .update(attempts)
      .set({ submittedAt: closedAt, closedReason, rawScore: score.raw, maxScore: score.max, scorePercent: score.percent, passed: score.passed, subscores: score.subscores })
      .where(and(eq(attempts.id, attemptId), isNull(attempts.submittedAt)))
      .returning({ id: attempts.id });
    if (updated.length === 0) throw new Error("attempt closed twice");

    let requirementId: string | null = null;
    if (score.passed) {
      const assignment = attempt.assignmentId
        ? (await tx.select().from(assignments).where(eq(assignments.id, attempt.assignmentId)))[0]
        : await openAssignment(tx, orgId, attempt.personId, version.examId);
      if (assignment && assignment.status === "open") {
        await tx.update(assignments).set({ status: "completed", completedAt: closedAt }).where(eq(assignments.id, assignment.id));
      }
      requirementId = assignment?.requirementId ?? (await examRequirement(tx, orgId, version.examId));
      const [exam] = await tx.select({ title: exams.title }).from(exams).where(eq(exams.id, version.examId));
      await tx
        .insert(domainEvents)
        .values({
          orgId,
          kind: "attempt.passed",
          subjectId: attemptId,
          personId: attempt.personId,
          payload: { examId: version.examId, examVersion: version.version, title: exam?.title ?? "Exam", requirementId, scorePercent: score.percent, passedAt: closedAt.toISOString() },
          createdAt: closedAt,
        })
        .onConflictDoNothing();
    }
    await recordAudit(
      tx,
      {
        orgId,
        actorId: closedReason === "submitted" ? attempt.personId : null,
        action: closedReason === "submitted" ? "attempt.submitted" : "attempt.closed-at-deadline",
        entityType: "attempt",
        entityId: attemptId,
        detail: { raw: score.raw, max: score.max, percent: score.percent, passed: score.passed, requirementId },
      },
      now,
    );
    return { attemptId, alreadyClosed: false, score: { raw: score.raw, max: score.max, percent: score.percent, passed: score.passed } };
  });
  // The pass's certificate, once the grading has committed (its own write; the sweep retries).
  if (outcome && !outcome.alreadyClosed && outcome.score.passed) await issueCertificateSoon(attemptId, now);
  return outcome;
}

async function examRequirement(db: DbOrTx, orgId: string, examId: string): Promise<string | null> {
  const [req] = await db
    .select({ id: requirements.id })
    .from(requirements)
    .where(and(eq(requirements.orgId, orgId), eq(requirements.examId, examId), eq(requirements.active, true)))
    .limit(1);
  return req?.id ?? null;
}

/** Closes and grades every attempt whose deadline (plus the in-flight grace) has passed. */
export async function closeExpiredAttempts(now = new Date(), filter: { orgId?: string; personId?: string } = {}): Promise<number> {
  const { db } = await database();
  const graceMs = 2000;
  const where = [isNull(attempts.submittedAt), lt(attempts.deadlineAt, new Date(now.getTime() - graceMs))];
  if (filter.orgId) where.push(eq(attempts.orgId, filter.orgId));
  if (filter.personId) where.push(eq(attempts.personId, filter.personId));
  const due = await db.select({ id: attempts.id, orgId: attempts.orgId, deadlineAt: attempts.deadlineAt }).from(attempts).where(and(...where));
  let closed = 0;
  for (const a of due) {
    if (!isPastDeadline(a.deadlineAt, now)) continue;
    const outcome = await finishAttempt(a.orgId, a.id, "deadline", now);
    if (outcome && !outcome.alreadyClosed) closed++;
  }
  return closed;
}

let sweeper: ReturnType<typeof setInterval> | undefined;
/**
 * Starts the background close of expired attempts (every 5 s) once per process, so an attempt
 * is graded at its deadline even when its browser never comes back. Loaders also close a
 * person's expired attempts before reading them, so nothing waits on the timer's tick.
 */
export function ensureDeadlineSweeper(): void {
  if (sweeper || process.env.VITEST) return;
  sweeper = setInterval(() => {
    closeExpiredAttempts().catch((error) => console.error("closing expired attempts failed", error));
    // Certificates for any pass or signing whose own call did not get through (issue 9 §2).
    issuePendingCertificates().catch((error) => console.error("issuing pending certificates failed", error));
  }, 5000);
  sweeper.unref?.();
}

// ---- Reading attempts for the pages ------------------------------------------------------------

export type TakingItem = { position: number; topic: string; presented: Presented; answer: StoredAnswer | null; flagged: boolean };

export type TakingView = {
  attempt: { id: string; attemptNumber: number; deadlineAt: string | null; allowedSeconds: number | null; layout: "one" | "all"; lastPosition: number; startedAt: string };
  exam: { id: string; title: string; version: number; passMarkPercent: number };
  items: TakingItem[];
};

/** The open attempt as the therapist takes it: questions as shown and saved answers, no keys. */
export async function takingView(who: Who, attemptId: string, now = new Date()): Promise<TakingView | "closed" | null> {
  await closeExpiredAttempts(now, { orgId: who.orgId, personId: who.personId });
  const { db } = await database();
  const attempt = await ownAttempt(db, who, attemptId);
  if (!attempt) return null;
  if (attempt.submittedAt) return "closed";
  const [version] = await db.select().from(examVersions).where(eq(examVersions.id, attempt.examVersionId));
  const [exam] = await db.select({ id: exams.id, title: exams.title }).from(exams).where(eq(exams.id, version.examId));
  const form = attempt.form as StoredFormEntry[];
  const [saved, contents] = await Promise.all([
    db.select().from(responses).where(eq(responses.attemptId, attemptId)),
    contentsFor(db, who.orgId, form.map((f) => f.itemVersionId)),
  ]);
  const byPosition = new Map(saved.map((r) => [r.position, r]));
  return {
    attempt: {
      id: attempt.id,
      attemptNumber: attempt.attemptNumber,
      deadlineAt: attempt.deadlineAt?.toISOString() ?? null,
      allowedSeconds: attempt.allowedSeconds,
      layout: attempt.layout,
      lastPosition: attempt.lastPosition,
      startedAt: attempt.startedAt.toISOString(),
    },
    exam: { id: exam.id, title: exam.title, version: version.version, passMarkPercent: version.passMarkPercent },
    items: form.map((f) => ({
      position: f.position,
      topic: f.topic,
      presented: presentEntry(contents.get(f.itemVersionId)!, f, version.shuffleOptions).presented,
      answer: (byPosition.get(f.position)?.answer as StoredAnswer | null) ?? null,
      flagged: byPosition.get(f.position)?.flagged ?? false,
    })),
  };
}

export type ResultItem = {
  position: number;
  topic: string;
  presented: Presented;
  answer: StoredAnswer | null;
  fraction: number;
  key: Key;
  rationale: string;
  reference: string;
};

export type ResultView = {
  attempt: { id: string; personId: string; attemptNumber: number; startedAt: string; submittedAt: string; closedReason: "submitted" | "deadline"; allowedSeconds: number | null };
  exam: { id: string; title: string; version: number; passMarkPercent: number; reviewPolicy: VersionSettings["reviewPolicy"] };
  score: { raw: number; max: number; percent: number; passed: boolean };
  subscores: AttemptScore["subscores"] | null;
  /** Only under the full-rationale policy (or for an educator). */
  items: ResultItem[] | null;
};

/**
 * A closed attempt's result. `asEducator` shows everything; the therapist sees what the exam's
 * review policy allows: the score; the score and topic subscores; or every item with its key
 * and rationale.
 */
export async function resultView(orgId: string, attemptId: string, viewer: { personId: string; asEducator: boolean }, now = new Date()): Promise<ResultView | "open" | null> {
  const { db } = await database();
  const [row] = await db
    .select({ attempt: attempts, version: examVersions, title: exams.title })
    .from(attempts)
    .innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId))
    .innerJoin(exams, eq(exams.id, examVersions.examId))
    .where(and(eq(attempts.id, attemptId), eq(attempts.orgId, orgId)));
  if (!row) return null;
  if (!viewer.asEducator && row.attempt.personId !== viewer.personId) return null;
  let { attempt } = row;
  if (!attempt.submittedAt) {
    if (!isPastDeadline(attempt.deadlineAt, now)) return "open";
    await finishAttempt(orgId, attemptId, "deadline", now);
    [attempt] = await db.select().from(attempts).where(eq(attempts.id, attemptId));
  }
  const policy = row.version.reviewPolicy;
  const showTopics = viewer.asEducator || policy !== "score-only";
  const showItems = viewer.asEducator || policy === "full-rationale";
  let items: ResultItem[] | null = null;
  if (showItems) {
    const form = attempt.form as StoredFormEntry[];
    const [saved, contents] = await Promise.all([
      db.select().from(responses).where(eq(responses.attemptId, attemptId)),
      contentsFor(db, orgId, form.map((f) => f.itemVersionId)),
    ]);
    const byPosition = new Map(saved.map((r) => [r.position, r]));
    items = form.map((f) => {
      const content = contents.get(f.itemVersionId)!;
      const { presented, key } = presentEntry(content, f, row.version.shuffleOptions);
      const r = byPosition.get(f.position);
      return { position: f.position, topic: f.topic, presented, key, answer: (r?.answer as StoredAnswer | null) ?? null, fraction: r?.score ?? 0, rationale: content.rationale, reference: content.reference };
    });
  }
  return {
    attempt: {
      id: attempt.id,
      personId: attempt.personId,
      attemptNumber: attempt.attemptNumber,
      startedAt: attempt.startedAt.toISOString(),
      submittedAt: attempt.submittedAt!.toISOString(),
      closedReason: attempt.closedReason ?? "submitted",
      allowedSeconds: attempt.allowedSeconds,
    },
    exam: { id: row.version.examId, title: row.title, version: row.version.version, passMarkPercent: row.version.passMarkPercent, reviewPolicy: policy },
    score: { raw: attempt.rawScore ?? 0, max: attempt.maxScore ?? 0, percent: attempt.scorePercent ?? 0, passed: attempt.passed ?? false },
    subscores: showTopics ? ((attempt.subscores as AttemptScore["subscores"] | null) ?? []) : null,
    items,
  };
}

export type ExamCard = {
  examId: string;
  title: string;
  description: string | null;
  items: number;
  timeLimitMinutes: number | null;
  passMarkPercent: number;
  dueOn: IsoDate | null;
  openAttemptId: string | null;
  eligibility: Eligibility;
};

export type HistoryRow = { attemptId: string; title: string; attemptNumber: number; submittedAt: string | null; closedReason: string | null; percent: number | null; passed: boolean | null };

/** The Exams page: exams open to the person (assigned first, by due date) and their history. */
export async function examsForPerson(who: Who, now = new Date()): Promise<{ cards: ExamCard[]; history: HistoryRow[] }> {
  await closeExpiredAttempts(now, { orgId: who.orgId, personId: who.personId });
  const { db } = await database();
  const today = calendarDateIn(who.timeZone, now);
  const published = await db
    .select({ exam: exams, version: examVersions })
    .from(exams)
    .innerJoin(examVersions, eq(examVersions.examId, exams.id))
    .where(
      and(
        eq(exams.orgId, who.orgId),
        eq(exams.status, "published"),
        sql`${examVersions.version} = (select max(v2.version) from ${examVersions} v2 where v2.exam_id = ${exams.id} and v2.published_at is not null)`,
      ),
    );
  const open = await db
    .select({ examId: assignments.examId, dueOn: assignments.dueOn })
    .from(assignments)
    .where(and(eq(assignments.orgId, who.orgId), eq(assignments.personId, who.personId), eq(assignments.kind, "exam"), eq(assignments.status, "open")))
    .orderBy(asc(assignments.dueOn));
  const dueOf = new Map<string, IsoDate>();
  for (const a of open) if (a.examId && !dueOf.has(a.examId)) dueOf.set(a.examId, a.dueOn);
  const cards: ExamCard[] = [];
  for (const { exam, version } of published) {
    const e = await eligibility(db, who, exam.id, version, now);
    const assigned = dueOf.get(exam.id) ?? null;
    // Exams outside their window are listed only when assigned (so the therapist sees why).
    const inWindow = !(version.availableFrom && today < version.availableFrom) && !(version.availableUntil && today > version.availableUntil);
    if (!assigned && !inWindow) continue;
    cards.push({
      examId: exam.id,
      title: exam.title,
      description: version.description,
      items: Object.values(blueprintSchema.parse(version.blueprint).topics).reduce<number>((s, n) => s + (n ?? 0), 0),
      timeLimitMinutes: version.timeLimitMinutes,
      passMarkPercent: version.passMarkPercent,
      dueOn: assigned,
      openAttemptId: e.openAttemptId,
      eligibility: e,
    });
  }
  cards.sort((a, b) => (a.dueOn ?? "9999") .localeCompare(b.dueOn ?? "9999") || a.title.localeCompare(b.title));
  const history = await db
    .select({
      attemptId: attempts.id,
      title: exams.title,
      attemptNumber: attempts.attemptNumber,
      submittedAt: attempts.submittedAt,
      closedReason: attempts.closedReason,
      percent: attempts.scorePercent,
      passed: attempts.passed,
    })
    .from(attempts)
    .innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId))
    .innerJoin(exams, eq(exams.id, examVersions.examId))
    .where(and(eq(attempts.orgId, who.orgId), eq(attempts.personId, who.personId)))
    .orderBy(desc(attempts.startedAt))
    .limit(50);
  return { cards, history: history.map((h) => ({ ...h, submittedAt: h.submittedAt?.toISOString() ?? null })) };
}

/** Answers saved for an attempt (for tests and the bench's lost-answer count). */
export type AttemptProgress = {
  attemptId: string;
  personId: string;
  examId: string;
  examTitle: string;
  version: number;
  attemptNumber: number;
  state: "open" | "closed";
  startedAt: string;
  /** The server's deadline; null for an untimed sitting. */
  deadlineAt: string | null;
  /** Questions on the form, answered, and flagged for review. */
  total: number;
  answered: number;
  flagged: number;
  /** When the latest answer or flag reached the server. */
  lastSavedAt: string | null;
  closedReason: "submitted" | "deadline" | null;
  scorePercent: number | null;
  passed: boolean | null;
};

/**
 * Where an attempt stands, as the server holds it: what every reader of an attempt's progress
 * uses — the exam page's save reply (/exams/attempts/:id/answers) and the API's
 * /api/v1/exam-attempts/:id — so the two never disagree. An open attempt past its deadline is
 * closed and graded first, as on every read. Null: no such attempt in the organisation.
 */
export async function attemptProgress(orgId: string, attemptId: string, now = new Date()): Promise<AttemptProgress | null> {
  const { db } = await database();
  const [found] = await db
    .select({ personId: attempts.personId, submittedAt: attempts.submittedAt, deadlineAt: attempts.deadlineAt })
    .from(attempts)
    .where(and(eq(attempts.orgId, orgId), eq(attempts.id, attemptId)));
  if (!found) return null;
  if (!found.submittedAt && !acceptsAnswerAt(found.deadlineAt, now)) await finishAttempt(orgId, attemptId, "deadline", now);
  const [row] = await db
    .select({
      attempt: attempts,
      examId: exams.id,
      examTitle: exams.title,
      version: examVersions.version,
      answered: sql<number>`(select count(*) from ${responses} where ${responses.attemptId} = ${attempts.id} and ${responses.answer} is not null)`,
      flagged: sql<number>`(select count(*) from ${responses} where ${responses.attemptId} = ${attempts.id} and ${responses.flagged} = 1)`,
      lastSavedAt: sql<number | null>`(select max(${responses.savedAt}) from ${responses} where ${responses.attemptId} = ${attempts.id})`,
    })
    .from(attempts)
    .innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId))
    .innerJoin(exams, eq(exams.id, examVersions.examId))
    .where(and(eq(attempts.orgId, orgId), eq(attempts.id, attemptId)));
  if (!row) return null;
  const a = row.attempt;
  return {
    attemptId: a.id,
    personId: a.personId,
    examId: row.examId,
    examTitle: row.examTitle,
    version: row.version,
    attemptNumber: a.attemptNumber,
    state: a.submittedAt ? "closed" : "open",
    startedAt: a.startedAt.toISOString(),
    deadlineAt: a.deadlineAt?.toISOString() ?? null,
    total: (a.form as StoredFormEntry[]).length,
    answered: Number(row.answered),
    flagged: Number(row.flagged),
    lastSavedAt: row.lastSavedAt === null ? null : new Date(Number(row.lastSavedAt)).toISOString(),
    closedReason: a.closedReason,
    scorePercent: a.scorePercent,
    passed: a.passed,
  };
}

export async function answeredCount(db: DbOrTx, attemptId: string): Promise<number> {
  const [row] = await db
    .select({ n: count() })
    .from(responses)
    .where(and(eq(responses.attemptId, attemptId), sql`${responses.answer} is not null`));
  return row?.n ?? 0;
}

