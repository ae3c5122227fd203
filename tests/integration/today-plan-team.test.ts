/**
 * Today and My plan, called as loaders against a seeded copy built for TEST_TODAY
 * (2026-12-02), and organisation isolation through Today, My plan and Team (the ledger itself:
 * today-plan-team-ledger.test.ts). Statuses are checked against the seed's own declared story for the demo
 * accounts (seeds/kestrel-valley-records.ts) and against a plain re-computation from the rows;
 * the rules themselves (valid through inclusive, 90-day window) are unit-tested with their
 * sources in app/domain/status/index.test.ts.
 */
import { and, eq, inArray, isNull } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { credentials, credentialTypes, people, requirements, waivers } from "~/db/schema";
import * as planRoute from "~/routes/plan/index";
import { TEST_TODAY } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";
import { outcome } from "./admin-harness";
import { dayOffset, plan, team, today, useTodayPlanTeamWorld, type PlanArgs } from "./today-plan-team-harness";

const world = useTodayPlanTeamWorld();
const { viewers } = world;

describe("My plan", () => {
  it("lists the therapist's work and credentials in due-date order, overdue first", async () => {
    const { rows, today: day } = await plan(viewers.therapist);
    expect(day).toBe(TEST_TODAY);
    const dated = rows.filter((r) => r.result.date !== null).map((r) => r.result.date!);
    expect(dated).toEqual([...dated].sort());
    // Undated rows (nothing on file, or no expiry) come after every dated one.
    const firstUndated = rows.findIndex((r) => r.result.date === null);
    if (firstUndated >= 0) expect(rows.slice(firstUndated).every((r) => r.result.date === null)).toBe(true);

    // The seed's story for the demo therapist: annual check-off due 9 days ago, exam due in 21 days.
    expect(rows[0]).toMatchObject({ kind: "checklist", dateMeaning: "due", result: { status: "lapsed", date: dayOffset(-9), daysLapsed: 9 } });
    const exam = rows.find((r) => r.kind === "exam")!;
    expect(exam).toMatchObject({ dateMeaning: "due", result: { status: "not-started", date: dayOffset(21), daysLeft: 21 } });
  });

  it("includes the therapist's credentials with the statuses the seed gave them for the test day", async () => {
    const { rows } = await plan(viewers.therapist);
    const byTitle = new Map(rows.filter((r) => r.kind === "credential").map((r) => [r.title, r.result.status]));
    // seeds/kestrel-valley-records.ts forces these for the demo therapist (Adult ICU).
    expect(Object.fromEntries(byTitle)).toEqual({
      "State respiratory care licence": "current",
      "Respiratory therapy board credential": "current",
      "Basic life support": "due-soon",
      "Advanced cardiac life support (Adult ICU)": "current",
    });
  });

  it("agrees with a plain re-computation from the credential rows (valid through inclusive, 90-day window)", async () => {
    const held = await world.db.db
      .select({ name: credentialTypes.name, validThrough: credentials.validThrough })
      .from(credentials)
      .innerJoin(credentialTypes, eq(credentialTypes.id, credentials.credentialTypeId))
      .where(eq(credentials.personId, viewers.therapist.person.id));
    const { rows } = await plan(viewers.therapist);
    const horizon = dayOffset(90);
    for (const c of held) {
      const expected = c.validThrough === null ? "current" : c.validThrough < TEST_TODAY ? "lapsed" : c.validThrough <= horizon ? "due-soon" : "current";
      const row = rows.find((r) => r.kind === "credential" && r.result.date === c.validThrough);
      expect(row?.result.status, c.name).toBe(expected);
    }
  });

  it("shows a waived credential as waived, and its unwaived neighbour as lapsed with how long ago", async () => {
    const kv = viewers.therapist.org.id;
    const [acls] = await world.db.db.select({ id: requirements.id }).from(requirements).where(and(eq(requirements.orgId, kv), eq(requirements.name, "Advanced cardiac life support (Adult ICU)")));
    const [waived] = await world.db.db
      .select({ email: people.email, endsOn: waivers.endsOn })
      .from(waivers)
      .innerJoin(people, eq(people.id, waivers.personId))
      .where(and(eq(waivers.requirementId, acls.id), isNull(waivers.revokedAt)));
    const rows = (await plan(await viewerFor(waived.email))).rows;
    expect(rows.find((r) => r.title === "Advanced cardiac life support (Adult ICU)")?.result).toMatchObject({ status: "waived", waivedThrough: waived.endsOn });

    // The other Adult ICU person with a forced lapsed card has no waiver.
    const lapsedHolders = await world.db.db
      .select({ email: people.email, validThrough: credentials.validThrough })
      .from(credentials)
      .innerJoin(people, eq(people.id, credentials.personId))
      .innerJoin(credentialTypes, eq(credentialTypes.id, credentials.credentialTypeId))
      .where(and(eq(credentials.orgId, kv), eq(credentialTypes.code, "advanced-cardiac-life-support")));
    const lapsed = lapsedHolders.find((h) => h.validThrough !== null && h.validThrough < TEST_TODAY && h.email !== waived.email)!;
    const row = (await plan(await viewerFor(lapsed.email))).rows.find((r) => r.kind === "credential" && r.result.date === lapsed.validThrough)!;
    expect(row.result.status).toBe("lapsed");
    expect(row.result.daysLapsed).toBeGreaterThan(0);
  });

  it("is refused (403) to an admin, whose roles do not include My plan", async () => {
    expect((await outcome(planRoute.loader(args<PlanArgs>(getRequest("/plan"), viewers.admin)))).status).toBe(403);
  });
});

