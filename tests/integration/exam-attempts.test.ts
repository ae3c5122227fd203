/**
 * Timed exam attempts on a seeded copy of the demo database: starting (the drawn form, its seed
 * and server-held deadline), a taking view that carries no keys, saving each answer as it is
 * given (and refusing bad ones with a specific message), the deadline enforced by the server
 * (late answers refused, the attempt closed and graded with what was saved), grading exactly once
 * under concurrent submits, isolation between people and organisations, cross-site refusal,
 * passing (assignment completed, the plan shows the requirement met), accommodations, the
 * attempts allowed, and what each review policy shows afterwards.
 *
 * The seeded database is shared across this file: each scenario uses its own therapist. Service
 * calls take an explicit `now`; route loaders and actions run on the real clock, so scenarios that
 * go through the routes start their attempt at the real time.
 */
import { and, asc, eq, gte, inArray, ne } from "drizzle-orm";
import { RouterContextProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { sessionMiddleware } from "~/auth/gate.server";
import { SESSION_COOKIE_NAME, startSession } from "~/auth/session.server";
import type { Database } from "~/db/client.server";
import { grantAccommodation } from "~/db/queries/accommodations.server";
import { contentOf, topicsOf } from "~/db/queries/bank.server";
import {
  closeExpiredAttempts,
  eligibility,
  examsForPerson,
  finishAttempt,
  liveExamVersion,
  resultView,
  saveAnswer,
  startAttempt,
  takingView,
  type StoredFormEntry,
  type SubmittedAnswer,
  type Who,
} from "~/db/queries/exam-attempts.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import { assignments, attempts, auditEvents, domainEvents, exams, examVersions, itemVersions, people, personRoles, requirements, responses } from "~/db/schema";
import { presentItem, type Key, type Presented } from "~/domain/bank/present";
import { parseNumericAnswer } from "~/domain/scoring";
import * as answersRoute from "~/routes/exams/answers";
import * as attemptRoute from "~/routes/exams/attempt";
import * as resultRoute from "~/routes/exams/result";
import * as startRoute from "~/routes/exams/start";
import { useSeededDatabase } from "../setup/db";
import { args, contextFor, getRequest, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";

let db: Database;
let annualExamId = "";
let alarmsExamId = "";
let educator: Viewer;
let otherOrgTherapist: Viewer;
/** Kestrel Valley therapists other than the demo therapist, one per independent scenario. */
let pool: Viewer[] = [];
let next = 0;
const anotherTherapist = () => {
  const v = pool[next++];
  if (!v) throw new Error("ran out of seeded therapists for independent scenarios");
  return v;
};

const whoOf = (v: Viewer): Who => ({ orgId: v.org.id, personId: v.person.id, timeZone: v.org.timeZone });
const at = (iso: string) => new Date(iso);
const MIN = 60_000;
/** Fixed seeds so each scenario draws the same form on every run. */
const SEED = 12345;

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  const kv = educator.org.id;
  const examRows = await db.db.select({ id: exams.id, title: exams.title }).from(exams).where(eq(exams.orgId, kv));
  annualExamId = examRows.find((e) => e.title === "Annual ventilation modes exam")!.id;
  alarmsExamId = examRows.find((e) => e.title === "Alarm reasoning and waveform exam")!.id;
  const therapists = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "therapist"), eq(people.orgId, kv), eq(people.active, true), ne(people.email, "therapist@kestrelvalley.test")))
    .orderBy(asc(people.email));
  pool = await Promise.all(therapists.slice(0, 20).map((t) => viewerFor(t.email)));
  const [foreign] = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "therapist"), ne(people.orgId, kv), eq(people.active, true)))
    .orderBy(asc(people.email))
    .limit(1);
  otherOrgTherapist = await viewerFor(foreign.email);
});

// ---- helpers -------------------------------------------------------------------------------

async function attemptRow(id: string) {
  const [row] = await db.db.select().from(attempts).where(eq(attempts.id, id));
  return row;
}

async function responseRows(attemptId: string) {
  return db.db.select().from(responses).where(eq(responses.attemptId, attemptId)).orderBy(asc(responses.position));
}

async function auditFor(attemptId: string, action: string) {
  return db.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, "attempt"), eq(auditEvents.entityId, attemptId), eq(auditEvents.action, action)));
}

/**
 * The key of every place on an attempt's form, computed here from the item contents and the
 * stored item seeds with the bank's own presentation — the test may read keys, the browser may not.
 */
async function keysOf(attemptId: string): Promise<{ position: number; key: Key; presented: Presented; topics: string[] }[]> {
  const a = await attemptRow(attemptId);
  const form = a.form as StoredFormEntry[];
  const ids = form.map((f) => f.itemVersionId);
  const rows = await db.db.select().from(itemVersions).where(inArray(itemVersions.id, ids));
  const topics = await topicsOf(db.db, ids);
  const byId = new Map(rows.map((r) => [r.id, contentOf(r, topics.get(r.id) ?? [])]));
  return form.map((f) => {
    const content = byId.get(f.itemVersionId)!;
    const { key, presented } = presentItem(content, f.itemSeed);
    return { position: f.position, key, presented, topics: content.topics };
  });
}

/** A decimal-comma rendering of a number that the parser cannot read as a thousands separator ("30" → "30,0", "12.5" → "12,50"). */
const decimalComma = (n: number) => (String(n).includes(".") ? `${String(n).replace(".", ",")}0` : `${n},0`);

/** The right answer to a key, as the page would send it (numeric typed with a decimal comma and the unit). */
function rightAnswer(key: Key): SubmittedAnswer {
  switch (key.kind) {
    case "single":
      return { kind: "single", choice: key.correct };
    case "multiple":
      return { kind: "multiple", choices: key.correct };
    case "numeric":
      return { kind: "numeric", text: `${decimalComma(key.answer)} ${key.unit}` };
    case "ordering":
      return { kind: "ordering", order: key.order };
    case "waveform-point":
      return { kind: "waveform-point", timeS: (key.fromS + key.toS) / 2 };
  }
}

