/**
 * Exam authoring and assignment (issue 5, item 1) on a seeded copy of the demo database: writing
 * an exam, saving an edit as a new version, publishing refused while the bank cannot fill the
 * blueprint (naming the topic) and allowed once it can, retiring, who may do it, organisation
 * scoping, assigning to a unit (one open assignment per active member, holders skipped), the
 * assignment showing in the assignee's plan and on Today, cancelling, the attempts list, and
 * the audit trail.
 */
import { and, desc, eq, inArray, or } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import type { Database } from "~/db/client.server";
import { loadPool } from "~/db/queries/exam-pool.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import { assignments, attempts, auditEvents, exams, examVersions, people, personRoles, personUnits, units } from "~/db/schema";
import * as editRoute from "~/routes/bank/exam-edit";
import * as newRoute from "~/routes/bank/exam-new";
import * as examRoute from "~/routes/bank/exam";
import * as listRoute from "~/routes/bank/exams";
import * as todayRoute from "~/routes/today/index";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, outcome } from "./admin-harness";

let db: Database;
let educator: Viewer;
let therapist: Viewer;
let otherOrg: Viewer;
let modesPublished = 0;
let cyclePublished = 0;

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  therapist = await viewerFor("therapist@kestrelvalley.test");
  // An educator of another organisation (the demo's second organisation has none, so one is made up in memory).
  otherOrg = { ...(await viewerFor("admin@alderbay.test")), roles: ["educator"] };
  const pool = await loadPool(db.db, educator.org.id);
  modesPublished = pool.filter((p) => p.topics.includes("modes")).length;
  cyclePublished = pool.filter((p) => p.topics.includes("cycle-variables")).length;
});

const FORM = {
  title: "Pressure support cycling check",
  description: "Short check on how pressure support ends a breath.",
  "topics.modes": "2",
  timeLimitMinutes: "15",
  passMarkPercent: "80",
  attemptsAllowed: "2",
  shuffleItems: "on",
  shuffleOptions: "on",
  reviewPolicy: "score-and-topics",
  multipleResponseScoring: "all-or-nothing",
  orderingScoring: "exact",
  availableFrom: "",
  availableUntil: "",
};

const create = (viewer: Viewer, fields: Record<string, string | string[]>) =>
  outcome(newRoute.action(args<ArgsOf<typeof newRoute.action>>(postForm("/bank/exams/new", fields), viewer)));
const edit = (viewer: Viewer, examId: string, fields: Record<string, string | string[]>) =>
  outcome(editRoute.action(args<ArgsOf<typeof editRoute.action>>(postForm(`/bank/exams/${examId}/edit`, fields), viewer, { examId })));
const act = (viewer: Viewer, examId: string, fields: Record<string, string | string[]>) =>
  outcome(examRoute.action(args<ArgsOf<typeof examRoute.action>>(postForm(`/bank/exams/${examId}`, fields), viewer, { examId })));
const page = (viewer: Viewer, examId: string) => outcome(examRoute.loader(args<ArgsOf<typeof examRoute.loader>>(getRequest(`/bank/exams/${examId}`), viewer, { examId })));
type PageData = Awaited<ReturnType<typeof examRoute.loader>>;
const lastEvent = async () => (await db.db.select().from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1))[0];
const versionsOf = (examId: string) => db.db.select().from(examVersions).where(eq(examVersions.examId, examId)).orderBy(examVersions.version);
const openFor = (examId: string) =>
  db.db.select().from(assignments).where(and(eq(assignments.examId, examId), eq(assignments.status, "open")));

