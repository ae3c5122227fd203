/**
 * Team → Requirements writes: an educator or manager adds a requirement, moves its audience,
 * retires it and brings it back; each reaches (or leaves) the right people's plans and the Team
 * matrix at once, is audited, and is refused to a therapist and across organisations. Also the
 * waiver and extension dates on a matrix cell: a waiver cannot end in the past, an extension must
 * move the due date later — "today" being the organisation's calendar date.
 */
import { and, eq, gte, isNull, ne, sql } from "drizzle-orm";
import { describe, expect, it, vi } from "vitest";
import type { Viewer } from "~/auth/context";
import { auditEvents, checklists, credentialTypes, exams, extensions, people, personRoles, personUnits, regulatoryReferences, requirements, units, waivers } from "~/db/schema";
import { summariseCredentials } from "~/db/queries/credential-summary.server";
import { statusOptionsFor } from "~/db/queries/people.server";
import * as cellRoute from "~/routes/team/cell";
import * as matrixRoute from "~/routes/team/matrix";
import * as requirementsRoute from "~/routes/team/requirements";
import { decodeCells } from "~/routes/team/matrix-params";
import { TEST_TODAY } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { fieldErrors, outcome, type ArgsOf } from "./admin-harness";
import { dayOffset, plan, useTodayPlanTeamWorld } from "./today-plan-team-harness";

type MatrixData = Awaited<ReturnType<typeof matrixRoute.loader>>;
type RequirementsData = Awaited<ReturnType<typeof requirementsRoute.loader>>;
type CellData = Awaited<ReturnType<typeof cellRoute.loader>>;

const world = useTodayPlanTeamWorld();

const post = (viewer: Viewer, fields: Record<string, string>) => outcome(requirementsRoute.action(args<ArgsOf<typeof requirementsRoute.action>>(postForm("/team/requirements", fields), viewer)));
const page = async (viewer: Viewer) => (await requirementsRoute.loader(args<ArgsOf<typeof requirementsRoute.loader>>(getRequest("/team/requirements"), viewer))) as RequirementsData;
const matrix = async (viewer: Viewer, search = "") => (await matrixRoute.loader(args<ArgsOf<typeof matrixRoute.loader>>(getRequest(`/team/matrix${search}`), viewer))) as MatrixData;
const inPlan = async (viewer: Viewer, requirementId: string) => (await plan(viewer)).rows.some((r) => r.key === `requirement:${requirementId}`);

async function firstPublishedExam(orgId: string) {
  const [exam] = await world.db.db.select({ id: exams.id, title: exams.title }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.status, "published"))).limit(1);
  return exam;
}

async function firstReference(orgId: string) {
  const [ref] = await world.db.db.select({ id: regulatoryReferences.id }).from(regulatoryReferences).where(eq(regulatoryReferences.orgId, orgId)).limit(1);
  return ref;
}

/** The units a person works on (home unit and member units), as My plan reads them. */
async function unitsOf(personId: string): Promise<Set<string>> {
  const [p] = await world.db.db.select({ home: people.homeUnitId }).from(people).where(eq(people.id, personId));
  const member = await world.db.db.select({ id: personUnits.unitId }).from(personUnits).where(and(eq(personUnits.personId, personId), eq(personUnits.relation, "member")));
  return new Set([p.home, ...member.map((m) => m.id)].filter((id): id is string => !!id));
}

/** A therapist of the viewer's organisation who works on none of `exclude`, and a unit they do work on. */
async function therapistOutside(orgId: string, exclude: Set<string>): Promise<{ viewer: Viewer; unitId: string }> {
  const candidates = await world.db.db
    .select({ id: people.id, email: people.email, home: people.homeUnitId })
    .from(people)
    .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.role, "therapist")))
    .where(and(eq(people.orgId, orgId), eq(people.active, true)))
    .orderBy(people.email);
  for (const c of candidates) {
    const on = await unitsOf(c.id);
    if (c.home && on.size > 0 && ![...on].some((u) => exclude.has(u))) return { viewer: await viewerFor(c.email), unitId: c.home };
  }
  throw new Error("The seed has no therapist outside those units");
}