/** A wrong but well-formed answer to a key. */
function wrongAnswer(key: Key, presented: Presented): SubmittedAnswer {
  switch (key.kind) {
    case "single":
      return { kind: "single", choice: (presented as { options: { id: number }[] }).options.find((o) => o.id !== key.correct)!.id };
    case "multiple":
      return { kind: "multiple", choices: (presented as { options: { id: number }[] }).options.map((o) => o.id).filter((id) => !key.correct.includes(id)) };
    case "numeric":
      return { kind: "numeric", text: `${key.answer + key.tolerance + 1000}` };
    case "ordering":
      return { kind: "ordering", order: [...key.order].reverse() };
    case "waveform-point": {
      const p = presented as { viewFromS: number; viewToS: number };
      return { kind: "waveform-point", timeS: key.fromS - p.viewFromS > p.viewToS - key.toS ? p.viewFromS : p.viewToS };
    }
  }
}

const loadAttempt = (viewer: Viewer, attemptId: string) =>
  outcome(attemptRoute.loader(args<ArgsOf<typeof attemptRoute.loader>>(getRequest(`/exams/attempts/${attemptId}`), viewer, { attemptId })));
const postAttempt = (viewer: Viewer, attemptId: string, fields: Record<string, string>) =>
  outcome(attemptRoute.action(args<ArgsOf<typeof attemptRoute.action>>(postForm(`/exams/attempts/${attemptId}`, fields), viewer, { attemptId })));
const postAnswer = (viewer: Viewer, attemptId: string, fields: Record<string, string>) =>
  outcome(answersRoute.action(args<ArgsOf<typeof answersRoute.action>>(postForm(`/exams/attempts/${attemptId}/answers`, fields), viewer, { attemptId })));
const loadResult = (viewer: Viewer, attemptId: string) =>
  outcome(resultRoute.loader(args<ArgsOf<typeof resultRoute.loader>>(getRequest(`/exams/attempts/${attemptId}/result`), viewer, { attemptId })));
const loadStart = (viewer: Viewer, examId: string) =>
  outcome(startRoute.loader(args<ArgsOf<typeof startRoute.loader>>(getRequest(`/exams/${examId}/start`), viewer, { examId })));

async function started(viewer: Viewer, examId: string, now: Date, seed = SEED): Promise<string> {
  const result = await startAttempt(whoOf(viewer), examId, "one", now, seed);
  if (!result.ok) throw new Error(result.message);
  return result.attemptId;
}

async function liveVersion(examId: string) {
  return (await liveExamVersion(db.db, educator.org.id, examId))!.version;
}

// ---- 1–3, 6, 8: the demo therapist's annual exam, start to pass ------------------------------

