/**
 * Who a person is and what is recorded about them, for Today and My plan, and the short lines
 * of counts Today shows per role. Every function takes the signed-in viewer's organisation id
 * first and never reads another organisation's rows.
 */
import { and, asc, eq, isNull, lt, sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import {
  assignments,
  credentials,
  credentialTypes,
  organisations,
  orientationPlanItems,
  orientationPlans,
  people,
  personRoles,
  personUnits,
  units,
  waivers,
} from "~/db/schema";
import { isRole, type Role } from "~/auth/roles";
import { calendarDateIn, reminderWindowDays, type IsoDate, type StatusOptions } from "~/domain/status";
import type { PlanCredential, PlanWaiver } from "~/domain/status/plan";
import { totalsForUnits } from "./credential-summary.server";

export type UnitRef = { id: string; name: string };

/**
 * The status options for an organisation right now: today's calendar date in its time zone
 * (so a Chicago evening is not already tomorrow) and its reminder window.
 */
export async function statusOptionsFor(orgId: string, timeZone: string, now: Date = new Date()): Promise<Required<StatusOptions>> {
  const { db } = await database();
  const [org] = await db.select({ settings: organisations.settings }).from(organisations).where(eq(organisations.id, orgId));
  return { today: calendarDateIn(timeZone, now), reminderDays: reminderWindowDays(org?.settings.reminderDays) };
}

export type Profile = {
  id: string;
  name: string;
  email: string;
  title: string | null;
  employeeId: string | null;
  credentialLetters: string | null;
  hireDate: IsoDate | null;
  active: boolean;
  homeUnit: UnitRef | null;
  /** Units worked beyond the home unit. */
  otherUnits: UnitRef[];
  /** Units a manager manages. */
  managedUnits: UnitRef[];
  roles: Role[];
};

/** The person's own record, or null when the id is not a person of this organisation. */
export async function getProfile(orgId: string, personId: string): Promise<Profile | null> {
  const { db } = await database();
  const [row] = await db
    .select({ person: people, homeUnitName: units.name })
    .from(people)
    .leftJoin(units, and(eq(units.id, people.homeUnitId), eq(units.orgId, orgId)))
    .where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  if (!row) return null;
  const [links, roles] = await Promise.all([
    db
      .select({ id: units.id, name: units.name, relation: personUnits.relation })
      .from(personUnits)
      .innerJoin(units, and(eq(units.id, personUnits.unitId), eq(units.orgId, orgId)))
      .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, personId)))
      .orderBy(asc(units.name)),
    db
      .select({ role: personRoles.role })
      .from(personRoles)
      .where(and(eq(personRoles.orgId, orgId), eq(personRoles.personId, personId))),
  ]);
  const p = row.person;
  return {
    id: p.id,
    name: p.name,
    email: p.email,
    title: p.title,
    employeeId: p.employeeId,
    credentialLetters: p.credentialLetters,
    hireDate: p.hireDate,
    active: p.active,
    homeUnit: p.homeUnitId && row.homeUnitName ? { id: p.homeUnitId, name: row.homeUnitName } : null,
    otherUnits: links.filter((l) => l.relation === "member" && l.id !== p.homeUnitId).map(({ id, name }) => ({ id, name })),
    managedUnits: links.filter((l) => l.relation === "manages").map(({ id, name }) => ({ id, name })),
    roles: roles.map((r) => r.role).filter(isRole),
  };
}

/** One person's credentials, each with its type's name (the type checked to be this organisation's). */
export async function loadCredentials(orgId: string, personId: string): Promise<PlanCredential[]> {
  const { db } = await database();
  return db
    .select({
      id: credentials.id,
      credentialTypeId: credentials.credentialTypeId,
      typeName: credentialTypes.name,
      number: credentials.number,
      issuer: credentials.issuer,
      issuedOn: credentials.issuedOn,
      validThrough: credentials.validThrough,
      verified: sql<boolean>`${credentials.verifiedAt} is not null`.mapWith(Boolean),
    })
    .from(credentials)
    .innerJoin(credentialTypes, and(eq(credentialTypes.id, credentials.credentialTypeId), eq(credentialTypes.orgId, orgId)))
    .where(and(eq(credentials.orgId, orgId), eq(credentials.personId, personId)));
}

/** One person's waivers that a manager has not revoked, with the requirement each excuses. */
export async function loadWaivers(orgId: string, personId: string): Promise<PlanWaiver[]> {
  const { db } = await database();
  return db
    .select({ id: waivers.id, requirementId: waivers.requirementId, endsOn: waivers.endsOn, reason: waivers.reason, grantedBy: waivers.grantedBy })
    .from(waivers)
    .where(and(eq(waivers.orgId, orgId), eq(waivers.personId, personId), isNull(waivers.revokedAt)));
}

export type UnitCounts = { units: UnitRef[]; people: number; lapsed: number; dueSoon: number };