function baseCreate(fields: Record<string, string>): Record<string, string> {
  return { intent: "create-requirement", kind: "exam", recurrence: "every-12-months", graceDays: "0", unitId: "", role: "", regulatoryReferenceId: "", lapseLeaves: "supervised", ...fields };
}

async function requirementNamed(orgId: string, name: string) {
  return world.db.db.select().from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.name, name)));
}

async function auditCount(entityId: string, action: string): Promise<number> {
  return (await world.db.db.select({ seq: auditEvents.seq }).from(auditEvents).where(and(eq(auditEvents.entityId, entityId), eq(auditEvents.action, action)))).length;
}

describe("a requirement's life: create, move, retire, bring back", () => {
  it("an exam requirement for a unit reaches its members' plans only; moving the audience moves it; retiring removes it from plans and the matrix", async () => {
    const { educator, manager, therapist } = world.viewers;
    const orgId = educator.org.id;
    const exam = await firstPublishedExam(orgId);
    const ref = await firstReference(orgId);
    const memberUnits = await unitsOf(therapist.person.id);
    const memberUnit = therapist.person.homeUnitId!;
    const outsider = await therapistOutside(orgId, memberUnits);
    const name = "Quarterly airway clearance exam";

    // Created by an educator, for the demo therapist's home unit.
    const created = await post(educator, baseCreate({ name, examId: exam.id, unitId: memberUnit, graceDays: "14", regulatoryReferenceId: ref.id }));
    expect(created).toMatchObject({ status: 302, location: "/team/requirements" });
    const [row] = await requirementNamed(orgId, name);
    expect(row).toMatchObject({ kind: "exam", examId: exam.id, checklistId: null, credentialTypeId: null, recurrence: "every-12-months", graceDays: 14, unitId: memberUnit, role: null, regulatoryReferenceId: ref.id, active: true });
    expect(await auditCount(row.id, "requirement.created")).toBe(1);

    // In the member's plan (not yet taken: Not started), not in the outsider's.
    const mine = (await plan(therapist)).rows.find((r) => r.key === `requirement:${row.id}`);
    expect(mine?.title).toBe(name);
    expect(mine?.result.status).toBe("not-started");
    expect(await inPlan(outsider.viewer, row.id)).toBe(false);
    // And a column of the manager's matrix at once (the cached Team read is dropped by the write).
    expect((await matrix(manager)).columns.some((c) => c.id === row.id)).toBe(true);
    expect((await page(educator)).requirements.some((r) => r.id === row.id)).toBe(true);

    // A manager moves it to the outsider's unit: it leaves the member's plan and reaches the outsider's.
    const move = { intent: "update-requirement", requirementId: row.id, recurrence: "every-24-months", unitId: outsider.unitId, role: "therapist", graceDays: "14", regulatoryReferenceId: ref.id, lapseLeaves: "supervised" };
    expect(await post(manager, move)).toMatchObject({ status: 302 });
    expect(await inPlan(outsider.viewer, row.id)).toBe(true);
    expect(await inPlan(therapist, row.id)).toBe(false);
    const [moved] = await world.db.db.select().from(requirements).where(eq(requirements.id, row.id));
    expect(moved).toMatchObject({ unitId: outsider.unitId, role: "therapist", recurrence: "every-24-months" });
    const [updatedEvent] = await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, row.id), eq(auditEvents.action, "requirement.updated")));
    expect(JSON.parse(updatedEvent.detail)).toMatchObject({ changed: { unitId: { from: memberUnit, to: outsider.unitId }, role: { from: null, to: "therapist" }, recurrence: { from: "every-12-months", to: "every-24-months" } } });

    // Aimed at a role the outsider does not hold (educators), it leaves their plan and reaches the educator's.
    expect(await post(manager, { ...move, unitId: "", role: "educator" })).toMatchObject({ status: 302 });
    expect(await inPlan(outsider.viewer, row.id)).toBe(false);
    expect(await inPlan(educator, row.id)).toBe(true);

    // Everyone: unit and role both empty.
    expect(await post(manager, { ...move, unitId: "", role: "" })).toMatchObject({ status: 302 });
    expect(await inPlan(outsider.viewer, row.id)).toBe(true);
    expect(await inPlan(therapist, row.id)).toBe(true);

    // Retiring needs the second answer; then it leaves plans, the matrix and the page's active list, and is audited.
    expect((await post(educator, { intent: "retire-requirement", requirementId: row.id })).status).toBe(400);
    expect(await inPlan(therapist, row.id)).toBe(true);
    expect(await post(educator, { intent: "retire-requirement", requirementId: row.id, confirm: "yes" })).toMatchObject({ status: 302 });
    const [retired] = await world.db.db.select().from(requirements).where(eq(requirements.id, row.id));
    expect(retired.active).toBe(false);
    expect(await auditCount(row.id, "requirement.retired")).toBe(1);
    expect(await inPlan(therapist, row.id)).toBe(false);
    expect(await inPlan(outsider.viewer, row.id)).toBe(false);
    expect((await matrix(manager)).columns.some((c) => c.id === row.id)).toBe(false);
    const after = await page(educator);
    expect(after.requirements.some((r) => r.id === row.id)).toBe(false);
    expect(after.retired.map((r) => r.id)).toContain(row.id);
    // A retired requirement is changed only after it is brought back.
    expect((await post(manager, move)).status).toBe(404);

    // Brought back: it counts again.
    expect(await post(manager, { intent: "restore-requirement", requirementId: row.id })).toMatchObject({ status: 302 });
    expect(await auditCount(row.id, "requirement.restored")).toBe(1);
    expect(await inPlan(therapist, row.id)).toBe(true);
    expect((await matrix(manager)).columns.some((c) => c.id === row.id)).toBe(true);
  });

  it("retiring a credential requirement that carries a waiver keeps the waiver row, takes it out of the plan, and the Team counts stop excusing the card", async () => {
    const { educator } = world.viewers;
    const orgId = educator.org.id;
    const [w] = await world.db.db
      .select({ id: waivers.id, requirementId: waivers.requirementId, personId: waivers.personId })
      .from(waivers)
      .innerJoin(requirements, eq(requirements.id, waivers.requirementId))
      .where(and(eq(waivers.orgId, orgId), eq(requirements.active, true), eq(requirements.kind, "credential"), isNull(waivers.revokedAt), gte(waivers.endsOn, TEST_TODAY)))
      .limit(1);
    expect(w).toBeDefined();
    const options = await statusOptionsFor(orgId, educator.org.timeZone);
    const before = (await summariseCredentials(orgId, options)).get(w.personId)!;
    expect(before.waived).toBeGreaterThan(0);
    expect(await post(educator, { intent: "retire-requirement", requirementId: w.requirementId, confirm: "yes" })).toMatchObject({ status: 302 });
    try {
      expect(await world.db.db.select({ id: waivers.id }).from(waivers).where(eq(waivers.id, w.id))).toHaveLength(1);
      const [p] = await world.db.db.select({ email: people.email }).from(people).where(eq(people.id, w.personId));
      expect(await inPlan(await viewerFor(p.email), w.requirementId)).toBe(false);
      // The card is still the person's record (a plain credential row) but no waiver excuses it now.
      const after = (await summariseCredentials(orgId, options)).get(w.personId)!;
      expect(after.waived).toBe(before.waived - 1);
      expect(after.lapsed + after.dueSoon).toBe(before.lapsed + before.dueSoon + 1);
    } finally {
      expect(await post(educator, { intent: "restore-requirement", requirementId: w.requirementId })).toMatchObject({ status: 302 });
    }
    expect((await summariseCredentials(orgId, options)).get(w.personId)).toEqual(before);
  });
});

