/**
 * Organisation isolation in the Admin section (PRODUCT.md: "no data crosses organisations").
 * The Alder Bay admin sees none of Kestrel Valley's people or units, and a Kestrel Valley id
 * in the address or the form is "not found" (404) — never a change.
 */
import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { auditEvents, people, personRoles, units } from "~/db/schema";
import * as newPerson from "~/routes/admin/person-new";
import * as person from "~/routes/admin/person";
import * as peopleList from "~/routes/admin/people";
import * as unitsRoute from "~/routes/admin/units";
import { PERSON_INTENTS, UNIT_INTENTS } from "~/routes/admin/schemas";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, outcome } from "./admin-harness";

let db: Database;
let alderAdmin: Viewer;
let kvAdmin: Viewer;
let kvTherapist: Viewer;
let kvPeopleIds: Set<string>;
let kvUnitIds: Set<string>;

beforeAll(async () => {
  db = await useSeededDatabase();
  alderAdmin = await viewerFor("admin@alderbay.test");
  kvAdmin = await viewerFor("admin@kestrelvalley.test");
  kvTherapist = await viewerFor("therapist@kestrelvalley.test");
  kvPeopleIds = new Set((await db.db.select({ id: people.id }).from(people).where(eq(people.orgId, kvAdmin.org.id))).map((p) => p.id));
  kvUnitIds = new Set((await db.db.select({ id: units.id }).from(units).where(eq(units.orgId, kvAdmin.org.id))).map((u) => u.id));
});

const listPeople = async (viewer: Viewer, query = "") =>
  (await outcome(peopleList.loader(args<ArgsOf<typeof peopleList.loader>>(getRequest(`/admin/people${query}`), viewer)))).body as Awaited<ReturnType<typeof peopleList.loader>>;

async function auditCount(): Promise<number> {
  const [{ n }] = await db.db.select({ n: count() }).from(auditEvents);
  return n;
}