describe("writing, versioning and publishing an exam", () => {
  let examId = "";

  it("refuses bad settings with a message on each field", async () => {
    const result = await create(educator, {
      ...FORM,
      title: "",
      passMarkPercent: "0",
      attemptsAllowed: "11",
      timeLimitMinutes: "ninety",
      availableFrom: "2027-03-01",
      availableUntil: "2027-02-01",
      "difficulty.easy": "50",
      "difficulty.medium": "30",
      "topics.modes": "",
    });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "title")).toEqual(["Give the exam a title."]);
    expect(fieldErrors(result.body, "passMarkPercent")).toEqual(["The pass mark must be from 1 to 100 %."]);
    expect(fieldErrors(result.body, "attemptsAllowed")).toEqual(["Attempts allowed must be a whole number from 1 to 10."]);
    expect(fieldErrors(result.body, "timeLimitMinutes")[0]).toMatch(/whole minutes from 1 to 480/);
    expect(fieldErrors(result.body, "availableUntil")).toEqual(["The window must close on or after the day it opens."]);
    expect(fieldErrors(result.body, "difficulty")[0]).toMatch(/add up to 100 % \(it adds up to 80 %\)/);
    expect(fieldErrors(result.body, "topics")).toEqual(["Give at least one topic at least one item."]);
  });

  it("refuses a fixed item that is not a published item of the bank", async () => {
    const result = await create(educator, { ...FORM, fixed: "not-an-item" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "fixed")[0]).toMatch(/not a published item of your bank/);
  });

  it("saves a draft at version 1, not live, audited", async () => {
    expect(modesPublished).toBeGreaterThanOrEqual(2);
    const result = await create(educator, FORM);
    expect(result.status).toBe(302);
    examId = result.location!.split("/").pop()!;
    const [exam] = await db.db.select().from(exams).where(eq(exams.id, examId));
    expect(exam).toMatchObject({ orgId: educator.org.id, title: FORM.title, status: "draft", currentVersionId: null, createdBy: educator.person.id });
    const [v1] = await versionsOf(examId);
    expect(v1).toMatchObject({ version: 1, blueprint: { topics: { modes: 2 } }, timeLimitMinutes: 15, passMarkPercent: 80, attemptsAllowed: 2, shuffleItems: true, publishedAt: null });
    expect(await lastEvent()).toMatchObject({ action: "exam.created", entityId: examId, actorId: educator.person.id });
  });

  it("an edit is saved as a new version; the earlier version is untouched", async () => {
    const [before] = await versionsOf(examId);
    // More cycle-variables items than the bank has published: saved, but not publishable.
    const result = await edit(educator, examId, { ...FORM, "topics.cycle-variables": String(cyclePublished + 3), timeLimitMinutes: "", shuffleItems: [] });
    expect(result.status).toBe(302);
    const versions = await versionsOf(examId);
    expect(versions.map((v) => v.version)).toEqual([1, 2]);
    expect(versions[0]).toEqual(before);
    expect(versions[1]).toMatchObject({ timeLimitMinutes: null, shuffleItems: false, blueprint: { topics: { modes: 2, "cycle-variables": cyclePublished + 3 } } });
    expect(await lastEvent()).toMatchObject({ action: "exam.version-saved", entityId: examId });
    expect(JSON.parse((await lastEvent()).detail as string)).toMatchObject({ version: 2, from: 1, liveVersion: null });
  });

  it("refuses to publish while the bank cannot fill the blueprint, naming the topic", async () => {
    const result = await act(educator, examId, { intent: "publish" });
    expect(result.status).toBe(409);
    const message = fieldErrors(result.body, "")[0];
    expect(message).toContain(`Cycle variables asks for ${cyclePublished + 3} items`);
    expect(message).not.toContain("Modes asks");
    const [exam] = await db.db.select().from(exams).where(eq(exams.id, examId));
    expect(exam.status).toBe("draft");
    const loaded = (await page(educator, examId)).body as PageData;
    expect(loaded.latestProblems.map((p) => p.topic)).toEqual(["cycle-variables"]);
  });

  it("publishes a feasible version: live, published, audited", async () => {
    expect((await edit(educator, examId, FORM)).status).toBe(302);
    const result = await act(educator, examId, { intent: "publish" });
    expect(result.status).toBe(302);
    const versions = await versionsOf(examId);
    const [exam] = await db.db.select().from(exams).where(eq(exams.id, examId));
    expect(exam).toMatchObject({ status: "published", currentVersionId: versions[2].id });
    expect(versions[2].publishedAt).toBeInstanceOf(Date);
    expect(versions[1].publishedAt).toBeNull();
    expect(await lastEvent()).toMatchObject({ action: "exam.published", entityId: examId });
    // Publishing the live version again is refused with a reason.
    const again = await act(educator, examId, { intent: "publish" });
    expect(again.status).toBe(409);
    expect(fieldErrors(again.body, "")).toEqual(["Version 3 is already the published version."]);
  });

  it("editing a published exam leaves the live version live", async () => {
    expect((await edit(educator, examId, { ...FORM, passMarkPercent: "75" })).status).toBe(302);
    const loaded = (await page(educator, examId)).body as PageData;
    expect(loaded.live?.version).toBe(3);
    expect(loaded.latest.version).toBe(4);
    expect(loaded.versions.map((v) => v.version)).toEqual([4, 3, 2, 1]);
  });

  it("the list shows the exam with its live version, items and counts", async () => {
    const list = (await outcome(listRoute.loader(args<ArgsOf<typeof listRoute.loader>>(getRequest("/bank/exams"), educator)))).body as Awaited<ReturnType<typeof listRoute.loader>>;
    expect(list.rows.find((r) => r.id === examId)).toMatchObject({ status: "published", liveVersion: 3, latestVersion: 4, timeLimitMinutes: 15, passMarkPercent: 80, items: 2, openAssignments: 0, attempts: 0 });
    // The two seeded exams are listed too (seeds/catalogue.ts: 20 items each).
    expect(list.rows.filter((r) => r.id !== examId).map((r) => r.items)).toEqual([20, 20]);
  });

  it("retiring needs a confirmation, then stops the exam; publishing again restores it", async () => {
    expect((await act(educator, examId, { intent: "retire" })).status).toBe(400);
    expect((await act(educator, examId, { intent: "retire", confirm: "yes" })).status).toBe(302);
    expect((await db.db.select().from(exams).where(eq(exams.id, examId)))[0].status).toBe("retired");
    expect(await lastEvent()).toMatchObject({ action: "exam.retired", entityId: examId });
    // Version 4 (the newest) is published now: it becomes live.
    expect((await act(educator, examId, { intent: "publish" })).status).toBe(302);
    const [exam] = await db.db.select().from(exams).where(eq(exams.id, examId));
    expect(exam.status).toBe("published");
    expect(exam.currentVersionId).toBe((await versionsOf(examId))[3].id);
  });
});