describe("who may write requirements, and what they may name", () => {
  it("a therapist's and a preceptor's POST is 403; nothing is saved", async () => {
    const exam = await firstPublishedExam(world.viewers.educator.org.id);
    const body = baseCreate({ name: "Therapist-made requirement", examId: exam.id });
    expect((await post(world.viewers.therapist, body)).status).toBe(403);
    expect((await post(await viewerFor("preceptor@kestrelvalley.test"), body)).status).toBe(403);
    expect(await requirementNamed(world.viewers.educator.org.id, "Therapist-made requirement")).toHaveLength(0);
    const [req] = await world.db.db.select({ id: requirements.id }).from(requirements).where(eq(requirements.orgId, world.viewers.educator.org.id)).limit(1);
    expect((await post(world.viewers.therapist, { intent: "retire-requirement", requirementId: req.id, confirm: "yes" })).status).toBe(403);
  });

  it("another organisation's exam, check-off, credential type, unit or reference is refused beside its field; its requirements are 404", async () => {
    const educator = world.viewers.educator;
    const ours = educator.org.id;
    const theirs = world.viewers.abManager.org.id;
    // The Alder Bay demo has no exams or check-offs of its own: give it a published one of each
    // (through the writer queue, as every write must go).
    const [theirExam] = await world.db.write((tx) => tx.insert(exams).values({ orgId: theirs, title: "Alder Bay airway exam", status: "published" }).returning({ id: exams.id }));
    const [theirList] = await world.db.write((tx) =>
      tx.insert(checklists).values({ orgId: theirs, title: "Alder Bay circuit change", skill: "Circuit change", status: "published" }).returning({ id: checklists.id }),
    );
    const [theirRef, [theirType], [theirUnit], [theirReq]] = await Promise.all([
      firstReference(theirs),
      world.db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, theirs)).limit(1),
      world.db.db.select({ id: units.id }).from(units).where(eq(units.orgId, theirs)).limit(1),
      world.db.db.select({ id: requirements.id }).from(requirements).where(eq(requirements.orgId, theirs)).limit(1),
    ]);
    const ourExam = await firstPublishedExam(ours);
    const name = "Cross-organisation attempt";
    const cases: [Record<string, string>, string, string][] = [
      [{ examId: theirExam.id }, "examId", "Choose one of your organisation's exams."],
      [{ kind: "checklist", checklistId: theirList.id }, "checklistId", "Choose one of your organisation's check-offs."],
      [{ kind: "credential", recurrence: "", credentialTypeId: theirType.id }, "credentialTypeId", "Choose one of your organisation's credential types."],
      [{ examId: ourExam.id, unitId: theirUnit.id }, "unitId", "Choose one of your organisation's units."],
      [{ examId: ourExam.id, regulatoryReferenceId: theirRef.id }, "regulatoryReferenceId", "Choose one of your organisation's references."],
    ];
    for (const [fields, field, message] of cases) {
      const out = await post(educator, baseCreate({ name, ...fields }));
      expect(out.status).toBe(400);
      expect(fieldErrors(out.body, field)).toEqual([message]);
    }
    expect(await requirementNamed(ours, name)).toHaveLength(0);
    // Their requirement cannot be changed, retired or brought back from here.
    const edit = { intent: "update-requirement", requirementId: theirReq.id, recurrence: "", unitId: "", role: "", graceDays: "0", regulatoryReferenceId: "", lapseLeaves: "supervised" };
    expect((await post(educator, edit)).status).toBe(404);
    expect((await post(educator, { intent: "retire-requirement", requirementId: theirReq.id, confirm: "yes" })).status).toBe(404);
    expect((await post(educator, { intent: "restore-requirement", requirementId: theirReq.id })).status).toBe(404);
    const [still] = await world.db.db.select().from(requirements).where(eq(requirements.id, theirReq.id));
    expect(still.active).toBe(true);
  });

  it("clear field messages: kind and target disagree, no recurrence, grace out of range, a name already in use, a draft exam", async () => {
    const educator = world.viewers.educator;
    const orgId = educator.org.id;
    const exam = await firstPublishedExam(orgId);
    const [type] = await world.db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, orgId)).limit(1);
    const check = async (fields: Record<string, string>, field: string, message: string | RegExp) => {
      const out = await post(educator, baseCreate({ name: "Messages check", ...fields }));
      expect(out.status).toBe(400);
      const errors = fieldErrors(out.body, field);
      expect(errors).toHaveLength(1);
      if (typeof message === "string") expect(errors[0]).toBe(message);
      else expect(errors[0]).toMatch(message);
    };
    await check({ examId: "" }, "examId", "Choose the exam this requirement asks for.");
    await check({ examId: exam.id, credentialTypeId: type.id }, "credentialTypeId", "This requirement is an exam; it cannot also name a credential type.");
    await check({ kind: "credential", credentialTypeId: type.id }, "recurrence", /validity rule/);
    await check({ examId: exam.id, recurrence: "" }, "recurrence", "Choose how often it recurs.");
    await check({ examId: exam.id, graceDays: "366" }, "graceDays", "At most 365 days.");
    await check({ examId: exam.id, graceDays: "-1" }, "graceDays", "A grace period cannot be negative.");
    await check({ examId: exam.id, role: "admin" }, "role", "Choose a role from the list, or any role.");
    // An active requirement's name, in other case and with spaces around it.
    const [existing] = await world.db.db.select({ name: requirements.name }).from(requirements).where(and(eq(requirements.orgId, orgId), eq(requirements.active, true))).limit(1);
    const out = await post(educator, baseCreate({ name: `  ${existing.name.toUpperCase()} `, examId: exam.id }));
    expect(out.status).toBe(400);
    expect(fieldErrors(out.body, "name")[0]).toMatch(/^An active requirement is already called/);
    // A draft exam is not offered and not accepted.
    const [draft] = await world.db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, orgId), ne(exams.status, "published"))).limit(1);
    if (draft) await check({ examId: draft.id }, "examId", /not published/);
    expect(await requirementNamed(orgId, "Messages check")).toHaveLength(0);
    // The form offers only this organisation's published exams.
    const choices = (await page(educator)).choices;
    const published = await world.db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.status, "published")));
    expect(choices.exams.map((e) => e.id).sort()).toEqual(published.map((e) => e.id).sort());
  });

  it("bringing one back is refused while another active requirement has its name", async () => {
    const educator = world.viewers.educator;
    const orgId = educator.org.id;
    const exam = await firstPublishedExam(orgId);
    const name = "Duplicate restore check";
    expect(await post(educator, baseCreate({ name, examId: exam.id }))).toMatchObject({ status: 302 });
    const [first] = await requirementNamed(orgId, name);
    expect(await post(educator, { intent: "retire-requirement", requirementId: first.id, confirm: "yes" })).toMatchObject({ status: 302 });
    // The name is free again once retired.
    expect(await post(educator, baseCreate({ name, examId: exam.id }))).toMatchObject({ status: 302 });
    const out = await post(educator, { intent: "restore-requirement", requirementId: first.id });
    expect(out.status).toBe(400);
    expect(fieldErrors(out.body, "requirementId")[0]).toMatch(/^An active requirement is already called “Duplicate restore check”/);
    const [still] = await world.db.db.select().from(requirements).where(eq(requirements.id, first.id));
    expect(still.active).toBe(false);
  });

  it("a therapist cannot open the page (Team is for educators and managers)", async () => {
    expect((await outcome(page(world.viewers.therapist))).status).toBe(403);
  });
});