describe("the demo therapist sits the annual exam", () => {
  let therapist: Viewer;
  let attemptId = "";
  let startedAt: Date;

  beforeAll(async () => {
    therapist = await viewerFor("therapist@kestrelvalley.test");
  });

  it("starting draws 20 items from a stored seed, with the deadline 30 minutes after the start", async () => {
    startedAt = new Date();
    const result = await startAttempt(whoOf(therapist), annualExamId, "one", startedAt, SEED);
    expect(result).toMatchObject({ ok: true, resumed: false });
    attemptId = (result as { attemptId: string }).attemptId;

    const row = await attemptRow(attemptId);
    expect(row.seed).toBe(SEED);
    expect(row.attemptNumber).toBe(1);
    expect((row.form as StoredFormEntry[]).length).toBe(20); // the seeded blueprint: 4 + 3 + 3 + 6 + 4 items
    expect(row.startedAt.getTime()).toBe(startedAt.getTime());
    // The annual exam's limit is 30 minutes (seeds/catalogue.ts); no accommodation is in force.
    expect(row.allowedSeconds).toBe(30 * 60);
    expect(row.deadlineAt!.getTime()).toBe(startedAt.getTime() + 30 * MIN);
    expect(row.submittedAt).toBeNull();

    // One response row per place on the form, empty until answered.
    const saved = await responseRows(attemptId);
    expect(saved.map((r) => r.position)).toEqual(Array.from({ length: 20 }, (_, i) => i));
    expect(saved.every((r) => r.answer === null && r.flagged === false)).toBe(true);
    expect(new Set(saved.map((r) => r.itemVersionId)).size).toBe(20);

    // Linked to the demo therapist's open assignment of the annual exam.
    const [assignment] = await db.db
      .select()
      .from(assignments)
      .where(and(eq(assignments.personId, therapist.person.id), eq(assignments.examId, annualExamId), eq(assignments.status, "open")));
    expect(row.assignmentId).toBe(assignment.id);

    const [event] = await auditFor(attemptId, "attempt.started");
    expect(event).toMatchObject({ actorId: therapist.person.id, orgId: therapist.org.id });
    expect(JSON.parse(event.detail)).toMatchObject({ examId: annualExamId, items: 20, seed: SEED, allowedSeconds: 1800 });
  });

  it("a second start resumes the same open attempt instead of drawing another", async () => {
    const again = await startAttempt(whoOf(therapist), annualExamId, "all", new Date(startedAt.getTime() + MIN), 999);
    expect(again).toEqual({ ok: true, attemptId, resumed: true });
    const mine = await db.db.select({ id: attempts.id }).from(attempts).where(eq(attempts.personId, therapist.person.id));
    expect(mine.map((m) => m.id)).toEqual([attemptId]);
    expect((await auditFor(attemptId, "attempt.started")).length).toBe(1);
    // The start page offers "Resume" for it.
    const page = await loadStart(therapist, annualExamId);
    expect((page.body as Awaited<ReturnType<typeof startRoute.loader>>).eligibility).toMatchObject({ ok: true, openAttemptId: attemptId });
  });

  it("two starts at once (a double click, two devices) draw one attempt", async () => {
    const someone = anotherTherapist();
    const now = at("2026-12-02T15:00:00Z");
    const [a, b] = await Promise.all([startAttempt(whoOf(someone), annualExamId, "one", now, 1), startAttempt(whoOf(someone), annualExamId, "one", now, 2)]);
    expect(a.ok && b.ok).toBe(true);
    const ids = [a, b].map((r) => (r as { attemptId: string }).attemptId);
    expect(ids[0]).toBe(ids[1]);
    expect([a, b].map((r) => (r as { resumed: boolean }).resumed).sort()).toEqual([false, true]);
    // Attempts from today on: the demo seed gives staff graded sittings of past years (seeds/exam-history.ts).
    const rows = await db.db.select({ id: attempts.id }).from(attempts).where(and(eq(attempts.personId, someone.person.id), gte(attempts.startedAt, now)));
    expect(rows.length).toBe(1);
  });

  it("the taking page carries the questions as shown and no keys, rationales or answer windows", async () => {
    const page = await loadAttempt(therapist, attemptId);
    expect(page.status).toBe(200);
    const view = page.body as Awaited<ReturnType<typeof attemptRoute.loader>>;
    expect(view.items.length).toBe(20);
    expect(view.attempt.deadlineAt).toBe(new Date(startedAt.getTime() + 30 * MIN).toISOString());
    assertNoKeys(view);
  });

  it("saves the right answer to every question through the save action, a numeric one typed with a decimal comma", async () => {
    const keys = await keysOf(attemptId);
    const numeric = keys.flatMap((k) => (k.key.kind === "numeric" ? [{ position: k.position, key: k.key }] : []));
    expect(numeric.length).toBeGreaterThan(0); // the fixed seed draws numeric items: the decimal comma is exercised
    for (const { position, key } of keys) {
      const answer = rightAnswer(key);
      const reply = await postAnswer(therapist, attemptId, { position: String(position), answer: JSON.stringify(answer) });
      expect(reply.status, `position ${position}`).toBe(200);
      expect(reply.body).toMatchObject({ ok: true, position });
    }
    const saved = await responseRows(attemptId);
    for (const { position, key } of numeric) {
      const stored = saved[position].answer as { kind: string; value: number; text: string };
      // "30,0 mL/cmH2O" is thirty: a single comma before fewer than three digits is a decimal comma
      // (BIPM SI Brochure, 9th ed., 2019, §5.4.4: the decimal marker is the point or the comma).
      expect(stored.kind).toBe("numeric");
      expect(stored.value).toBeCloseTo(key.answer, 9);
      expect(stored.text).toBe(`${decimalComma(key.answer)} ${key.unit}`);
    }
    expect(saved.every((r) => r.answer !== null)).toBe(true);
  });

  it("handing it in with every key passes at 100 %, completes the assignment, raises attempt.passed and meets the plan's requirement", async () => {
    const reply = await postAttempt(therapist, attemptId, { intent: "submit" });
    expect(reply.status).toBe(302);
    expect(reply.location).toBe(`/exams/attempts/${attemptId}/result`);

    const row = await attemptRow(attemptId);
    expect(row).toMatchObject({ closedReason: "submitted", passed: true, scorePercent: 100, rawScore: 20, maxScore: 20 });
    const [assignment] = await db.db.select().from(assignments).where(eq(assignments.id, row.assignmentId!));
    expect(assignment.status).toBe("completed");
    expect(assignment.completedAt!.getTime()).toBe(row.submittedAt!.getTime());

    const events = await db.db.select().from(domainEvents).where(and(eq(domainEvents.kind, "attempt.passed"), eq(domainEvents.subjectId, attemptId)));
    expect(events.length).toBe(1);
    expect(events[0]).toMatchObject({ personId: therapist.person.id });
    // Consumed right after the grading committed: its certificate is issued (tests/integration/certificates.test.ts).
    expect(events[0].processedAt).not.toBeNull();
    expect(events[0].payload).toMatchObject({ examId: annualExamId, scorePercent: 100, requirementId: assignment.requirementId });

    const [requirement] = await db.db.select().from(requirements).where(eq(requirements.id, assignment.requirementId!));
    expect(requirement.examId).toBe(annualExamId);
    const options = await statusOptionsFor(therapist.org.id, therapist.org.timeZone);
    const plan = (await getPlan(therapist.org.id, therapist.person.id, therapist.org.timeZone, options))!;
    const rowOfExam = plan.find((r) => r.requirementId === requirement.id);
    expect(rowOfExam?.result.status).toBe("current");

    // The result page (score-and-topics, the seeded policy): score and topics, no items.
    const result = await loadResult(therapist, attemptId);
    const body = result.body as Awaited<ReturnType<typeof resultRoute.loader>>;
    expect(body.own).toBe(true);
    expect(body.view!.score).toEqual({ raw: 20, max: 20, percent: 100, passed: true });
    expect(body.view!.subscores!.length).toBeGreaterThan(0);
    expect(body.view!.subscores!.every((s) => s.percent === 100)).toBe(true);
    expect(body.view!.items).toBeNull();

    // The Exams page lists the pass in the history, and the exam is not offered again until re-assigned.
    const page = await examsForPerson(whoOf(therapist), new Date());
    expect(page.history.find((h) => h.attemptId === attemptId)).toMatchObject({ title: "Annual ventilation modes exam", percent: 100, passed: true, closedReason: "submitted" });
    expect(page.cards.find((c) => c.examId === annualExamId)?.eligibility).toEqual({
      ok: false,
      message: "You have passed this exam. It opens again when it is next assigned to you.",
      openAttemptId: null,
    });

    // A closed attempt's taking page sends the therapist to the result.
    const taking = await loadAttempt(therapist, attemptId);
    expect(taking.status).toBe(302);
    expect(taking.location).toBe(`/exams/attempts/${attemptId}/result`);
    // And a save to it is refused as closed.
    const late = await postAnswer(therapist, attemptId, { position: "0", answer: "" });
    expect(late.status).toBe(409);
    expect(late.body).toMatchObject({ ok: false, closed: true, message: "This attempt is closed; answers can no longer change." });
  });

  it("another therapist cannot load, save to, hand in or read the result of the attempt", async () => {
    const intruder = anotherTherapist();
    expect((await loadAttempt(intruder, attemptId)).status).toBe(404);
    const save = await postAnswer(intruder, attemptId, { position: "0", answer: "" });
    expect(save.status).toBe(404);
    expect(save.body).toMatchObject({ ok: false, message: "We could not find that attempt." });
    expect((await postAttempt(intruder, attemptId, { intent: "submit" })).status).toBe(404);
    expect((await loadResult(intruder, attemptId)).status).toBe(404);
    expect(await resultView(intruder.org.id, attemptId, { personId: intruder.person.id, asEducator: false })).toBeNull();
  });

  it("an educator of the organisation reads the whole result; a therapist of another organisation finds nothing", async () => {
    const seen = await loadResult(educator, attemptId);
    expect(seen.status).toBe(200);
    const body = seen.body as Awaited<ReturnType<typeof resultRoute.loader>>;
    expect(body.own).toBe(false);
    expect(body.view!.attempt.personId).toBe(therapist.person.id);
    expect(body.view!.items!.length).toBe(20);
    expect(body.view!.items!.every((i) => i.fraction === 1)).toBe(true);
    // The leak check used on the taking page does find keys where they are meant to be.
    expect(() => assertNoKeys({ items: [] } as never, JSON.stringify(body.view))).toThrow();

    expect((await loadResult(otherOrgTherapist, attemptId)).status).toBe(404);
    expect((await loadAttempt(otherOrgTherapist, attemptId)).status).toBe(404);
    expect((await postAnswer(otherOrgTherapist, attemptId, { position: "0", answer: "" })).status).toBe(404);
    // Even claiming to be an educator, another organisation's viewer reads none of it.
    expect(await resultView(otherOrgTherapist.org.id, attemptId, { personId: otherOrgTherapist.person.id, asEducator: true })).toBeNull();
  });
});