describe("Today", () => {
  it("shows the therapist who they are and what is recorded about them", async () => {
    const data = await today(viewers.therapist);
    expect(data.profile).toMatchObject({ name: "Marisol Ellingsen", employeeId: "KV-20417", title: "Respiratory Therapist II", homeUnit: { name: "Adult ICU" }, roles: ["therapist"] });
    expect(data.orgName).toBe("Kestrel Valley Medical Center");
    expect(data.credentials.map((c) => c.result.status).sort()).toEqual(["current", "current", "current", "due-soon"]);
    expect(data.work.map((w) => w.result.date)).toEqual([dayOffset(-9), dayOffset(21)]);
    expect(data.lines).toEqual({ unitCounts: null, educator: null, orientees: null, organisation: null });
  });

  it("gives the manager a line of counts for their units that matches a re-count from the rows", async () => {
    const data = await today(viewers.manager);
    const counts = data.lines.unitCounts!;
    expect(counts.units.map((u) => u.name).sort()).toEqual(["Adult Floors", "Adult ICU", "Emergency", "Neonatal ICU"]);
    const kv = viewers.manager.org.id;
    const active = await world.db.db.select({ id: people.id }).from(people).where(and(eq(people.orgId, kv), eq(people.active, true)));
    expect(counts.people).toBe(active.length);

    // Re-count: each person's newest card per type; an active waiver on that type's requirement excuses a non-current one.
    const held = await world.db.db.select({ personId: credentials.personId, typeId: credentials.credentialTypeId, validThrough: credentials.validThrough }).from(credentials).where(eq(credentials.orgId, kv));
    const excused = await world.db.db
      .select({ personId: waivers.personId, typeId: requirements.credentialTypeId, endsOn: waivers.endsOn })
      .from(waivers)
      .innerJoin(requirements, eq(requirements.id, waivers.requirementId))
      .where(and(eq(waivers.orgId, kv), isNull(waivers.revokedAt)));
    const best = new Map<string, string | null>();
    for (const c of held) {
      const key = `${c.personId}|${c.typeId}`;
      const prev = best.get(key);
      if (prev === undefined || (prev !== null && (c.validThrough === null || c.validThrough > prev))) best.set(key, c.validThrough);
    }
    let lapsed = 0;
    let dueSoon = 0;
    for (const [key, validThrough] of best) {
      const status = validThrough === null ? "current" : validThrough < TEST_TODAY ? "lapsed" : validThrough <= dayOffset(90) ? "due-soon" : "current";
      const waived = excused.some((w) => `${w.personId}|${w.typeId}` === key && w.endsOn >= TEST_TODAY);
      if (status === "lapsed" && !waived) lapsed += 1;
      if (status === "due-soon" && !waived) dueSoon += 1;
    }
    expect(counts.lapsed).toBe(lapsed);
    expect(counts.dueSoon).toBe(dueSoon);
    expect(lapsed).toBeGreaterThan(0);
  });

  it("gives the educator a line about the organisation's people and the work they assigned", async () => {
    const { lines } = await today(viewers.educator);
    expect(lines.educator).toMatchObject({ activePeople: 42, inOrientation: 3 });
    expect(lines.educator!.openAssigned).toBeGreaterThan(0);
  });

  it("gives the preceptor their orientees, and a new hire their orientation plan", async () => {
    const { lines } = await today(viewers.preceptor);
    expect(lines.orientees).toHaveLength(2);
    const [hire] = await world.db.db.select({ email: people.email }).from(people).where(eq(people.name, lines.orientees![0].name));
    const data = await today(await viewerFor(hire.email));
    expect(data.orientation?.items).toHaveLength(10);
    expect(data.orientation?.preceptorName).toBe("Desmond Achterberg");
    // Sessions already past are marked done; exams and check-offs are not (they need attempts and signatures).
    for (const item of data.orientation!.items) {
      if (item.completedAt) expect(item.kind).toBe("other");
      else if (item.dueOn! < TEST_TODAY) expect(item.status?.status).toBe("lapsed");
    }
  });

  it("shows the admin the organisation's counts and, with nothing recorded about them, the empty state's data", async () => {
    const data = await today(viewers.admin);
    expect(data.lines.organisation).toEqual({ activePeople: 42, inactivePeople: 0, activeUnits: 4 });
    expect(data.credentials).toEqual([]);
    expect(data.work).toEqual([]);
    expect(data.orientation).toBeNull();
  });
});