/** A manager's line on Today: active people of the managed units and their lapsed / due soon credentials. */
export async function countForUnits(orgId: string, managedUnits: UnitRef[], options: StatusOptions): Promise<UnitCounts> {
  const totals = await totalsForUnits(orgId, managedUnits.map((u) => u.id), options);
  return { units: managedUnits, ...totals };
}

export type OrgCounts = { activePeople: number; inactivePeople: number; activeUnits: number };

/** An admin's line on Today. */
export async function countOrganisation(orgId: string): Promise<OrgCounts> {
  const { db } = await database();
  const [[p], [u]] = await Promise.all([
    db
      .select({
        active: sql<number>`sum(case when ${people.active} then 1 else 0 end)`.mapWith(Number),
        inactive: sql<number>`sum(case when ${people.active} then 0 else 1 end)`.mapWith(Number),
      })
      .from(people)
      .where(eq(people.orgId, orgId)),
    db.select({ n: sql<number>`count(*)`.mapWith(Number) }).from(units).where(and(eq(units.orgId, orgId), eq(units.active, true))),
  ]);
  return { activePeople: p?.active ?? 0, inactivePeople: p?.inactive ?? 0, activeUnits: u?.n ?? 0 };
}

export type EducatorCounts = { activePeople: number; inOrientation: number; openAssigned: number; overdueAssigned: number };

/** An educator's line on Today: the organisation's people, orientees, and work they assigned. */
export async function countForEducator(orgId: string, educatorId: string, today: IsoDate): Promise<EducatorCounts> {
  const { db } = await database();
  const [org, [orientation], [work]] = await Promise.all([
    countOrganisation(orgId),
    db
      .select({ n: sql<number>`count(distinct ${orientationPlans.personId})`.mapWith(Number) })
      .from(orientationPlans)
      .where(and(eq(orientationPlans.orgId, orgId), eq(orientationPlans.status, "active"))),
    db
      .select({
        open: sql<number>`count(*)`.mapWith(Number),
        overdue: sql<number>`sum(case when ${lt(assignments.dueOn, today)} then 1 else 0 end)`.mapWith(Number),
      })
      .from(assignments)
      .where(and(eq(assignments.orgId, orgId), eq(assignments.assignedBy, educatorId), eq(assignments.status, "open"))),
  ]);
  return { activePeople: org.activePeople, inOrientation: orientation?.n ?? 0, openAssigned: work?.open ?? 0, overdueAssigned: work?.overdue ?? 0 };
}

export type Orientee = { planId: string; name: string; homeUnit: string | null; endsOn: IsoDate };

/** A preceptor's orientees with an active plan. */
export async function listOrientees(orgId: string, preceptorId: string): Promise<Orientee[]> {
  const { db } = await database();
  return db
    .select({ planId: orientationPlans.id, name: people.name, homeUnit: units.name, endsOn: orientationPlans.endsOn })
    .from(orientationPlans)
    .innerJoin(people, and(eq(people.id, orientationPlans.personId), eq(people.orgId, orgId)))
    .leftJoin(units, and(eq(units.id, people.homeUnitId), eq(units.orgId, orgId)))
    .where(and(eq(orientationPlans.orgId, orgId), eq(orientationPlans.preceptorId, preceptorId), eq(orientationPlans.status, "active")))
    .orderBy(asc(orientationPlans.endsOn), asc(people.name));
}

export type OrientationItem = { id: string; kind: "exam" | "checklist" | "other"; title: string; dueOn: IsoDate | null; completedAt: Date | null };
export type OrientationPlan = {
  id: string;
  startsOn: IsoDate;
  endsOn: IsoDate;
  preceptorName: string | null;
  items: OrientationItem[];
};

/** The person's active orientation plan, if they have one. */
export async function getOrientationPlan(orgId: string, personId: string): Promise<OrientationPlan | null> {
  const { db } = await database();
  const [plan] = await db
    .select({ id: orientationPlans.id, startsOn: orientationPlans.startsOn, endsOn: orientationPlans.endsOn, preceptorName: people.name })
    .from(orientationPlans)
    .leftJoin(people, and(eq(people.id, orientationPlans.preceptorId), eq(people.orgId, orgId)))
    .where(and(eq(orientationPlans.orgId, orgId), eq(orientationPlans.personId, personId), eq(orientationPlans.status, "active")))
    .orderBy(asc(orientationPlans.startsOn))
    .limit(1);
  if (!plan) return null;
  const items = await db
    .select({
      id: orientationPlanItems.id,
      kind: orientationPlanItems.kind,
      title: orientationPlanItems.title,
      dueOn: orientationPlanItems.dueOn,
      completedAt: orientationPlanItems.completedAt,
    })
    .from(orientationPlanItems)
    .where(and(eq(orientationPlanItems.orgId, orgId), eq(orientationPlanItems.planId, plan.id)))
    .orderBy(asc(orientationPlanItems.position));
  return { ...plan, items };
}