/** What the taking page is sent must hold nothing that gives an answer away. */
function assertNoKeys(view: Awaited<ReturnType<typeof attemptRoute.loader>>, json = JSON.stringify(view)) {
  for (const field of ["correct", "key", "rationale", "reference", "tolerance", "window", "fromS", "toS", "itemSeed", "itemVersionId", "seed"]) {
    expect(json, `"${field}" is sent to the browser`).not.toContain(`"${field}":`);
  }
  // The only "answer" fields are the person's own saved answers: null or an answer object, never a key's number.
  expect(json).not.toMatch(/"answer":\s*-?\d/);
  for (const item of view.items) {
    expect(Object.keys(item).sort()).toEqual(["answer", "flagged", "position", "presented", "topic"]);
    const p = item.presented;
    if (p.kind === "single" || p.kind === "multiple") expect(p.options.every((o) => Object.keys(o).sort().join() === "id,text")).toBe(true);
    if (p.kind === "ordering") {
      expect(p.steps.every((s) => Object.keys(s).sort().join() === "id,text")).toBe(true);
      // Steps are never shown already in order (that would be the key).
      expect(p.steps.map((s) => s.id)).not.toEqual(p.steps.map((_, i) => i));
    }
    if (p.kind === "numeric") expect(Object.keys(p).sort()).toEqual(["decimals", "kind", "stem", "unit"]);
    if (p.kind === "waveform-point") expect(Object.keys(p).sort()).toEqual(["breaths", "kind", "stem", "viewFromS", "viewToS", "waveform"]);
  }
}

// ---- 2–3: every kind of answer, through the save action ---------------------------------------

