/**
 * The Clearance board: for one organisation (and optionally some of its units), who is
 * independent, supervised or not cleared for each skill today. The rows are read in a few bulk
 * queries, every one scoped to the organisation, and handed to the pure derivation
 * (app/domain/clearance), which judges requirements with the same status engine as My plan.
 * The board and GET /api/v1/clearances both come from `deriveBoard`, so they never disagree.
 *
 * Nothing is stored: the derivation runs on the records as they stand, kept only by
 * `cachedRead` until the next write (or 30 s), so a signed check-off shows at once.
 */
import { and, asc, eq, isNotNull, isNull } from "drizzle-orm";
import type { Viewer } from "~/auth/context";
import { database } from "~/db/client.server";
import { cachedRead } from "~/db/read-cache.server";
import {
  assignments,
  attempts,
  checklists,
  checklistVersions,
  checkoffs,
  credentials,
  credentialTypes,
  examVersions,
  extensions,
  orientationPlanItems,
  orientationPlans,
  people,
  personRoles,
  personUnits,
  requirements,
  units,
  waivers,
} from "~/db/schema";
import { deriveClearances, type ClearanceCell, type ClearancePersonInput, type ClearanceRequirement, type Skill, type SkillCheckoff } from "~/domain/clearance";
import { calendarDateIn, type IsoDate, type StatusOptions } from "~/domain/status";
import type { PlanAssignment, PlanCompletion, PlanCredential, PlanExtension, PlanWaiver } from "~/domain/status/plan";
import { statusOptionsFor } from "./people.server";
import { PLAN_REQUIREMENT_COLUMNS } from "./plan.server";

export type BoardUnit = { id: string; name: string };
export type BoardPerson = { id: string; name: string; title: string | null; homeUnitId: string | null; cells: ClearanceCell[] };
export type UnitBoard = { unit: BoardUnit; people: BoardPerson[] };
export type ClearanceBoard = {
  today: IsoDate;
  /** When the board was derived (the instant of the request). */
  derivedAt: Date;
  /** Every skill (published checklist) of the organisation, by name; `boards` hold only the filtered ones. */
  skills: Skill[];
  boards: UnitBoard[];
};

/** Who sees which units' boards: managers and educators all of their organisation's; others their own units. */
export async function clearanceUnitsFor(viewer: Pick<Viewer, "org" | "person" | "roles">): Promise<BoardUnit[]> {
  const { db } = await database();
  const all = await db
    .select({ id: units.id, name: units.name })
    .from(units)
    .where(and(eq(units.orgId, viewer.org.id), eq(units.active, true)))
    .orderBy(asc(units.name));
  if (viewer.roles.includes("manager") || viewer.roles.includes("educator")) return all;
  const member = await db
    .select({ unitId: personUnits.unitId })
    .from(personUnits)
    .where(and(eq(personUnits.orgId, viewer.org.id), eq(personUnits.personId, viewer.person.id), eq(personUnits.relation, "member")));
  const own = new Set(member.map((m) => m.unitId));
  if (viewer.person.homeUnitId) own.add(viewer.person.homeUnitId);
  return all.filter((u) => own.has(u.id));
}

const byName = new Intl.Collator("en", { sensitivity: "base" }).compare;

function groupBy<T>(rows: readonly T[], key: (row: T) => string): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const r of rows) {
    const k = key(r);
    const list = out.get(k);
    if (list) list.push(r);
    else out.set(k, [r]);
  }
  return out;
}