describe("organisation isolation: Alder Bay sees nothing of Kestrel Valley", () => {
  let kvEmails: string[];
  let kvNames: string[];
  beforeAll(async () => {
    const kv = await world.db.db.select({ email: people.email, name: people.name }).from(people).where(eq(people.orgId, viewers.manager.org.id));
    kvEmails = kv.map((p) => p.email);
    kvNames = kv.map((p) => p.name);
  });
  const leaks = (value: unknown) => {
    const text = JSON.stringify(value);
    return [...kvEmails, ...kvNames, "Kestrel Valley", "kestrelvalley"].filter((s) => text.includes(s));
  };

  it("through the Alder Bay admin's Today", async () => {
    const data = await today(viewers.abAdmin);
    expect(data.orgName).toBe("Alder Bay Hospital");
    const abPeople = await world.db.db.select({ id: people.id }).from(people).where(eq(people.orgId, viewers.abAdmin.org.id));
    expect(data.lines.organisation?.activePeople).toBe(abPeople.length);
    expect(data.lines.organisation?.activeUnits).toBe(1);
    expect(leaks(data)).toEqual([]);
  });

  it("through the Alder Bay manager's Today, My plan and Team", async () => {
    const m = viewers.abManager;
    expect(m.org.name).toBe("Alder Bay Hospital");
    const t = await today(m);
    const abIds = (await world.db.db.select({ id: people.id }).from(people).where(eq(people.orgId, m.org.id))).map((p) => p.id);
    expect(t.lines.unitCounts?.people).toBe(abIds.length);
    expect(leaks(t)).toEqual([]);
    expect(leaks(await plan(m))).toEqual([]);

    const all = await team(m);
    expect(all.team.inScope).toBe(abIds.length);
    expect(all.team.rows.every((r) => abIds.includes(r.id))).toBe(true);
    expect(leaks(all)).toEqual([]);
    // Searching for a Kestrel Valley person by address or employee id finds no one.
    for (const q of ["therapist@kestrelvalley.test", "KV-20417", "Kestrel"]) {
      const found = await team(m, `?q=${encodeURIComponent(q)}`);
      expect(found.team.matching, q).toBe(0);
    }
  });

  it("Kestrel Valley's credential counts are not changed by Alder Bay's lapsed cards, and the other way round", async () => {
    const abCreds = await world.db.db.select({ personId: credentials.personId }).from(credentials).where(eq(credentials.orgId, viewers.abManager.org.id));
    const abPersonIds = new Set(abCreds.map((c) => c.personId));
    const kvTeam = await team(viewers.educator, "?sort=lapsed");
    expect(kvTeam.team.rows.some((r) => abPersonIds.has(r.id))).toBe(false);
    const kvIds = (await world.db.db.select({ id: people.id }).from(people).where(inArray(people.orgId, [viewers.manager.org.id]))).map((p) => p.id);
    const abTeam = await team(viewers.abManager, "?sort=lapsed");
    expect(abTeam.team.rows.some((r) => kvIds.includes(r.id))).toBe(false);
  });
});
