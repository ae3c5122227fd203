/**
 * Shared set-up of the Today, My plan and Team integration tests: a seeded copy built for
 * TEST_TODAY, the clock fixed at noon in Chicago that day (the loaders read "today" from the
 * clock, in the organisation's time zone), the demo viewers, and one-line loader calls.
 */
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, vi } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { organisations, people, personRoles } from "~/db/schema";
import * as planRoute from "~/routes/plan/index";
import * as teamRoute from "~/routes/team/index";
import * as todayRoute from "~/routes/today/index";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";

// Route types come from the loaders themselves: the generated `+types` resolve only relative to a route module.
export type PlanArgs = Parameters<typeof planRoute.loader>[0];
export type TeamArgs = Parameters<typeof teamRoute.loader>[0];
export type TodayArgs = Parameters<typeof todayRoute.loader>[0];
type PlanData = Awaited<ReturnType<typeof planRoute.loader>>;
type TeamData = Awaited<ReturnType<typeof teamRoute.loader>>;
type TodayData = Awaited<ReturnType<typeof todayRoute.loader>>;

export const plan = async (viewer: Viewer) => (await planRoute.loader(args<PlanArgs>(getRequest("/plan"), viewer))) as PlanData;
export const today = async (viewer: Viewer) => (await todayRoute.loader(args<TodayArgs>(getRequest("/today"), viewer))) as TodayData;
export const team = async (viewer: Viewer, search = "") => (await teamRoute.loader(args<TeamArgs>(getRequest(`/team${search}`), viewer))) as TeamData;

/** Days from TEST_TODAY, as a calendar date (UTC arithmetic on the three numbers). */
export function dayOffset(days: number): string {
  const [y, m, d] = TEST_TODAY.split("-").map(Number);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

export type World = { db: Database; viewers: Record<"therapist" | "preceptor" | "educator" | "manager" | "admin" | "abAdmin" | "abManager", Viewer> };

/** Call at the top of a test file; the returned object is filled before the first test runs. */
export function useTodayPlanTeamWorld(): World {
  const world = { viewers: {} } as World;
  beforeAll(async () => {
    world.db = await useSeededDatabase();
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(new Date(`${TEST_TODAY}T18:00:00Z`));
    for (const role of ["therapist", "preceptor", "educator", "manager", "admin"] as const) world.viewers[role] = await viewerFor(`${role}@kestrelvalley.test`);
    world.viewers.abAdmin = await viewerFor("admin@alderbay.test");
    const [ab] = await world.db.db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, "alder-bay"));
    const [manager] = await world.db.db
      .select({ email: people.email })
      .from(people)
      .innerJoin(personRoles, eq(personRoles.personId, people.id))
      .where(and(eq(people.orgId, ab.id), eq(personRoles.role, "manager")))
      .orderBy(people.email)
      .limit(1);
    world.viewers.abManager = await viewerFor(manager.email);
  });
  afterAll(() => {
    vi.useRealTimers();
  });
  return world;
}