describe("saving answers to the alarm exam (every item type)", () => {
  let therapist: Viewer;
  let attemptId = "";
  let keys: Awaited<ReturnType<typeof keysOf>> = [];
  const save = (fields: Record<string, string>) => postAnswer(therapist, attemptId, fields);

  beforeAll(async () => {
    therapist = anotherTherapist();
    attemptId = await started(therapist, alarmsExamId, new Date());
    keys = await keysOf(attemptId);
  });

  it("draws every item type with the fixed seed, and the taking view carries no keys", async () => {
    expect(new Set(keys.map((k) => k.key.kind))).toEqual(new Set(["single", "multiple", "numeric", "ordering", "waveform-point"]));
    const view = await takingView(whoOf(therapist), attemptId, new Date());
    expect(view).not.toBeNull();
    assertNoKeys(view as Awaited<ReturnType<typeof attemptRoute.loader>>);
  });

  it("stores a valid answer of each kind as given, and replies JSON ok", async () => {
    for (const kind of ["single", "multiple", "numeric", "ordering", "waveform-point"] as const) {
      const { position, presented } = keys.find((k) => k.key.kind === kind)!;
      let answer: SubmittedAnswer;
      let stored: unknown;
      switch (presented.kind) {
        case "single":
          answer = { kind: "single", choice: presented.options[2].id };
          stored = answer;
          break;
        case "multiple":
          answer = { kind: "multiple", choices: [presented.options[3].id, presented.options[0].id] };
          stored = { kind: "multiple", choices: [presented.options[3].id, presented.options[0].id].sort((a, b) => a - b) };
          break;
        case "numeric": {
          // "12,5" in the item's unit, with the unit run on and in another letter case.
          const text = ` 12,5${presented.unit.toLowerCase()} `;
          answer = { kind: "numeric", text };
          stored = { kind: "numeric", value: 12.5, text: text.trim() };
          break;
        }
        case "ordering":
          answer = { kind: "ordering", order: presented.steps.map((s) => s.id).reverse() };
          stored = answer;
          break;
        case "waveform-point":
          answer = { kind: "waveform-point", timeS: (presented.viewFromS + presented.viewToS) / 2 };
          stored = answer;
          break;
      }
      const reply = await save({ position: String(position), answer: JSON.stringify(answer), flagged: "true" });
      expect(reply.status, kind).toBe(200);
      expect(reply.body, kind).toMatchObject({ ok: true, position });
      const [row] = await db.db.select().from(responses).where(and(eq(responses.attemptId, attemptId), eq(responses.position, position)));
      expect(row.answer, kind).toEqual(stored);
      expect(row.flagged, kind).toBe(true);
    }
    // The taking page shows them again on reload (resume on any device).
    const view = (await loadAttempt(therapist, attemptId)).body as Awaited<ReturnType<typeof attemptRoute.loader>>;
    expect(view.items.filter((i) => i.answer !== null).length).toBe(5);
    expect(view.items.filter((i) => i.flagged).length).toBe(5);
  });

  it("an empty answer clears it, and the flag can be saved alone", async () => {
    const { position } = keys.find((k) => k.key.kind === "single")!;
    expect((await save({ position: String(position), answer: "" })).status).toBe(200);
    expect((await save({ position: String(position), flagged: "false" })).status).toBe(200);
    const [row] = await db.db.select().from(responses).where(and(eq(responses.attemptId, attemptId), eq(responses.position, position)));
    expect(row.answer).toBeNull();
    expect(row.flagged).toBe(false);
  });

  it("refuses a numeric answer that is not a number with the parser's message, and keeps the earlier answer", async () => {
    const { position, presented } = keys.find((k) => k.key.kind === "numeric")!;
    const unit = (presented as { unit: string }).unit;
    const reply = await save({ position: String(position), answer: JSON.stringify({ kind: "numeric", text: "twelve" }) });
    expect(reply.status).toBe(422);
    const message = (reply.body as { message: string }).message;
    expect(message).toBe(`“twelve” is not a number. Enter a number in ${unit}, such as 12.5.`);
    expect(message).toBe((parseNumericAnswer("twelve", unit) as { message: string }).message);
    // Another unit than the item's is named in the message.
    const otherUnit = unit === "mmHg" ? "kPa" : "mmHg";
    const wrongUnit = await save({ position: String(position), answer: JSON.stringify({ kind: "numeric", text: `12 ${otherUnit}` }) });
    expect(wrongUnit.status).toBe(422);
    expect((wrongUnit.body as { message: string }).message).toBe(`The answer is in ${unit}, not ${otherUnit}.`);
    // "1,234" could be a thousand or one point two: refused, not guessed (BIPM SI Brochure, 9th ed., 2019, §5.4.4).
    const ambiguous = await save({ position: String(position), answer: JSON.stringify({ kind: "numeric", text: "1,234" }) });
    expect(ambiguous.status).toBe(422);
    expect((ambiguous.body as { message: string }).message).toContain("ambiguous");
    const [row] = await db.db.select().from(responses).where(and(eq(responses.attemptId, attemptId), eq(responses.position, position)));
    expect(row.answer).toEqual({ kind: "numeric", value: 12.5, text: `12,5${unit.toLowerCase()}` });
  });

  it("refuses an option not shown, a wrong-shaped answer, a place not on the form and unreadable JSON, each with its message", async () => {
    const single = keys.find((k) => k.key.kind === "single")!;
    const multiple = keys.find((k) => k.key.kind === "multiple")!;
    const ordering = keys.find((k) => k.key.kind === "ordering")!;
    const waveform = keys.find((k) => k.key.kind === "waveform-point")!;
    const cases: [Record<string, string>, number, string][] = [
      [{ position: String(single.position), answer: JSON.stringify({ kind: "single", choice: 99 }) }, 422, "Choose one of the options shown."],
      [{ position: String(multiple.position), answer: JSON.stringify({ kind: "multiple", choices: [0, 0] }) }, 422, "Choose among the options shown, each once."],
      [{ position: String(multiple.position), answer: JSON.stringify({ kind: "multiple", choices: [0, 42] }) }, 422, "Choose among the options shown, each once."],
      [{ position: String(ordering.position), answer: JSON.stringify({ kind: "ordering", order: [0, 1] }) }, 422, "Put every step in order, each once."],
      [
        { position: String(waveform.position), answer: JSON.stringify({ kind: "waveform-point", timeS: 10_000 }) },
        422,
        `Mark a point between ${(waveform.presented as { viewFromS: number }).viewFromS} s and ${(waveform.presented as { viewToS: number }).viewToS} s.`,
      ],
      [{ position: String(single.position), answer: JSON.stringify({ kind: "numeric", text: "12" }) }, 422, "This answer does not fit the question."],
      [{ position: String(single.position), answer: JSON.stringify({ kind: "single", choice: 1, correct: 1 }) }, 422, "This answer does not fit the question."],
      [{ position: "20", answer: "" }, 422, "There is no such question in this attempt."],
      [{ position: String(single.position), answer: "{not json" }, 422, "This answer was not understood."],
      [{ position: String(single.position) }, 422, "Nothing to save: send an answer or a flag."],
      [{ answer: "" }, 422, "Say which question this answer is for."],
    ];
    for (const [fields, status, message] of cases) {
      const reply = await save(fields);
      expect(reply.status, JSON.stringify(fields)).toBe(status);
      expect(reply.body, JSON.stringify(fields)).toMatchObject({ ok: false, message });
    }
    const [row] = await db.db.select().from(responses).where(and(eq(responses.attemptId, attemptId), eq(responses.position, single.position)));
    expect(row.answer).toBeNull();
  });

  it("answers a GET of the save address with 404 (answers are only written)", async () => {
    const reply = await outcome(answersRoute.loader(args<ArgsOf<typeof answersRoute.loader>>(getRequest(`/exams/attempts/${attemptId}/answers`), therapist, { attemptId })));
    expect(reply.status).toBe(404);
  });
});

// ---- 7: cross-site ----------------------------------------------------------------------------

describe("a save from another site", () => {
  let therapist: Viewer;
  let attemptId = "";
  let cookie = "";

  beforeAll(async () => {
    therapist = anotherTherapist();
    attemptId = await started(therapist, annualExamId, new Date());
    const set = await startSession(therapist.person.id, therapist.org.id, new Request(new URL("/login/code", TEST_ORIGIN)));
    cookie = set.split(";")[0];
    expect(cookie.startsWith(`${SESSION_COOKIE_NAME}=`)).toBe(true);
  });

  /** The root middleware in front of the save action, as the server composes them. */
  async function throughMiddleware(headers: Record<string, string>) {
    const request = new Request(new URL(`/exams/attempts/${attemptId}/answers`, TEST_ORIGIN), {
      method: "POST",
      body: new URLSearchParams({ position: "0", flagged: "true" }),
      headers: { "Content-Type": "application/x-www-form-urlencoded", Cookie: cookie, ...headers },
    });
    const context = new RouterContextProvider();
    const params = { attemptId };
    let reached = false;
    const run = sessionMiddleware({ request, context, params, unstable_pattern: "" } as never, async () => {
      reached = true;
      const result = await outcome(answersRoute.action({ request, context, params } as never));
      return Response.json(result.body, { status: result.status });
    });
    return { result: await outcome(run), reached };
  }

  const flagged = async () => (await db.db.select().from(responses).where(and(eq(responses.attemptId, attemptId), eq(responses.position, 0))))[0].flagged;

  it("is refused 403 by the session middleware before the save action runs (OWASP ASVS 4.0.3 V4.2.2)", async () => {
    const foreign: Record<string, string>[] = [{ Origin: "https://elsewhere.example" }, { "Sec-Fetch-Site": "cross-site" }, {}];
    for (const headers of foreign) {
      const { result, reached } = await throughMiddleware(headers);
      expect(result.status, JSON.stringify(headers)).toBe(403);
      expect(result.body, JSON.stringify(headers)).toEqual({ message: "This request did not come from a Tidemark page, so it was refused." });
      expect(reached).toBe(false);
    }
    expect(await flagged()).toBe(false);
  });

  it("from Tidemark's own page, the same request is saved", async () => {
    const { result, reached } = await throughMiddleware({ Origin: TEST_ORIGIN });
    expect(reached).toBe(true);
    expect(result.status).toBe(200);
    expect(await flagged()).toBe(true);
  });
});