/** Everything the derivation needs for one organisation, in bulk, scoped to it. */
async function readBoardRows(orgId: string) {
  const { db } = await database();
  return Promise.all([
    db.select({ id: units.id, name: units.name }).from(units).where(and(eq(units.orgId, orgId), eq(units.active, true))).orderBy(asc(units.name)),
    db
      .select({ checklistId: checklists.id, name: checklists.skill })
      .from(checklists)
      .where(and(eq(checklists.orgId, orgId), eq(checklists.status, "published"))),
    db
      .select({ id: people.id, name: people.name, title: people.title, homeUnitId: people.homeUnitId })
      .from(people)
      .where(and(eq(people.orgId, orgId), eq(people.active, true))),
    db.select({ personId: personRoles.personId, role: personRoles.role }).from(personRoles).where(eq(personRoles.orgId, orgId)),
    db
      .select({ personId: personUnits.personId, unitId: personUnits.unitId })
      .from(personUnits)
      .where(and(eq(personUnits.orgId, orgId), eq(personUnits.relation, "member"))),
    db
      .select({ ...PLAN_REQUIREMENT_COLUMNS, lapseLeaves: requirements.lapseLeaves })
      .from(requirements)
      .where(and(eq(requirements.orgId, orgId), eq(requirements.active, true)))
      .orderBy(asc(requirements.name)),
    db
      .select({
        id: credentials.id,
        personId: credentials.personId,
        credentialTypeId: credentials.credentialTypeId,
        typeName: credentialTypes.name,
        number: credentials.number,
        issuer: credentials.issuer,
        issuedOn: credentials.issuedOn,
        validThrough: credentials.validThrough,
        verifiedAt: credentials.verifiedAt,
      })
      .from(credentials)
      .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
      .where(eq(credentials.orgId, orgId)),
    db
      .select({ personId: checkoffs.personId, checklistId: checklistVersions.checklistId, status: checkoffs.status, outcome: checkoffs.outcome, signedAt: checkoffs.signedAt, practiceBy: checkoffs.practiceBy })
      .from(checkoffs)
      .innerJoin(checklistVersions, and(eq(checklistVersions.id, checkoffs.checklistVersionId), eq(checklistVersions.orgId, orgId)))
      .where(eq(checkoffs.orgId, orgId)),
    db
      .select({ personId: attempts.personId, examId: examVersions.examId, at: attempts.submittedAt })
      .from(attempts)
      .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
      .where(and(eq(attempts.orgId, orgId), eq(attempts.passed, true), isNotNull(attempts.submittedAt))),
    db
      .select({ id: assignments.id, personId: assignments.personId, kind: assignments.kind, examId: assignments.examId, checklistId: assignments.checklistId, requirementId: assignments.requirementId, dueOn: assignments.dueOn })
      .from(assignments)
      .where(and(eq(assignments.orgId, orgId), eq(assignments.status, "open"))),
    db
      .select({ id: waivers.id, personId: waivers.personId, requirementId: waivers.requirementId, endsOn: waivers.endsOn, reason: waivers.reason, grantedBy: waivers.grantedBy })
      .from(waivers)
      .where(and(eq(waivers.orgId, orgId), isNull(waivers.revokedAt))),
    db
      .select({ id: extensions.id, personId: extensions.personId, requirementId: extensions.requirementId, newDueOn: extensions.newDueOn, reason: extensions.reason, grantedBy: extensions.grantedBy })
      .from(extensions)
      .where(eq(extensions.orgId, orgId)),
    db
      .select({ personId: orientationPlans.personId, endsOn: orientationPlans.endsOn, checklistId: orientationPlanItems.checklistId })
      .from(orientationPlans)
      .innerJoin(orientationPlanItems, and(eq(orientationPlanItems.planId, orientationPlans.id), eq(orientationPlanItems.orgId, orgId)))
      .where(and(eq(orientationPlans.orgId, orgId), eq(orientationPlans.status, "active"), eq(orientationPlanItems.kind, "checklist"))),
  ]);
}

/** The people who appear on a board: those holding the therapist role (preceptors and educators hold it too). */
const ON_BOARD_ROLE = "therapist";