describe("the Alder Bay admin and Kestrel Valley's data", () => {
  it("the two organisations are different and both seeded", () => {
    expect(alderAdmin.org.id).not.toBe(kvAdmin.org.id);
    expect(kvPeopleIds.size).toBe(42);
    expect(kvUnitIds.size).toBe(4);
  });

  it("sees only Alder Bay's people in /admin/people, whatever the search or filter", async () => {
    const all = await listPeople(alderAdmin, "?status=all");
    const [{ n }] = await db.db.select({ n: count() }).from(people).where(eq(people.orgId, alderAdmin.org.id));
    expect(all.total).toBe(n);
    expect(all.rows.length).toBeGreaterThan(0);
    expect(all.rows.some((r) => kvPeopleIds.has(r.id) || r.email.endsWith("@kestrelvalley.test"))).toBe(false);
    for (const query of ["?q=kestrelvalley&status=all", "?q=KV-&status=all", "?q=Ellingsen&status=all"]) {
      expect(await listPeople(alderAdmin, query)).toMatchObject({ total: 0, rows: [] });
    }
    // A role filter finds Alder Bay's own educators only (the seed gives it two), none of Kestrel Valley's.
    const abEducators = await db.db
      .select({ id: personRoles.personId })
      .from(personRoles)
      .where(and(eq(personRoles.orgId, alderAdmin.org.id), eq(personRoles.role, "educator")));
    const educators = await listPeople(alderAdmin, "?role=educator&status=all");
    expect(abEducators).toHaveLength(2);
    expect(educators.total).toBe(abEducators.length);
    expect(educators.rows.map((r) => r.id).sort()).toEqual(abEducators.map((r) => r.id).sort());
    expect(educators.rows.every((r) => r.email.endsWith("@alderbay.test") && r.roles.includes("educator"))).toBe(true);
    // A Kestrel Valley unit id as the filter finds nobody either.
    expect(await listPeople(alderAdmin, `?unit=${[...kvUnitIds][0]}&status=all`)).toMatchObject({ total: 0, rows: [] });
    // The unit choices offered are Alder Bay's own.
    expect(all.units.some((u) => kvUnitIds.has(u.id))).toBe(false);
  });

  it("sees only Alder Bay's units in /admin/units", async () => {
    const page = await outcome(unitsRoute.loader(args<ArgsOf<typeof unitsRoute.loader>>(getRequest("/admin/units"), alderAdmin)));
    const list = (page.body as Awaited<ReturnType<typeof unitsRoute.loader>>).units;
    expect(list.length).toBeGreaterThan(0);
    expect(list.some((u) => kvUnitIds.has(u.id))).toBe(false);
    expect(list.map((u) => u.name)).not.toContain("Adult ICU");
  });

  it("gets 404 for a Kestrel Valley person in the /admin/people/:personId loader", async () => {
    const personId = kvTherapist.person.id;
    const page = await outcome(person.loader(args<ArgsOf<typeof person.loader>>(getRequest(`/admin/people/${personId}`), alderAdmin, { personId })));
    expect(page.status).toBe(404);
  });

  it("gets 404 from the person action for every intent, and nothing changes", async () => {
    const personId = kvTherapist.person.id;
    const before = await auditCount();
    const attempts: Record<string, string>[] = [
      { intent: PERSON_INTENTS.update, name: "Renamed Across", email: "x@alderbay.test", hireDate: "2020-01-01" },
      { intent: PERSON_INTENTS.grantRole, role: "admin" },
      { intent: PERSON_INTENTS.removeRole, role: "therapist" },
      { intent: PERSON_INTENTS.deactivate, confirm: "yes" },
      { intent: PERSON_INTENTS.addManagedUnit, unitId: [...kvUnitIds][0] },
    ];
    for (const fields of attempts) {
      const result = await outcome(person.action(args<ArgsOf<typeof person.action>>(postForm(`/admin/people/${personId}`, fields), alderAdmin, { personId })));
      expect(result.status, fields.intent).toBe(404);
    }
    const [after] = await db.db.select().from(people).where(eq(people.id, personId));
    expect(after).toMatchObject({ name: kvTherapist.person.name, active: true });
    expect((await db.db.select().from(personRoles).where(eq(personRoles.personId, personId))).map((r) => r.role)).toEqual(["therapist"]);
    expect(await auditCount()).toBe(before);
  });

  it("gets 404 for a Kestrel Valley unit in the units action", async () => {
    const unitId = [...kvUnitIds][0];
    const attempts: Record<string, string>[] = [
      { intent: UNIT_INTENTS.rename, unitId, name: "Taken Over", code: "TKN" },
      { intent: UNIT_INTENTS.deactivate, unitId, confirm: "yes" },
    ];
    for (const fields of attempts) {
      const result = await outcome(unitsRoute.action(args<ArgsOf<typeof unitsRoute.action>>(postForm("/admin/units", fields), alderAdmin)));
      expect(result.status, fields.intent).toBe(404);
    }
    const [unit] = await db.db.select().from(units).where(eq(units.id, unitId));
    expect(unit).toMatchObject({ orgId: kvAdmin.org.id, active: true });
    expect(unit.name).not.toBe("Taken Over");
  });

  it("cannot add a person into a Kestrel Valley unit; the organisation comes from the session, not the form", async () => {
    const before = await auditCount();
    const result = await outcome(
      newPerson.action(
        args<ArgsOf<typeof newPerson.action>>(
          postForm("/admin/people/new", {
            name: "Cross Over",
            email: "cross.over@alderbay.test",
            hireDate: "2026-06-01",
            homeUnitId: [...kvUnitIds][0],
            orgId: kvAdmin.org.id,
          }),
          alderAdmin,
        ),
      ),
    );
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "homeUnitId")).toEqual(["Choose one of your organisation's units."]);
    expect(await auditCount()).toBe(before);

    // Without the foreign unit, an "orgId" field in the form is simply ignored.
    const added = await outcome(
      newPerson.action(
        args<ArgsOf<typeof newPerson.action>>(
          postForm("/admin/people/new", { name: "Cross Over", email: "cross.over@alderbay.test", hireDate: "2026-06-01", orgId: kvAdmin.org.id }),
          alderAdmin,
        ),
      ),
    );
    expect(added.status).toBe(302);
    const [row] = await db.db.select().from(people).where(eq(people.email, "cross.over@alderbay.test"));
    expect(row.orgId).toBe(alderAdmin.org.id);
  });

  it("and the other way round: Kestrel Valley's admin sees none of Alder Bay", async () => {
    const all = await listPeople(kvAdmin, "?status=all&q=alderbay");
    expect(all.total).toBe(0);
    const personId = alderAdmin.person.id;
    const page = await outcome(person.loader(args<ArgsOf<typeof person.loader>>(getRequest(`/admin/people/${personId}`), kvAdmin, { personId })));
    expect(page.status).toBe(404);
  });
});