// ---- 4: the deadline ----------------------------------------------------------------------------

describe("the server-held deadline", () => {
  it("takes an answer in flight within the grace, refuses a later one with 409, and grades the attempt at its deadline with the answers saved before", async () => {
    const therapist = anotherTherapist();
    const who = whoOf(therapist);
    const t0 = at("2026-12-02T16:00:00Z");
    const attemptId = await started(therapist, annualExamId, t0);
    const keys = await keysOf(attemptId);
    const deadline = new Date(t0.getTime() + 30 * MIN);
    expect((await attemptRow(attemptId)).deadlineAt!.getTime()).toBe(deadline.getTime());

    // Three right answers during the sitting, one of them arriving 1 s after the deadline (in flight, within the 2 s grace).
    expect(await saveAnswer(who, attemptId, 0, { answer: rightAnswer(keys[0].key) }, new Date(t0.getTime() + 5 * MIN))).toMatchObject({ ok: true });
    expect(await saveAnswer(who, attemptId, 1, { answer: rightAnswer(keys[1].key) }, new Date(deadline.getTime() - 1000))).toMatchObject({ ok: true });
    expect(await saveAnswer(who, attemptId, 2, { answer: rightAnswer(keys[2].key) }, new Date(deadline.getTime() + 1000))).toMatchObject({ ok: true });

    // 3 s after the deadline: refused, and the attempt closes on the spot.
    const late = await saveAnswer(who, attemptId, 3, { answer: rightAnswer(keys[3].key) }, new Date(deadline.getTime() + 3000));
    // 16:30 UTC is 10:30 in Chicago in December (UTC−6, the IANA time zone database's America/Chicago).
    expect(late).toEqual({
      ok: false,
      status: 409,
      closed: true,
      message: "Time ran out at 10:30:00. This answer arrived after the deadline and was not saved; the attempt was graded with the answers saved before then.",
    });
    const row = await attemptRow(attemptId);
    expect(row.closedReason).toBe("deadline");
    expect(row.submittedAt!.getTime()).toBe(deadline.getTime());
    expect(row).toMatchObject({ rawScore: 3, maxScore: 20, scorePercent: 15, passed: false });
    const saved = await responseRows(attemptId);
    expect(saved[3].answer).toBeNull();
    expect(saved.map((r) => r.score)).toEqual([1, 1, 1, ...Array(17).fill(0)]);
    const [closing] = await auditFor(attemptId, "attempt.closed-at-deadline");
    expect(closing.actorId).toBeNull();
    expect(await auditFor(attemptId, "attempt.submitted")).toEqual([]);

    // A further save, and a submit, change nothing.
    expect(await saveAnswer(who, attemptId, 4, { answer: rightAnswer(keys[4].key) }, new Date(deadline.getTime() + 10 * MIN))).toMatchObject({ ok: false, status: 409 });
    expect(await finishAttempt(who.orgId, attemptId, "submitted", new Date(deadline.getTime() + 11 * MIN))).toMatchObject({ alreadyClosed: true, score: { raw: 3, percent: 15 } });
    expect((await attemptRow(attemptId)).closedReason).toBe("deadline");
  });

  it("a submit that arrives after the deadline and its grace closes the attempt at the deadline, not as handed in late", async () => {
    const therapist = anotherTherapist();
    const t0 = at("2026-12-02T16:10:00Z");
    const attemptId = await started(therapist, annualExamId, t0);
    const deadline = new Date(t0.getTime() + 30 * MIN);
    const outcome = await finishAttempt(therapist.org.id, attemptId, "submitted", new Date(deadline.getTime() + 10_000));
    expect(outcome).toMatchObject({ alreadyClosed: false, score: { raw: 0, max: 20, percent: 0, passed: false } });
    const row = await attemptRow(attemptId);
    expect(row.closedReason).toBe("deadline");
    expect(row.submittedAt!.getTime()).toBe(deadline.getTime());
    expect((await auditFor(attemptId, "attempt.closed-at-deadline")).length).toBe(1);
    expect(await auditFor(attemptId, "attempt.submitted")).toEqual([]);
  });

  it("closes and grades an expired attempt with no browser involved, and leaves attempts still in time alone", async () => {
    const gone = anotherTherapist();
    const still = anotherTherapist();
    const t0 = at("2026-12-01T10:00:00Z");
    const goneId = await started(gone, annualExamId, t0);
    const keys = await keysOf(goneId);
    await saveAnswer(whoOf(gone), goneId, 0, { answer: rightAnswer(keys[0].key) }, new Date(t0.getTime() + MIN));
    const stillId = await started(still, annualExamId, at("2026-12-01T10:20:00Z"));

    // 10:31: the first deadline (10:30) has passed but not its 2 s grace plus the sweep's margin.
    expect(await closeExpiredAttempts(at("2026-12-01T10:30:01Z"))).toBe(0);
    expect((await attemptRow(goneId)).submittedAt).toBeNull();

    const sweepAt = at("2026-12-01T10:35:00Z");
    expect(await closeExpiredAttempts(sweepAt)).toBe(1);
    const closed = await attemptRow(goneId);
    expect(closed).toMatchObject({ closedReason: "deadline", rawScore: 1, maxScore: 20, scorePercent: 5, passed: false });
    // Dated at the deadline, not when the sweep noticed.
    expect(closed.submittedAt!.toISOString()).toBe("2026-12-01T10:30:00.000Z");
    expect((await attemptRow(stillId)).submittedAt).toBeNull();
    // Running the sweep again closes nothing twice.
    expect(await closeExpiredAttempts(sweepAt)).toBe(0);
    expect((await auditFor(goneId, "attempt.closed-at-deadline")).length).toBe(1);

    // Its owner's result shows the time ran out.
    const view = await resultView(gone.org.id, goneId, { personId: gone.person.id, asEducator: false }, sweepAt);
    expect(view).toMatchObject({ attempt: { closedReason: "deadline" }, score: { raw: 1, percent: 5, passed: false } });
    // The one still in time is shown as open, not graded early.
    expect(await resultView(still.org.id, stillId, { personId: still.person.id, asEducator: false }, sweepAt)).toBe("open");
  });
});

