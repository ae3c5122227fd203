/**
 * Orientation plans at a glance: each new hire's items with target dates, and whether each is
 * done. A checklist item is done when the new hire has a signed, competent check-off of that
 * checklist (any version); other items when they are marked complete.
 */
import { and, asc, eq, inArray, or } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import type { IsoDate } from "~/domain/status/calendar-date";
import { database } from "../client.server";
import { checklistVersions, checkoffs, orientationPlanItems, orientationPlans, people } from "../schema";

export type OrientationItemRow = { id: string; kind: "exam" | "checklist" | "other"; title: string; dueOn: IsoDate | null; done: boolean; checklistId: string | null };
export type OrientationPlanRow = {
  id: string;
  personId: string;
  personName: string;
  preceptorName: string | null;
  startsOn: IsoDate;
  endsOn: IsoDate;
  items: OrientationItemRow[];
};

export type PlanScope = { kind: "person"; personId: string } | { kind: "preceptor"; preceptorId: string } | { kind: "all" };

export async function listOrientationPlans(orgId: string, scope: PlanScope): Promise<OrientationPlanRow[]> {
  const { db } = await database();
  const person = alias(people, "person");
  const preceptor = alias(people, "preceptor");
  const scoped =
    scope.kind === "person" ? eq(orientationPlans.personId, scope.personId) : scope.kind === "preceptor" ? eq(orientationPlans.preceptorId, scope.preceptorId) : undefined;
  const plans = await db
    .select({
      id: orientationPlans.id,
      personId: orientationPlans.personId,
      personName: person.name,
      preceptorName: preceptor.name,
      startsOn: orientationPlans.startsOn,
      endsOn: orientationPlans.endsOn,
    })
    .from(orientationPlans)
    .innerJoin(person, and(eq(person.id, orientationPlans.personId), eq(person.orgId, orgId)))
    .leftJoin(preceptor, and(eq(preceptor.id, orientationPlans.preceptorId), eq(preceptor.orgId, orgId)))
    .where(and(eq(orientationPlans.orgId, orgId), eq(orientationPlans.status, "active"), scoped))
    .orderBy(asc(orientationPlans.startsOn), asc(person.name));
  if (plans.length === 0) return [];
  const planIds = plans.map((p) => p.id);
  const personIds = plans.map((p) => p.personId);
  const [items, competent] = await Promise.all([
    db.select().from(orientationPlanItems).where(and(eq(orientationPlanItems.orgId, orgId), inArray(orientationPlanItems.planId, planIds))).orderBy(asc(orientationPlanItems.position)),
    db
      .selectDistinct({ personId: checkoffs.personId, checklistId: checklistVersions.checklistId })
      .from(checkoffs)
      .innerJoin(checklistVersions, eq(checklistVersions.id, checkoffs.checklistVersionId))
      .where(and(eq(checkoffs.orgId, orgId), inArray(checkoffs.personId, personIds), eq(checkoffs.outcome, "competent"), or(eq(checkoffs.status, "signed"), eq(checkoffs.status, "acknowledged")))),
  ]);
  const passed = new Set(competent.map((c) => `${c.personId}:${c.checklistId}`));
  return plans.map((p) => ({
    ...p,
    items: items
      .filter((i) => i.planId === p.id)
      .map((i) => ({
        id: i.id,
        kind: i.kind,
        title: i.title,
        dueOn: i.dueOn,
        checklistId: i.checklistId,
        done: !!i.completedAt || (i.kind === "checklist" && !!i.checklistId && passed.has(`${p.personId}:${i.checklistId}`)),
      })),
  }));
}
