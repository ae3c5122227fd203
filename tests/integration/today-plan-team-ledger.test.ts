/**
 * The Team ledger, called as a loader against a seeded copy built for TEST_TODAY: who a manager
 * and an educator see, search, sort, paging, refusal to other roles, and credential counts that
 * agree with each person's own plan.
 */
import { and, eq, inArray } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { people, personUnits, units } from "~/db/schema";
import { statusOptionsFor } from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import * as teamRoute from "~/routes/team/index";
import { args, getRequest } from "../setup/request";
import { outcome } from "./admin-harness";
import { team, useTodayPlanTeamWorld, type TeamArgs } from "./today-plan-team-harness";

const world = useTodayPlanTeamWorld();
const { viewers } = world;

describe("Team", () => {
  it("lists the people of the manager's units only", async () => {
    const kv = viewers.manager.org.id;
    // Narrow the demo manager (all four units) to Emergency alone in this test's private copy.
    const [emergency] = await world.db.db.select({ id: units.id }).from(units).where(and(eq(units.orgId, kv), eq(units.name, "Emergency")));
    await world.db.write((tx) => tx.delete(personUnits).where(and(eq(personUnits.personId, viewers.manager.person.id), eq(personUnits.relation, "manages"))));
    await world.db.write((tx) => tx.insert(personUnits).values({ personId: viewers.manager.person.id, unitId: emergency.id, orgId: kv, relation: "manages" }));
    try {
      const home = await world.db.db.select({ id: people.id }).from(people).where(and(eq(people.orgId, kv), eq(people.homeUnitId, emergency.id)));
      const members = await world.db.db.select({ id: personUnits.personId }).from(personUnits).where(and(eq(personUnits.unitId, emergency.id), eq(personUnits.relation, "member")));
      const expected = new Set([...home, ...members].map((p) => p.id));
      const data = await team(viewers.manager, "?page=1");
      expect(data.scope).toEqual({ kind: "units", units: ["Emergency"] });
      expect(data.team.inScope).toBe(expected.size);
      expect(new Set(data.team.rows.map((r) => r.id))).toEqual(expected);
      // The demo preceptor's home unit is the Neonatal ICU but they also work in Emergency.
      expect(data.team.rows.some((r) => r.email === "preceptor@kestrelvalley.test")).toBe(true);
      expect(data.team.rows.some((r) => r.email === "therapist@kestrelvalley.test")).toBe(false);
    } finally {
      await world.db.write((tx) => tx.delete(personUnits).where(and(eq(personUnits.personId, viewers.manager.person.id), eq(personUnits.relation, "manages"))));
      const all = await world.db.db.select({ id: units.id }).from(units).where(eq(units.orgId, kv));
      await world.db.write((tx) => tx.insert(personUnits).values(all.map((u) => ({ personId: viewers.manager.person.id, unitId: u.id, orgId: kv, relation: "manages" as const }))));
    }
  });

  it("counts each person's lapsed and due soon credentials as their own plan shows them", async () => {
    // The ledger counts in SQL; My plan judges record by record with the pure engine. They must agree.
    const kv = viewers.educator;
    const options = await statusOptionsFor(kv.org.id, kv.org.timeZone);
    const data = await team(viewers.educator);
    expect(data.team.rows.length).toBe(42);
    expect(data.team.rows.some((r) => r.credentials.waived > 0)).toBe(true);
    for (const row of data.team.rows) {
      // The query behind My plan, called directly: the admin in this list may not open /plan.
      const rows = (await getPlan(kv.org.id, row.id, kv.org.timeZone, options))!;
      const held = rows.filter((r) => r.kind === "credential" && r.credential !== null);
      const count = (status: string) => held.filter((r) => r.result.status === status).length;
      expect({ lapsed: row.credentials.lapsed, dueSoon: row.credentials.dueSoon, waived: row.credentials.waived }, row.email).toEqual({
        lapsed: count("lapsed"),
        dueSoon: count("due-soon"),
        waived: count("waived"),
      });
    }
  });

  it("lets an educator read the whole organisation", async () => {
    const data = await team(viewers.educator);
    expect(data.scope.kind).toBe("organisation");
    expect(data.team.inScope).toBe(42);
  });

  it.each([
    { by: "employee id", q: "KV-20417" },
    { by: "e-mail", q: "THERAPIST@kestrelvalley" },
    { by: "name, any case", q: "marisol ELLINGSEN" },
  ])("searches by $by", async ({ q }) => {
    const data = await team(viewers.manager, `?q=${encodeURIComponent(q)}`);
    expect(data.team.rows.map((r) => r.email)).toEqual(["therapist@kestrelvalley.test"]);
    expect(data.query.q).toBe(q);
  });

  it("sorts by name, hire date and lapsed count, both ways", async () => {
    // Names compare case-insensitively, letter by letter (SQLite's NOCASE collation).
    const folded = (a: string, b: string) => (a.toLowerCase() < b.toLowerCase() ? -1 : a.toLowerCase() > b.toLowerCase() ? 1 : 0);
    const names = (await team(viewers.manager)).team.rows.map((r) => r.name);
    expect(names).toEqual([...names].sort(folded));
    const desc = (await team(viewers.manager, "?sort=name&dir=desc")).team.rows.map((r) => r.name);
    expect(desc).toEqual([...names].sort((a, b) => folded(b, a)));

    const hires = (await team(viewers.manager, "?sort=hire")).team.rows.map((r) => r.hireDate!);
    expect(hires).toEqual([...hires].sort());
    const lapsed = (await team(viewers.manager, "?sort=lapsed")).team.rows.map((r) => r.credentials.lapsed);
    expect(lapsed).toEqual([...lapsed].sort((a, b) => b - a));
    expect(lapsed[0]).toBeGreaterThan(0);
    const units = (await team(viewers.manager, "?sort=unit&dir=desc")).team.rows.map((r) => r.homeUnit!);
    expect(units).toEqual([...units].sort().reverse());
  });

  it("falls back to the default view for a malformed address", async () => {
    const data = await team(viewers.manager, "?sort=password&dir=sideways&page=-4");
    expect(data.query).toEqual({ q: "", sort: "name", dir: "asc", page: 1 });
  });

  it("pages large lists: every person once, in a stable order, and a page past the end shows the last page", async () => {
    const kv = viewers.manager.org.id;
    const [floors] = await world.db.db.select({ id: units.id }).from(units).where(and(eq(units.orgId, kv), eq(units.name, "Adult Floors")));
    // 60 more people in this test's private copy: 102 in all, three pages of 50.
    const extra = Array.from({ length: 60 }, (_, i) => ({
      id: `paging-${i}`,
      orgId: kv,
      email: `paging.${String(i).padStart(2, "0")}@kestrelvalley.test`,
      name: `Paging Person ${String(i).padStart(2, "0")}`,
      employeeId: `KV-P${i}`,
      homeUnitId: floors.id,
      hireDate: "2024-01-15",
    }));
    await world.db.write((tx) => tx.insert(people).values(extra));
    try {
      const pages = await Promise.all([1, 2, 3].map((n) => team(viewers.manager, `?sort=hire&page=${n}`)));
      expect(pages.map((p) => p.team.rows.length)).toEqual([50, 50, 2]);
      expect(pages[0].team.pageCount).toBe(3);
      const ids = pages.flatMap((p) => p.team.rows.map((r) => r.id));
      expect(new Set(ids).size).toBe(102);
      const hires = pages.flatMap((p) => p.team.rows.map((r) => r.hireDate!));
      expect(hires).toEqual([...hires].sort());
      const past = await team(viewers.manager, "?sort=hire&page=99");
      expect(past.team.page).toBe(3);
      expect(past.query.page).toBe(3);
      const searched = await team(viewers.manager, "?q=paging+person&page=2");
      expect(searched.team).toMatchObject({ matching: 60, page: 2, pageCount: 2 });
      expect(searched.team.rows).toHaveLength(10);
    } finally {
      await world.db.write((tx) => tx.delete(people).where(inArray(people.id, extra.map((p) => p.id))));
    }
  });

  it("is refused (403) to a therapist and to an admin", async () => {
    for (const who of ["therapist", "admin", "abAdmin"] as const) {
      const answer = await outcome(teamRoute.loader(args<TeamArgs>(getRequest("/team"), viewers[who])));
      expect(answer.status, who).toBe(403);
    }
  });
});