// ---- 5: two submits at once --------------------------------------------------------------------

describe("two submits at once", () => {
  it("grade the attempt once (service calls)", async () => {
    const therapist = anotherTherapist();
    const t0 = at("2026-12-02T17:00:00Z");
    const attemptId = await started(therapist, annualExamId, t0);
    const keys = await keysOf(attemptId);
    for (const k of keys.slice(0, 10)) await saveAnswer(whoOf(therapist), attemptId, k.position, { answer: rightAnswer(k.key) }, new Date(t0.getTime() + MIN));
    const [a, b] = await Promise.all([
      finishAttempt(therapist.org.id, attemptId, "submitted", new Date(t0.getTime() + 10 * MIN)),
      finishAttempt(therapist.org.id, attemptId, "submitted", new Date(t0.getTime() + 10 * MIN + 5)),
    ]);
    expect([a!.alreadyClosed, b!.alreadyClosed].sort()).toEqual([false, true]);
    expect(a!.score).toEqual(b!.score);
    expect(a!.score).toEqual({ raw: 10, max: 20, percent: 50, passed: false });
    const events = await auditFor(attemptId, "attempt.submitted");
    expect(events.length).toBe(1);
    const row = await attemptRow(attemptId);
    expect(row.submittedAt!.toISOString()).toBe(events[0].at);
    expect(row.submittedAt!.getTime()).toBe(t0.getTime() + 10 * MIN);
  });

  it("grade the attempt once (two POSTs of the page's submit)", async () => {
    const therapist = anotherTherapist();
    const attemptId = await started(therapist, annualExamId, new Date());
    const keys = await keysOf(attemptId);
    for (const k of keys) await postAnswer(therapist, attemptId, { position: String(k.position), answer: JSON.stringify(rightAnswer(k.key)) });
    const replies = await Promise.all([postAttempt(therapist, attemptId, { intent: "submit" }), postAttempt(therapist, attemptId, { intent: "submit" })]);
    for (const r of replies) {
      expect(r.status).toBe(302);
      expect(r.location).toBe(`/exams/attempts/${attemptId}/result`);
    }
    expect((await auditFor(attemptId, "attempt.submitted")).length).toBe(1);
    const row = await attemptRow(attemptId);
    expect(row).toMatchObject({ closedReason: "submitted", scorePercent: 100, passed: true });
    expect(row.submittedAt!.toISOString()).toBe((await auditFor(attemptId, "attempt.submitted"))[0].at);
    const passedEvents = await db.db.select().from(domainEvents).where(and(eq(domainEvents.kind, "attempt.passed"), eq(domainEvents.subjectId, attemptId)));
    expect(passedEvents.length).toBe(1);
    // The person's open assignment of the annual exam was completed once, at the submit.
    const [assignment] = await db.db.select().from(assignments).where(eq(assignments.id, row.assignmentId!));
    expect(assignment).toMatchObject({ status: "completed" });
    expect(assignment.completedAt!.getTime()).toBe(row.submittedAt!.getTime());
  });
});

// ---- 9: accommodations -------------------------------------------------------------------------

describe("exam-time accommodations (WCAG 2.2 SC 2.2.1 Timing Adjustable, W3C 2023)", () => {
  it("1.5× extra time gives a 45-minute sitting of the 30-minute exam", async () => {
    const therapist = anotherTherapist();
    const accommodationId = await grantAccommodation(
      therapist.org.id,
      educator.person.id,
      { personId: therapist.person.id, kind: "multiplier", multiplier: 1.5, reason: "Documented reading accommodation", endsOn: "2027-06-30" },
      at("2026-11-30T15:00:00Z"),
    );
    const t0 = at("2026-12-02T18:00:00Z");
    const attemptId = await started(therapist, annualExamId, t0);
    const row = await attemptRow(attemptId);
    expect(row.allowedSeconds).toBe(45 * 60); // 30 min × 1.5
    expect(row.deadlineAt!.getTime()).toBe(t0.getTime() + 45 * MIN);
    expect(row.accommodationId).toBe(accommodationId);
    const [event] = await auditFor(attemptId, "attempt.started");
    expect(JSON.parse(event.detail)).toMatchObject({ allowedSeconds: 2700, accommodationId });
    // An answer at 40 minutes is in time for this person (it would be late without the accommodation).
    expect(await saveAnswer(whoOf(therapist), attemptId, 0, { flagged: true }, new Date(t0.getTime() + 40 * MIN))).toMatchObject({ ok: true });
  });

  it("an untimed sitting has no deadline, and nothing closes it", async () => {
    const therapist = anotherTherapist();
    const accommodationId = await grantAccommodation(
      therapist.org.id,
      educator.person.id,
      { personId: therapist.person.id, kind: "untimed", multiplier: null, reason: "Documented accommodation: untimed", endsOn: null },
      at("2026-11-30T15:00:00Z"),
    );
    const page = (await loadStart(therapist, annualExamId)).body as Awaited<ReturnType<typeof startRoute.loader>>;
    expect(page).toMatchObject({ standardSeconds: 1800, seconds: null, accommodation: { kind: "untimed" } });

    const t0 = at("2026-12-02T18:00:00Z");
    const attemptId = await started(therapist, annualExamId, t0);
    const row = await attemptRow(attemptId);
    expect(row).toMatchObject({ allowedSeconds: null, deadlineAt: null, accommodationId });
    const muchLater = new Date(t0.getTime() + 6 * 60 * MIN);
    await closeExpiredAttempts(muchLater, { personId: therapist.person.id });
    expect((await attemptRow(attemptId)).submittedAt).toBeNull();
    expect(await saveAnswer(whoOf(therapist), attemptId, 0, { flagged: true }, muchLater)).toMatchObject({ ok: true });
    // An educator opening the result of the attempt still being taken is told so (no redirect into someone else's exam).
    const seen = await loadResult(educator, attemptId);
    expect(seen.status).toBe(200);
    expect((seen.body as Awaited<ReturnType<typeof resultRoute.loader>>).view).toBeNull();
  });
});

// ---- 10: attempts allowed ----------------------------------------------------------------------