describe("who may author and assign", () => {
  let examId = "";
  beforeAll(async () => {
    examId = (await create(educator, { ...FORM, title: "Scoping check" })).location!.split("/").pop()!;
  });

  it("a therapist's POSTs are refused with 403 and change nothing", async () => {
    expect((await create(therapist, FORM)).status).toBe(403);
    expect((await act(therapist, examId, { intent: "publish" })).status).toBe(403);
    expect((await edit(therapist, examId, FORM)).status).toBe(403);
    expect((await act(therapist, examId, { intent: "assign", to: "role", role: "therapist", dueOn: "2027-01-15" })).status).toBe(403);
    expect((await db.db.select().from(exams).where(eq(exams.id, examId)))[0].status).toBe("draft");
  });

  it("an educator of another organisation gets 404 for the exam, its edit and its actions", async () => {
    expect((await page(otherOrg, examId)).status).toBe(404);
    expect((await outcome(editRoute.loader(args<ArgsOf<typeof editRoute.loader>>(getRequest(`/bank/exams/${examId}/edit`), otherOrg, { examId })))).status).toBe(404);
    expect((await edit(otherOrg, examId, FORM)).status).toBe(404);
    expect((await act(otherOrg, examId, { intent: "publish" })).status).toBe(404);
    expect((await versionsOf(examId)).length).toBe(1);
    const list = (await outcome(listRoute.loader(args<ArgsOf<typeof listRoute.loader>>(getRequest("/bank/exams"), otherOrg)))).body as Awaited<ReturnType<typeof listRoute.loader>>;
    expect(list.rows.some((r) => r.id === examId)).toBe(false);
  });

  it("a draft exam cannot be assigned", async () => {
    const result = await act(educator, examId, { intent: "assign", to: "role", role: "therapist", dueOn: "2027-01-15" });
    expect(result.status).toBe(409);
    expect(fieldErrors(result.body, "")).toEqual(["Publish the exam before assigning it."]);
  });

  it("an unknown intent is a 400", async () => {
    expect((await act(educator, examId, { intent: "explode" })).status).toBe(400);
  });
});