async function buildBoard(orgId: string, timeZone: string, options: Required<StatusOptions>, derivedAt: Date): Promise<ClearanceBoard> {
  const [unitRows, skillRows, personRows, roleRows, memberRows, reqRows, credRows, checkoffRows, passedRows, assignmentRows, waiverRows, extensionRows, orientationRows] =
    await readBoardRows(orgId);
  const skills: Skill[] = [...skillRows].sort((a, b) => byName(a.name, b.name) || (a.checklistId < b.checklistId ? -1 : 1));
  const reqs: ClearanceRequirement[] = reqRows.map((r) => ({ ...r, graceDays: Number(r.graceDays ?? 0) }));
  const roles = groupBy(roleRows, (r) => r.personId);
  const members = groupBy(memberRows, (r) => r.personId);
  const creds = groupBy(credRows, (r) => r.personId);
  const offs = groupBy(checkoffRows, (r) => r.personId);
  const passed = groupBy(passedRows, (r) => r.personId);
  const assigned = groupBy(assignmentRows, (r) => r.personId);
  const waived = groupBy(waiverRows, (r) => r.personId);
  const extended = groupBy(extensionRows, (r) => r.personId);
  const oriented = groupBy(orientationRows, (r) => r.personId);
  const boards = new Map<string, UnitBoard>(unitRows.map((u) => [u.id, { unit: u, people: [] }]));

  for (const p of [...personRows].sort((a, b) => byName(a.name, b.name) || (a.id < b.id ? -1 : 1))) {
    const personRolesList = (roles.get(p.id) ?? []).map((r) => r.role);
    if (!personRolesList.includes(ON_BOARD_ROLE)) continue;
    const unitIds = [...new Set([...(p.homeUnitId ? [p.homeUnitId] : []), ...(members.get(p.id) ?? []).map((m) => m.unitId)])].filter((id) => boards.has(id));
    if (unitIds.length === 0) continue;
    const skillCheckoffs: SkillCheckoff[] = (offs.get(p.id) ?? []).map((c) => ({
      checklistId: c.checklistId,
      status: c.status,
      outcome: c.outcome,
      signedAt: c.signedAt ? c.signedAt.getTime() : null,
      signedOn: c.signedAt ? calendarDateIn(timeZone, c.signedAt) : null,
      practiceBy: c.practiceBy,
    }));
    // My plan's completions: passed exams and check-offs signed competent, on the organisation's calendar.
    const completions: PlanCompletion[] = [
      ...(passed.get(p.id) ?? []).map((a) => ({ kind: "exam" as const, refId: a.examId, completedOn: calendarDateIn(timeZone, a.at!) })),
      ...skillCheckoffs
        .filter((c) => c.outcome === "competent" && (c.status === "signed" || c.status === "acknowledged") && c.signedOn)
        .map((c) => ({ kind: "checklist" as const, refId: c.checklistId, completedOn: c.signedOn! })),
    ];
    const heldCredentials: PlanCredential[] = (creds.get(p.id) ?? []).map((c) => ({
      id: c.id,
      credentialTypeId: c.credentialTypeId,
      typeName: c.typeName,
      number: c.number,
      issuer: c.issuer,
      issuedOn: c.issuedOn,
      validThrough: c.validThrough,
      verified: c.verifiedAt !== null,
    }));
    const open: PlanAssignment[] = (assigned.get(p.id) ?? []).map((a) => ({ id: a.id, kind: a.kind, refId: a.kind === "exam" ? a.examId : a.checklistId, requirementId: a.requirementId, title: "", dueOn: a.dueOn }));
    const personWaivers: PlanWaiver[] = (waived.get(p.id) ?? []).map((w) => ({ id: w.id, requirementId: w.requirementId, endsOn: w.endsOn, reason: w.reason, grantedBy: w.grantedBy }));
    const personExtensions: PlanExtension[] = (extended.get(p.id) ?? []).map((e) => ({ id: e.id, requirementId: e.requirementId, newDueOn: e.newDueOn, reason: e.reason, grantedBy: e.grantedBy }));
    const plans = groupBy(oriented.get(p.id) ?? [], (o) => o.endsOn);
    const input: ClearancePersonInput = {
      plan: { person: { roles: personRolesList, unitIds }, requirements: reqs, credentials: heldCredentials, assignments: open, completions, waivers: personWaivers, extensions: personExtensions },
      checkoffs: skillCheckoffs,
      orientations: [...plans].map(([endsOn, items]) => ({ endsOn, checklistIds: items.map((i) => i.checklistId).filter((id): id is string => id !== null) })),
    };
    const cells = deriveClearances(input, unitIds, skills, options);
    const byUnit = groupBy(cells, (c) => c.unitId);
    for (const unitId of unitIds) {
      boards.get(unitId)!.people.push({ id: p.id, name: p.name, title: p.title, homeUnitId: p.homeUnitId, cells: byUnit.get(unitId) ?? [] });
    }
  }
  return { today: options.today, derivedAt, skills, boards: [...boards.values()] };
}

export type BoardFilter = {
  /** Units to show (already limited to what the viewer may see); null: every unit. */
  unitIds: readonly string[] | null;
  /** One skill (a checklist id), or null for every skill. */
  checklistId: string | null;
};

/**
 * The organisation's board on the day of `now`, filtered. Derived once per write (or 30 s) per
 * organisation and day, then filtered per request.
 */
export async function deriveBoard(orgId: string, timeZone: string, filter: BoardFilter, now: Date = new Date()): Promise<ClearanceBoard> {
  const options = await statusOptionsFor(orgId, timeZone, now);
  const key = JSON.stringify(["clearance-board", orgId, timeZone, options]);
  const board = await cachedRead(await database(), key, () => buildBoard(orgId, timeZone, options, now));
  const keepUnit = (id: string) => filter.unitIds === null || filter.unitIds.includes(id);
  const keepSkill = (id: string) => filter.checklistId === null || filter.checklistId === id;
  return {
    ...board,
    boards: board.boards
      .filter((b) => keepUnit(b.unit.id))
      .map((b) => ({ ...b, people: b.people.map((p) => ({ ...p, cells: p.cells.filter((c) => keepSkill(c.checklistId)) })) })),
  };
}

/** The board's cells as flat rows with a stable id (person, unit, skill), for the API. */
export function flattenBoard(board: ClearanceBoard): (ClearanceCell & { id: string; personId: string })[] {
  const out: (ClearanceCell & { id: string; personId: string })[] = [];
  for (const b of board.boards) for (const p of b.people) for (const c of p.cells) out.push({ ...c, id: `${p.id}.${c.unitId}.${c.checklistId}`, personId: p.id });
  return out.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}