describe("the attempts allowed", () => {
  it("after both attempts are used without passing, the exam is refused with a clear message", async () => {
    const therapist = anotherTherapist();
    const who = whoOf(therapist);
    const version = await liveVersion(annualExamId);
    expect(version.attemptsAllowed).toBe(2);

    const first = await started(therapist, annualExamId, at("2026-12-02T19:00:00Z"));
    expect(await eligibility(db.db, who, annualExamId, version, at("2026-12-02T19:05:00Z"))).toMatchObject({ ok: true, openAttemptId: first });
    await finishAttempt(who.orgId, first, "submitted", at("2026-12-02T19:10:00Z"));
    expect(await eligibility(db.db, who, annualExamId, version, at("2026-12-02T19:11:00Z"))).toEqual({ ok: true, attemptsUsed: 1, attemptsAllowed: 2, openAttemptId: null });

    const second = await started(therapist, annualExamId, at("2026-12-02T19:20:00Z"), SEED + 1);
    expect((await attemptRow(second)).attemptNumber).toBe(2);
    await finishAttempt(who.orgId, second, "submitted", at("2026-12-02T19:30:00Z"));

    const message = "You have used all 2 attempts allowed. Ask your educator to assign the exam again.";
    expect(await eligibility(db.db, who, annualExamId, version, at("2026-12-02T19:31:00Z"))).toEqual({ ok: false, message, openAttemptId: null });
    expect(await startAttempt(who, annualExamId, "one", at("2026-12-02T19:32:00Z"), SEED + 2)).toEqual({ ok: false, message });
    const mine = await db.db.select({ id: attempts.id }).from(attempts).where(and(eq(attempts.personId, therapist.person.id), gte(attempts.startedAt, at("2026-12-02T00:00:00Z"))));
    expect(mine.length).toBe(2);
    // The assignment stays open (not passed), and the start page explains why there is no Start button.
    const [assignment] = await db.db.select().from(assignments).where(eq(assignments.id, (await attemptRow(second)).assignmentId!));
    expect(assignment.status).toBe("open");
    const page = (await loadStart(therapist, annualExamId)).body as Awaited<ReturnType<typeof startRoute.loader>>;
    expect(page.eligibility).toEqual({ ok: false, message, openAttemptId: null });
  });
});

// ---- 11: review policies ----------------------------------------------------------------------

describe("what the therapist sees afterwards, by review policy", () => {
  let therapist: Viewer;
  let attemptId = "";
  let versionId = "";

  const setPolicy = (policy: "score-only" | "score-and-topics" | "full-rationale") =>
    db.write((tx) => tx.update(examVersions).set({ reviewPolicy: policy }).where(eq(examVersions.id, versionId)));
  const mine = async () => {
    const view = await resultView(therapist.org.id, attemptId, { personId: therapist.person.id, asEducator: false }, at("2026-12-02T21:00:00Z"));
    if (view === null || view === "open") throw new Error(`unexpected ${view}`);
    return view;
  };

  beforeAll(async () => {
    therapist = anotherTherapist();
    versionId = (await liveVersion(alarmsExamId)).id;
    const t0 = at("2026-12-02T20:00:00Z");
    attemptId = await started(therapist, alarmsExamId, t0);
    const keys = await keysOf(attemptId);
    // Right on the first half of the form, wrong (but answered) on the second.
    for (const k of keys) {
      const answer = k.position < 10 ? rightAnswer(k.key) : wrongAnswer(k.key, k.presented);
      const saved = await saveAnswer(whoOf(therapist), attemptId, k.position, { answer }, new Date(t0.getTime() + MIN));
      if (!saved.ok) throw new Error(`${k.key.kind}: ${saved.message}`);
    }
    await finishAttempt(therapist.org.id, attemptId, "submitted", new Date(t0.getTime() + 20 * MIN));
  });

  it("grades half right as 50 %, not passed (pass mark 80 %)", async () => {
    const view = await mine();
    expect(view.score).toEqual({ raw: 10, max: 20, percent: 50, passed: false });
  });

  it("score only: no topics, no items", async () => {
    await setPolicy("score-only");
    try {
      const view = await mine();
      expect(view.exam.reviewPolicy).toBe("score-only");
      expect(view.subscores).toBeNull();
      expect(view.items).toBeNull();
      // The result page sends no keys either.
      const page = await loadResult(therapist, attemptId);
      const json = JSON.stringify(page.body);
      expect(json).not.toContain('"correct":');
      expect(json).not.toContain('"rationale":');
    } finally {
      await setPolicy("score-and-topics");
    }
  });

  it("score and topics (the seeded policy): each topic's subscore, no items", async () => {
    const view = await mine();
    expect(view.items).toBeNull();
    // Worked here from the keys: an item counts in each of its topics; the first ten are right.
    const keys = await keysOf(attemptId);
    const byTopic = new Map<string, { raw: number; max: number }>();
    for (const k of keys) {
      for (const topic of k.topics) {
        const t = byTopic.get(topic) ?? { raw: 0, max: 0 };
        t.max += 1;
        if (k.position < 10) t.raw += 1;
        byTopic.set(topic, t);
      }
    }
    const expected = [...byTopic.entries()].sort(([a], [b]) => (a < b ? -1 : 1));
    expect(view.subscores!.map((s) => [s.topic, { raw: s.raw, max: s.max }])).toEqual(expected);
    for (const s of view.subscores!) expect(s.percent).toBeCloseTo((100 * s.raw) / s.max, 9);
  });

  it("full rationale: every item with its key, rationale and reference, and which were right", async () => {
    await setPolicy("full-rationale");
    try {
      const view = await mine();
      const keys = await keysOf(attemptId);
      expect(view.subscores).not.toBeNull();
      expect(view.items!.length).toBe(20);
      for (const item of view.items!) {
        expect(item.key).toEqual(keys[item.position].key);
        expect(item.rationale.length).toBeGreaterThan(0);
        expect(item.reference.length).toBeGreaterThan(0);
        expect(item.fraction).toBe(item.position < 10 ? 1 : 0);
      }
    } finally {
      await setPolicy("score-and-topics");
    }
  });
});

// ---- signed out ---------------------------------------------------------------------------------

describe("signed out", () => {
  it("the taking page sends a visitor with no session to sign in", async () => {
    const reply = await outcome(attemptRoute.loader({ request: getRequest("/exams/attempts/x"), params: { attemptId: "x" }, context: contextFor(null) } as never));
    expect(reply.status).toBe(302);
    expect(reply.location).toBe("/login");
  });
});