describe("assigning to a unit", () => {
  let examId = "";
  let unitId = "";
  let members: string[] = [];
  let early = "";
  let inactive = "";

  beforeAll(async () => {
    examId = (await create(educator, { ...FORM, title: "Adult ICU modes refresher" })).location!.split("/").pop()!;
    expect((await act(educator, examId, { intent: "publish" })).status).toBe(302);
    [{ id: unitId }] = await db.db.select({ id: units.id }).from(units).where(and(eq(units.orgId, educator.org.id), eq(units.name, "Adult ICU")));
    // On the unit: members and everyone whose home unit it is (the plan's rule, plan.server.ts).
    const memberRows = await db.db.select({ id: personUnits.personId }).from(personUnits).where(and(eq(personUnits.unitId, unitId), eq(personUnits.relation, "member")));
    const homeRows = await db.db.select({ id: people.id }).from(people).where(and(eq(people.orgId, educator.org.id), eq(people.homeUnitId, unitId)));
    const all = [...new Set([...memberRows, ...homeRows].map((r) => r.id))];
    const active = await db.db.select({ id: people.id }).from(people).where(and(inArray(people.id, all), eq(people.active, true)));
    members = active.map((a) => a.id).sort();
    // One therapist of the unit is deactivated through the writer queue, as the admin pages do.
    const therapists = await db.db.select({ id: personRoles.personId }).from(personRoles).where(and(inArray(personRoles.personId, members), eq(personRoles.role, "therapist")));
    inactive = therapists[therapists.length - 1].id;
    await db.write(async (tx) => {
      await tx.update(people).set({ active: false }).where(eq(people.id, inactive));
    });
    members = members.filter((m) => m !== inactive);
    early = therapists[0].id;
  });

  it("refuses a due date before today, on its field", async () => {
    const result = await act(educator, examId, { intent: "assign", to: "unit", unitId, dueOn: "2020-01-01" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "dueOn")[0]).toMatch(/^The due date must be today \(\d{4}-\d{2}-\d{2}\) or later\.$/);
    expect(await openFor(examId)).toEqual([]);
  });

  it("asks which unit, and refuses another organisation's person", async () => {
    expect(fieldErrors((await act(educator, examId, { intent: "assign", to: "unit", dueOn: "2027-01-15" })).body, "unitId")).toEqual(["Choose a unit."]);
    const [stranger] = await db.db.select({ id: people.id }).from(people).where(eq(people.email, "admin@alderbay.test"));
    const result = await act(educator, examId, { intent: "assign", to: "people", personIds: [stranger.id], dueOn: "2027-01-15" });
    expect(result.status).toBe(409);
    expect(fieldErrors(result.body, "personIds")[0]).toMatch(/not an active person of your organisation/);
  });

  it("one open assignment per active member; a person who already holds one is skipped and counted", async () => {
    expect(members.length).toBeGreaterThan(3);
    expect((await act(educator, examId, { intent: "assign", to: "people", personIds: [early], dueOn: "2027-01-05" })).status).toBe(302);
    const result = await act(educator, examId, { intent: "assign", to: "unit", unitId, dueOn: "2027-01-15" });
    expect(result.status).toBe(302);
    const open = await openFor(examId);
    expect(open.map((a) => a.personId).sort()).toEqual(members);
    expect(open.some((a) => a.personId === inactive)).toBe(false);
    const fromUnit = open.filter((a) => a.viaUnitId === unitId);
    expect(fromUnit.length).toBe(members.length - 1);
    expect(fromUnit.every((a) => a.dueOn === "2027-01-15" && a.kind === "exam" && a.assignedBy === educator.person.id && a.requirementId === null)).toBe(true);
    expect(open.find((a) => a.personId === early)).toMatchObject({ dueOn: "2027-01-05", viaUnitId: null });
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "assignment.created", entityType: "exam", entityId: examId });
    expect(JSON.parse(event.detail as string)).toMatchObject({ to: "unit", unitId, created: members.length - 1, skipped: 1, dueOn: "2027-01-15" });
    // Assigning the unit again creates nothing and skips everyone.
    expect((await act(educator, examId, { intent: "assign", to: "unit", unitId, dueOn: "2027-01-20" })).status).toBe(302);
    expect((await openFor(examId)).length).toBe(members.length);
    expect(JSON.parse((await lastEvent()).detail as string)).toMatchObject({ created: 0, skipped: members.length });
  });

  it("the assignment shows in the assignee's plan and on Today with its due date", async () => {
    const person = members.find((m) => m !== early)!;
    const options = await statusOptionsFor(educator.org.id, educator.org.timeZone);
    const rows = await getPlan(educator.org.id, person, educator.org.timeZone, options);
    const row = rows!.find((r) => r.title === "Adult ICU modes refresher");
    expect(row).toMatchObject({ kind: "exam", dateMeaning: "due", result: { date: "2027-01-15" }, nextStep: "take-exam" });
    const [{ email }] = await db.db.select({ email: people.email }).from(people).where(eq(people.id, person));
    const today = (await outcome(todayRoute.loader(args<ArgsOf<typeof todayRoute.loader>>(getRequest("/today"), await viewerFor(email))))).body as Awaited<ReturnType<typeof todayRoute.loader>>;
    expect(today.work.find((w) => w.title === "Adult ICU modes refresher")?.result.date).toBe("2027-01-15");
  });

  it("links the assignment to an active exam requirement for that exam when there is one", async () => {
    // The seeded annual-exam requirement asks for the seeded annual modes exam.
    const [annual] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, educator.org.id), eq(exams.title, "Annual ventilation modes exam")));
    const [someone] = await db.db
      .select({ id: people.id })
      .from(people)
      .where(and(eq(people.orgId, educator.org.id), eq(people.active, true), eq(people.email, "educator@kestrelvalley.test")));
    expect((await act(educator, annual.id, { intent: "assign", to: "people", personIds: [someone.id], dueOn: "2027-02-01" })).status).toBe(302);
    const [made] = await db.db.select().from(assignments).where(and(eq(assignments.examId, annual.id), eq(assignments.personId, someone.id), eq(assignments.status, "open")));
    expect(made.requirementId).not.toBeNull();
  });

  it("cancelling needs a confirmation, then the assignment leaves the plan; audited", async () => {
    const [one] = (await openFor(examId)).filter((a) => a.personId !== early);
    expect((await act(educator, examId, { intent: "cancel-assignment", assignmentId: one.id })).status).toBe(400);
    expect((await act(educator, examId, { intent: "cancel-assignment", assignmentId: one.id, confirm: "yes" })).status).toBe(302);
    const [after] = await db.db.select().from(assignments).where(eq(assignments.id, one.id));
    expect(after.status).toBe("cancelled");
    expect(await lastEvent()).toMatchObject({ action: "assignment.cancelled", entityType: "assignment", entityId: one.id });
    const options = await statusOptionsFor(educator.org.id, educator.org.timeZone);
    const rows = await getPlan(educator.org.id, one.personId, educator.org.timeZone, options);
    expect(rows!.some((r) => r.title === "Adult ICU modes refresher")).toBe(false);
    // Cancelling twice is refused with a reason; another organisation's educator finds nothing.
    expect(fieldErrors((await act(educator, examId, { intent: "cancel-assignment", assignmentId: one.id, confirm: "yes" })).body, "")).toEqual(["This assignment is already cancelled."]);
    expect((await act(otherOrg, examId, { intent: "cancel-assignment", assignmentId: one.id, confirm: "yes" })).status).toBe(404);
  });

  it("the exam page lists open assignments and the attempts, newest first, each linking to its result", async () => {
    const [v] = await versionsOf(examId);
    const t0 = new Date("2026-12-01T14:00:00Z");
    await db.write(async (tx) => {
      const base = { orgId: educator.org.id, personId: early, examVersionId: v.id, seed: 7, form: [] };
      await tx.insert(attempts).values([
        { ...base, id: "attempt-first", attemptNumber: 1, startedAt: t0, deadlineAt: new Date(t0.getTime() + 15 * 60_000), submittedAt: new Date(t0.getTime() + 15 * 60_000), closedReason: "deadline", rawScore: 1, maxScore: 2, scorePercent: 50, passed: false },
        { ...base, id: "attempt-second", attemptNumber: 2, startedAt: new Date(t0.getTime() + 3_600_000), submittedAt: new Date(t0.getTime() + 3_900_000), closedReason: "submitted", rawScore: 2, maxScore: 2, scorePercent: 100, passed: true },
      ]);
    });
    const loaded = (await page(educator, examId)).body as PageData;
    expect(loaded.open.length).toBe(members.length - 1);
    expect(loaded.attempts.map((a) => [a.id, a.attemptNumber, a.closedReason, a.scorePercent, a.passed])).toEqual([
      ["attempt-second", 2, "submitted", 100, true],
      ["attempt-first", 1, "deadline", 50, false],
    ]);
  });

  it("every change is in the hash chain, which holds", async () => {
    const actions = (await db.db.select({ action: auditEvents.action }).from(auditEvents).where(or(eq(auditEvents.entityType, "exam"), eq(auditEvents.entityType, "assignment")))).map((e) => e.action);
    for (const a of ["exam.created", "exam.version-saved", "exam.published", "exam.retired", "assignment.created", "assignment.cancelled"]) expect(actions).toContain(a);
    expect((await verifyAuditChain(db.db)).whole).toBe(true);
  });
});
