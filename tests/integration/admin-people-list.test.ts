/**
 * Admin › People list: search and filters against the seeded Kestrel Valley roster
 * (PRODUCT.md "Demo scenario": 40 therapists, 6 preceptors, 2 educators, 1 manager, 1 admin).
 */
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import * as peopleList from "~/routes/admin/people";
import * as newPerson from "~/routes/admin/person-new";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";

let admin: Viewer;

beforeAll(async () => {
  await useSeededDatabase();
  admin = await viewerFor("admin@kestrelvalley.test");
});

type ListData = Awaited<ReturnType<typeof peopleList.loader>>;
const list = async (query: string) => (await outcome(peopleList.loader(args<ArgsOf<typeof peopleList.loader>>(getRequest(`/admin/people${query}`), admin)))).body as ListData;

describe("the people list", () => {
  it("shows everyone active, by name, with roles and home unit", async () => {
    const all = await list("");
    expect(all.total).toBe(42);
    const names = all.rows.map((r) => r.name.toLowerCase());
    expect(names).toEqual([...names].sort());
    expect(all.rows.find((r) => r.email === "manager@kestrelvalley.test")).toMatchObject({ roles: ["manager"], homeUnit: "Adult ICU", active: true });
    expect(all.rows.find((r) => r.email === "preceptor@kestrelvalley.test")?.roles).toEqual(["therapist", "preceptor"]);
  });

  it("filters by role", async () => {
    expect((await list("?role=preceptor")).total).toBe(6);
    expect((await list("?role=educator")).total).toBe(2);
    expect((await list("?role=therapist")).total).toBe(40);
    expect((await list("?role=manager")).rows.map((r) => r.email)).toEqual(["manager@kestrelvalley.test"]);
  });

  it("filters by unit: home unit, a unit worked on, or a unit managed", async () => {
    const { units } = await list("");
    const emergency = units.find((u) => u.name === "Emergency")!;
    const rows = (await list(`?unit=${emergency.id}`)).rows;
    const emails = rows.map((r) => r.email);
    expect(emails).toContain("manager@kestrelvalley.test"); // manages every unit
    expect(emails).toContain("preceptor@kestrelvalley.test"); // home Neonatal ICU, also works in Emergency
    expect(emails).not.toContain("therapist@kestrelvalley.test"); // Adult ICU only
    expect(rows.filter((r) => r.homeUnit === "Emergency").length).toBeGreaterThan(0);
  });

  it("searches name, e-mail and employee id, case-insensitively", async () => {
    expect((await list("?q=ellingsen")).rows.map((r) => r.email)).toEqual(["therapist@kestrelvalley.test"]);
    expect((await list("?q=KV-20417")).rows.map((r) => r.email)).toEqual(["therapist@kestrelvalley.test"]);
    expect((await list("?q=MANAGER%40kestrel")).rows.map((r) => r.name)).toEqual(["Harriet Valdivia"]);
  });

  it("treats % and _ typed in the search as themselves, not wildcards", async () => {
    expect((await list("?q=%25")).total).toBe(0);
    expect((await list("?q=_")).total).toBe(0);
  });

  it("pages after 100 people", async () => {
    // Add enough people to pass one page (the list is by name, 100 a page).
    for (let i = 0; i < 60; i++) {
      const body = new URLSearchParams({ name: `Zz Paging ${String(i).padStart(2, "0")}`, email: `paging${i}@kestrelvalley.test`, hireDate: "2026-01-05", firstRole: "none" });
      const request = new Request("http://localhost:3000/admin/people/new", { method: "POST", body, headers: { Origin: "http://localhost:3000" } });
      expect((await outcome(newPerson.action(args<ArgsOf<typeof newPerson.action>>(request, admin)))).status).toBe(302);
    }
    const first = await list("");
    expect(first).toMatchObject({ total: 102, page: 1, pageSize: 100 });
    expect(first.rows).toHaveLength(100);
    const second = await list("?page=2");
    expect(second.rows.map((r) => r.name)).toEqual(["Zz Paging 58", "Zz Paging 59"]);
    // A page past the end shows the last page rather than an empty table.
    expect((await list("?page=9")).page).toBe(2);
  });
});