describe("waiver and extension dates on a cell", () => {
  async function lapsedCell() {
    const manager = world.viewers.manager;
    const m = await matrix(manager, "?status=lapsed");
    const row = m.rows[0];
    const reqId = m.columns[decodeCells(row.cells).findIndex((c) => c?.[0] === "lapsed")].id;
    return { personId: row.id, requirementId: reqId, path: `/team/people/${row.id}/requirements/${reqId}` };
  }
  const act = (viewer: Viewer, cell: { personId: string; requirementId: string; path: string }, fields: Record<string, string>) =>
    outcome(cellRoute.action(args<ArgsOf<typeof cellRoute.action>>(postForm(cell.path, fields), viewer, { personId: cell.personId, requirementId: cell.requirementId })));
  const waiverCount = async (cell: { personId: string; requirementId: string }) =>
    (await world.db.db.select({ id: waivers.id }).from(waivers).where(and(eq(waivers.personId, cell.personId), eq(waivers.requirementId, cell.requirementId)))).length;

  it("a waiver ending before today is refused with a message and nothing is saved; one ending today is granted", async () => {
    const manager = world.viewers.manager;
    const cell = await lapsedCell();
    const before = await waiverCount(cell);
    const out = await act(manager, cell, { intent: "grant-waiver", reason: "Extended medical leave", endsOn: dayOffset(-1) });
    expect(out.status).toBe(400);
    expect(fieldErrors(out.body, "endsOn")).toEqual(["A waiver must end today or later."]);
    expect(await waiverCount(cell)).toBe(before);
    expect(await world.db.db.select({ seq: auditEvents.seq }).from(auditEvents).where(and(eq(auditEvents.action, "waiver.granted"), sql`json_extract(${auditEvents.detail}, '$.endsOn') = ${dayOffset(-1)}`))).toHaveLength(0);
    expect((await act(manager, cell, { intent: "grant-waiver", reason: "Extended medical leave", endsOn: TEST_TODAY })).status).toBe(302);
    expect(await waiverCount(cell)).toBe(before + 1);
  });

  it("'today' is the organisation's date: at 9 pm in Chicago (03:00 UTC the next day) a waiver may still end that day", async () => {
    const manager = world.viewers.manager;
    // Kestrel Valley keeps America/Chicago; on 2 December Chicago is on standard time, UTC−6
    // (US daylight saving ends the first Sunday of November: Energy Policy Act of 2005, §110).
    expect(manager.org.timeZone).toBe("America/Chicago");
    const cell = await lapsedCell();
    vi.setSystemTime(new Date(`${dayOffset(1)}T03:00:00Z`));
    try {
      const loaded = (await cellRoute.loader(args<ArgsOf<typeof cellRoute.loader>>(getRequest(cell.path), manager, { personId: cell.personId, requirementId: cell.requirementId }))) as CellData;
      expect(loaded.today).toBe(TEST_TODAY);
      expect((await act(manager, cell, { intent: "grant-waiver", reason: "Late shift paperwork", endsOn: TEST_TODAY })).status).toBe(302);
    } finally {
      vi.setSystemTime(new Date(`${TEST_TODAY}T18:00:00Z`));
    }
  });

  it("an extension must move the due date later than the current one and not into the past", async () => {
    const manager = world.viewers.manager;
    const cell = await lapsedCell();
    const loaded = (await cellRoute.loader(args<ArgsOf<typeof cellRoute.loader>>(getRequest(cell.path), manager, { personId: cell.personId, requirementId: cell.requirementId }))) as CellData;
    const count = async () => (await world.db.db.select({ id: extensions.id }).from(extensions).where(and(eq(extensions.personId, cell.personId), eq(extensions.requirementId, cell.requirementId)))).length;
    const before = await count();
    // A lapsed cell's date lies in the past, so the floor is today.
    expect(loaded.currentDue! < TEST_TODAY).toBe(true);
    const past = await act(manager, cell, { intent: "grant-extension", reason: "Course full", newDueOn: dayOffset(-1) });
    expect(past.status).toBe(400);
    expect(fieldErrors(past.body, "newDueOn")).toEqual(["The new due date must be today or later."]);
    expect(await count()).toBe(before);
    // Granted for 30 days ahead, a second extension must go beyond it.
    expect((await act(manager, cell, { intent: "grant-extension", reason: "Course full", newDueOn: dayOffset(30) })).status).toBe(302);
    const again = await act(manager, cell, { intent: "grant-extension", reason: "Still full", newDueOn: dayOffset(30) });
    expect(again.status).toBe(400);
    expect(fieldErrors(again.body, "newDueOn")[0]).toMatch(/^The new due date must be after the current one/);
    expect(await count()).toBe(before + 1);
    expect((await act(manager, cell, { intent: "grant-extension", reason: "Still full", newDueOn: dayOffset(31) })).status).toBe(302);
    expect(await count()).toBe(before + 2);
  });
});
