/**
 * My plan: loads one person's requirements, assignments, completions, credentials, waivers and
 * extensions — all scoped to the viewer's organisation — and hands them to the pure plan
 * builder (app/domain/status/plan.ts).
 */
import { and, asc, eq, inArray } from "drizzle-orm";
import { database } from "~/db/client.server";
import {
  assignments,
  attempts,
  checklists,
  checklistVersions,
  checkoffs,
  exams,
  examVersions,
  extensions,
  people,
  personRoles,
  personUnits,
  requirements,
} from "~/db/schema";
import { calendarDateIn, type StatusOptions } from "~/domain/status";
import { buildPlan, type PlanCompletion, type PlanRow } from "~/domain/status/plan";
import { loadCredentials, loadWaivers } from "./people.server";

/** What a person belongs to, for deciding which requirements apply. */
async function loadMembership(orgId: string, personId: string): Promise<{ roles: string[]; unitIds: string[] } | null> {
  const { db } = await database();
  const [person] = await db
    .select({ homeUnitId: people.homeUnitId })
    .from(people)
    .where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  if (!person) return null;
  const [roles, memberOf] = await Promise.all([
    db.select({ role: personRoles.role }).from(personRoles).where(and(eq(personRoles.orgId, orgId), eq(personRoles.personId, personId))),
    db
      .select({ unitId: personUnits.unitId })
      .from(personUnits)
      .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, personId), eq(personUnits.relation, "member"))),
  ]);
  const unitIds = new Set(memberOf.map((m) => m.unitId));
  if (person.homeUnitId) unitIds.add(person.homeUnitId);
  return { roles: roles.map((r) => r.role), unitIds: [...unitIds] };
}

/** Passed exams and check-offs signed competent, on the organisation's calendar. */
async function loadCompletions(orgId: string, personId: string, timeZone: string): Promise<PlanCompletion[]> {
  const { db } = await database();
  const [passed, signed] = await Promise.all([
    db
      .select({ refId: examVersions.examId, at: attempts.submittedAt })
      .from(attempts)
      .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
      .where(and(eq(attempts.orgId, orgId), eq(attempts.personId, personId), eq(attempts.passed, true))),
    db
      .select({ refId: checklistVersions.checklistId, at: checkoffs.signedAt })
      .from(checkoffs)
      .innerJoin(checklistVersions, and(eq(checklistVersions.id, checkoffs.checklistVersionId), eq(checklistVersions.orgId, orgId)))
      .where(
        and(
          eq(checkoffs.orgId, orgId),
          eq(checkoffs.personId, personId),
          eq(checkoffs.outcome, "competent"),
          inArray(checkoffs.status, ["signed", "acknowledged"]),
        ),
      ),
  ]);
  const out: PlanCompletion[] = [];
  for (const p of passed) if (p.at) out.push({ kind: "exam", refId: p.refId, completedOn: calendarDateIn(timeZone, p.at) });
  for (const s of signed) if (s.at) out.push({ kind: "checklist", refId: s.refId, completedOn: calendarDateIn(timeZone, s.at) });
  return out;
}

/**
 * The person's plan in due-date order, or null when `personId` is not a person of `orgId`.
 * `timeZone` is the organisation's: completion instants become its calendar dates.
 */
/** The columns of a requirement the status engine's plan reads (app/domain/status/plan.ts, PlanRequirement). */
export const PLAN_REQUIREMENT_COLUMNS = {
  id: requirements.id,
  name: requirements.name,
  kind: requirements.kind,
  examId: requirements.examId,
  checklistId: requirements.checklistId,
  credentialTypeId: requirements.credentialTypeId,
  recurrence: requirements.recurrence,
  unitId: requirements.unitId,
  role: requirements.role,
  active: requirements.active,
  graceDays: requirements.graceDays,
};

export async function getPlan(orgId: string, personId: string, timeZone: string, options: StatusOptions): Promise<PlanRow[] | null> {
  const membership = await loadMembership(orgId, personId);
  if (!membership) return null;
  const { db } = await database();
  const [reqs, held, open, completions, personWaivers, personExtensions] = await Promise.all([
    db
      .select(PLAN_REQUIREMENT_COLUMNS)
      .from(requirements)
      .where(and(eq(requirements.orgId, orgId), eq(requirements.active, true)))
      .orderBy(asc(requirements.name)),
    loadCredentials(orgId, personId),
    db
      .select({
        id: assignments.id,
        kind: assignments.kind,
        examId: assignments.examId,
        checklistId: assignments.checklistId,
        requirementId: assignments.requirementId,
        examTitle: exams.title,
        checklistTitle: checklists.title,
        dueOn: assignments.dueOn,
      })
      .from(assignments)
      .leftJoin(exams, and(eq(exams.id, assignments.examId), eq(exams.orgId, orgId)))
      .leftJoin(checklists, and(eq(checklists.id, assignments.checklistId), eq(checklists.orgId, orgId)))
      .where(and(eq(assignments.orgId, orgId), eq(assignments.personId, personId), eq(assignments.status, "open"))),
    loadCompletions(orgId, personId, timeZone),
    loadWaivers(orgId, personId),
    db
      .select({ id: extensions.id, requirementId: extensions.requirementId, newDueOn: extensions.newDueOn, reason: extensions.reason, grantedBy: extensions.grantedBy })
      .from(extensions)
      .where(and(eq(extensions.orgId, orgId), eq(extensions.personId, personId))),
  ]);
  return buildPlan(
    {
      person: membership,
      requirements: reqs,
      credentials: held,
      assignments: open.map((a) => ({
        id: a.id,
        kind: a.kind,
        refId: a.kind === "exam" ? a.examId : a.checklistId,
        requirementId: a.requirementId,
        title: (a.kind === "exam" ? a.examTitle : a.checklistTitle) ?? (a.kind === "exam" ? "Exam" : "Check-off"),
        dueOn: a.dueOn,
      })),
      completions,
      waivers: personWaivers,
      extensions: personExtensions,
    },
    options,
  );
}
