/**
 * Admin › People: adding and editing people, roles, managed units and deactivation, called as
 * loaders and actions against a seeded copy of the demo database. Every change must leave an
 * audit event and a whole audit chain; every refusal must leave the database as it was.
 */
import { and, count, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { loadViewer, startSession } from "~/auth/session.server";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import { LAST_ADMIN_MESSAGE, removeRole } from "~/db/queries/admin-roles.server";
import type { Database } from "~/db/client.server";
import { auditEvents, people, personRoles, personUnits, sessions, units } from "~/db/schema";
import * as newPerson from "~/routes/admin/person-new";
import * as person from "~/routes/admin/person";
import * as peopleList from "~/routes/admin/people";
import { OWN_ADMIN_ROLE_MESSAGE, OWN_DEACTIVATION_MESSAGE } from "~/routes/admin/policy";
import { PERSON_INTENTS } from "~/routes/admin/schemas";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, keptValue, outcome } from "./admin-harness";

let db: Database;
let admin: Viewer;
let therapist: Viewer;
let manager: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  admin = await viewerFor("admin@kestrelvalley.test");
  therapist = await viewerFor("therapist@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
});

const newPersonFields = (over: Record<string, string> = {}) => ({
  name: "Wilhelmina Castellanos",
  email: "w.castellanos@kestrelvalley.test",
  employeeId: "KV-99001",
  title: "Respiratory Therapist I",
  credentialLetters: "CRT",
  hireDate: "2026-11-16",
  homeUnitId: admin.person.homeUnitId ?? "",
  birthMonth: "4",
  firstRole: "therapist",
  ...over,
});

const addPerson = (viewer: Viewer, fields: Record<string, string>) =>
  outcome(newPerson.action(args<ArgsOf<typeof newPerson.action>>(postForm("/admin/people/new", fields), viewer)));

const onPerson = (viewer: Viewer, personId: string, fields: Record<string, string>) =>
  outcome(person.action(args<ArgsOf<typeof person.action>>(postForm(`/admin/people/${personId}`, fields), viewer, { personId })));

const personFields = (p: typeof people.$inferSelect) => ({
  name: p.name,
  email: p.email,
  employeeId: p.employeeId ?? "",
  title: p.title ?? "",
  credentialLetters: p.credentialLetters ?? "",
  hireDate: p.hireDate ?? "",
  homeUnitId: p.homeUnitId ?? "",
  birthMonth: p.birthMonth ? String(p.birthMonth) : "",
});

async function auditCount(): Promise<number> {
  const [{ n }] = await db.db.select({ n: count() }).from(auditEvents);
  return n;
}
async function peopleCount(): Promise<number> {
  const [{ n }] = await db.db.select({ n: count() }).from(people);
  return n;
}
async function lastEvents(entityId: string, n = 5) {
  return db.db.select().from(auditEvents).where(eq(auditEvents.entityId, entityId)).orderBy(desc(auditEvents.seq)).limit(n);
}
async function rolesOf(personId: string): Promise<string[]> {
  const rows = await db.db.select({ role: personRoles.role }).from(personRoles).where(eq(personRoles.personId, personId));
  return rows.map((r) => r.role).sort();
}
async function row(personId: string) {
  const [p] = await db.db.select().from(people).where(eq(people.id, personId));
  return p;
}

describe("adding a person", () => {
  it("adds them to the admin's organisation with their first role, audited, and the chain stays whole", async () => {
    const before = await auditCount();
    const result = await addPerson(admin, newPersonFields({ email: "  W.Castellanos@KestrelValley.test " }));
    expect(result.status).toBe(302);
    const id = result.location?.replace("/admin/people/", "") ?? "";
    const added = await row(id);
    expect(added).toMatchObject({
      orgId: admin.org.id,
      name: "Wilhelmina Castellanos",
      email: "w.castellanos@kestrelvalley.test", // trimmed and lower-cased: the sign-in address
      employeeId: "KV-99001",
      hireDate: "2026-11-16",
      birthMonth: 4,
      active: true,
    });
    expect(await rolesOf(id)).toEqual(["therapist"]);

    const events = await lastEvents(id);
    expect(events.map((e) => e.action).sort()).toEqual(["person.created", "role.granted"]);
    for (const e of events) expect(e).toMatchObject({ orgId: admin.org.id, actorId: admin.person.id, entityType: "person" });
    expect(JSON.parse(events.find((e) => e.action === "role.granted")!.detail)).toEqual({ role: "therapist" });
    expect(await auditCount()).toBe(before + 2);
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("the new person appears in the people list and on their own page", async () => {
    const list = await outcome(peopleList.loader(args<ArgsOf<typeof peopleList.loader>>(getRequest("/admin/people?q=castellanos"), admin)));
    const body = list.body as Awaited<ReturnType<typeof peopleList.loader>>;
    expect(body.rows.map((r) => r.email)).toEqual(["w.castellanos@kestrelvalley.test"]);
    expect(body.rows[0].roles).toEqual(["therapist"]);
  });

  it("refuses an e-mail already used in the organisation, names the holder, keeps the typing, writes nothing", async () => {
    const [audits, heads] = [await auditCount(), await peopleCount()];
    const result = await addPerson(admin, newPersonFields({ email: "Therapist@kestrelvalley.test", employeeId: "KV-99002", name: "Second Person" }));
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "email").join(" ")).toMatch(/therapist@kestrelvalley\.test already belongs to Marisol Ellingsen/);
    expect(fieldErrors(result.body, "name")).toEqual([]);
    expect(keptValue(result.body, "name")).toBe("Second Person");
    expect(keptValue(result.body, "employeeId")).toBe("KV-99002");
    expect([await auditCount(), await peopleCount()]).toEqual([audits, heads]);
  });

  it("refuses an e-mail of another organisation without naming its holder (no leak across organisations)", async () => {
    const heads = await peopleCount();
    const result = await addPerson(admin, newPersonFields({ email: "admin@alderbay.test", employeeId: "KV-99003" }));
    expect(result.status).toBe(400);
    const message = fieldErrors(result.body, "email").join(" ");
    expect(message).toMatch(/already in use in Tidemark/);
    expect(message).not.toMatch(/Lindqvist/);
    expect(await peopleCount()).toBe(heads);
  });

  it("refuses an employee id already used in the organisation", async () => {
    const result = await addPerson(admin, newPersonFields({ email: "fresh.one@kestrelvalley.test", employeeId: "KV-20417" }));
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "employeeId").join(" ")).toMatch(/KV-20417 already belongs to Marisol Ellingsen/);
  });

  it("refuses 2026-02-30 with a message about February, and writes nothing", async () => {
    const [audits, heads] = [await auditCount(), await peopleCount()];
    const result = await addPerson(admin, newPersonFields({ email: "feb.thirty@kestrelvalley.test", employeeId: "KV-99004", hireDate: "2026-02-30" }));
    expect(result.status).toBe(400);
    // 2026 is not a leap year: February has 28 days (Gregorian rule, Inter gravissimas, 1582).
    expect(fieldErrors(result.body, "hireDate")).toEqual(["2026-02-30 is not a real date: February 2026 has 28 days."]);
    expect(keptValue(result.body, "hireDate")).toBe("2026-02-30");
    expect([await auditCount(), await peopleCount()]).toEqual([audits, heads]);
  });

  it("refuses a birth month outside 1–12 and a malformed date", async () => {
    const result = await addPerson(admin, newPersonFields({ email: "bad.month@kestrelvalley.test", employeeId: "KV-99005", birthMonth: "13", hireDate: "16/11/2026" }));
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "birthMonth")).toEqual(["Choose a month from the list."]);
    expect(fieldErrors(result.body, "hireDate")).toEqual(["Use the form YYYY-MM-DD, like 2024-03-12."]);
  });

  it("a therapist posting to the add-a-person action gets 403 and nothing is written", async () => {
    const heads = await peopleCount();
    const result = await addPerson(therapist, newPersonFields({ email: "sneaky@kestrelvalley.test", employeeId: "KV-99006" }));
    expect(result.status).toBe(403);
    expect(await peopleCount()).toBe(heads);
  });
});

describe("editing a person", () => {
  it("saves changed fields with their before and after in the audit event", async () => {
    const target = await row(therapist.person.id);
    const result = await onPerson(admin, target.id, { ...personFields(target), title: "Respiratory Therapist III", intent: PERSON_INTENTS.update });
    expect(result).toMatchObject({ status: 302, location: `/admin/people/${target.id}` });
    expect((await row(target.id)).title).toBe("Respiratory Therapist III");
    const [event] = await lastEvents(target.id, 1);
    expect(event.action).toBe("person.updated");
    expect(JSON.parse(event.detail)).toEqual({ changed: { title: { before: target.title, after: "Respiratory Therapist III" } } });
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("an unchanged save writes no audit event", async () => {
    const target = await row(therapist.person.id);
    const before = await auditCount();
    const result = await onPerson(admin, target.id, { ...personFields(target), intent: PERSON_INTENTS.update });
    expect(result.status).toBe(302);
    expect(await auditCount()).toBe(before);
  });

  it("refuses another person's e-mail when editing, and saves nothing of the form", async () => {
    const target = await row(therapist.person.id);
    const result = await onPerson(admin, target.id, { ...personFields(target), title: "Changed but refused", email: "manager@kestrelvalley.test", intent: PERSON_INTENTS.update });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "email").join(" ")).toMatch(/already belongs to Harriet Valdivia/);
    expect((await row(target.id)).title).toBe(target.title);
    expect(keptValue(result.body, "title")).toBe("Changed but refused");
  });

  it("the person page shows their recent history, newest first", async () => {
    const page = await outcome(person.loader(args<ArgsOf<typeof person.loader>>(getRequest(`/admin/people/${therapist.person.id}`), admin, { personId: therapist.person.id })));
    const body = page.body as Awaited<ReturnType<typeof person.loader>>;
    expect(body.history[0]).toMatchObject({ what: "Details changed: title", by: admin.person.name });
    expect(body.history.length).toBeLessThanOrEqual(20);
    expect(body.person).not.toHaveProperty("signingPinHash");
  });

  it("an unknown intent is a 400", async () => {
    const result = await onPerson(admin, therapist.person.id, { intent: "make-coffee" });
    expect(result.status).toBe(400);
  });

  it("a therapist calling the person action or loader gets 403", async () => {
    const target = await row(manager.person.id);
    const result = await onPerson(therapist, target.id, { ...personFields(target), name: "Hijacked", intent: PERSON_INTENTS.update });
    expect(result.status).toBe(403);
    expect((await row(target.id)).name).toBe(target.name);
    const granted = await onPerson(therapist, therapist.person.id, { role: "admin", intent: PERSON_INTENTS.grantRole });
    expect(granted.status).toBe(403);
    expect(await rolesOf(therapist.person.id)).not.toContain("admin");
    const page = await outcome(person.loader(args<ArgsOf<typeof person.loader>>(getRequest(`/admin/people/${target.id}`), therapist, { personId: target.id })));
    expect(page.status).toBe(403);
    const list = await outcome(peopleList.loader(args<ArgsOf<typeof peopleList.loader>>(getRequest("/admin/people"), therapist)));
    expect(list.status).toBe(403);
  });
});

describe("roles", () => {
  it("grants and removes a role, each audited", async () => {
    const id = therapist.person.id;
    const granted = await onPerson(admin, id, { role: "preceptor", intent: PERSON_INTENTS.grantRole });
    expect(granted.status).toBe(302);
    expect(await rolesOf(id)).toEqual(["preceptor", "therapist"]);
    const [grant] = await lastEvents(id, 1);
    expect(grant).toMatchObject({ action: "role.granted", actorId: admin.person.id, entityType: "person", entityId: id });
    expect(JSON.parse(grant.detail)).toEqual({ role: "preceptor" });

    const removed = await onPerson(admin, id, { role: "preceptor", intent: PERSON_INTENTS.removeRole });
    expect(removed.status).toBe(302);
    expect(await rolesOf(id)).toEqual(["therapist"]);
    const [removal] = await lastEvents(id, 1);
    expect(removal).toMatchObject({ action: "role.removed", actorId: admin.person.id });
    expect(JSON.parse(removal.detail)).toEqual({ role: "preceptor" });
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("granting a role already held changes nothing and writes no event", async () => {
    const before = await auditCount();
    const result = await onPerson(admin, therapist.person.id, { role: "therapist", intent: PERSON_INTENTS.grantRole });
    expect(result.status).toBe(302);
    expect(await auditCount()).toBe(before);
  });

  it("refuses a role that does not exist", async () => {
    const result = await onPerson(admin, therapist.person.id, { role: "superuser", intent: PERSON_INTENTS.grantRole });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "role")).toEqual(["Choose a role from the list."]);
  });

  it("an admin cannot remove their own admin role: a clear message, the role stays, nothing is audited", async () => {
    const before = await auditCount();
    const result = await onPerson(admin, admin.person.id, { role: "admin", intent: PERSON_INTENTS.removeRole });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "")).toEqual([OWN_ADMIN_ROLE_MESSAGE]);
    expect(await rolesOf(admin.person.id)).toContain("admin");
    expect(await auditCount()).toBe(before);
  });

  it("the organisation's last active admin keeps the role even if another caller asks (no lock-out)", async () => {
    // Kestrel Valley has one admin (PRODUCT.md demo scenario). Called directly, as a second admin
    // removing them at the same moment would be.
    const result = await removeRole(admin.org.id, manager.person.id, admin.person.id, "admin");
    expect(result).toEqual({ ok: false, message: LAST_ADMIN_MESSAGE });
    expect(await rolesOf(admin.person.id)).toContain("admin");
  });
});

describe("managed units", () => {
  it("a manager's managed units can be removed and added back, audited", async () => {
    const id = manager.person.id;
    const [unit] = await db.db.select().from(units).where(and(eq(units.orgId, admin.org.id), eq(units.code, "ED")));
    const managed = async () =>
      (await db.db.select().from(personUnits).where(and(eq(personUnits.personId, id), eq(personUnits.relation, "manages")))).map((r) => r.unitId);
    expect(await managed()).toContain(unit.id);

    expect((await onPerson(admin, id, { unitId: unit.id, intent: PERSON_INTENTS.removeManagedUnit })).status).toBe(302);
    expect(await managed()).not.toContain(unit.id);
    expect((await lastEvents(id, 1))[0]).toMatchObject({ action: "managed-unit.removed" });

    expect((await onPerson(admin, id, { unitId: unit.id, intent: PERSON_INTENTS.addManagedUnit })).status).toBe(302);
    expect(await managed()).toContain(unit.id);
    const [event] = await lastEvents(id, 1);
    expect(event.action).toBe("managed-unit.added");
    expect(JSON.parse(event.detail)).toEqual({ unitId: unit.id, unit: "Emergency" });
  });

  it("only managers manage units", async () => {
    const [unit] = await db.db.select().from(units).where(and(eq(units.orgId, admin.org.id), eq(units.code, "ED")));
    const result = await onPerson(admin, therapist.person.id, { unitId: unit.id, intent: PERSON_INTENTS.addManagedUnit });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "").join(" ")).toMatch(/Manager role first/);
  });
});

describe("deactivating a person", () => {
  it("asks twice: without the confirmation nothing happens", async () => {
    const result = await onPerson(admin, therapist.person.id, { intent: PERSON_INTENTS.deactivate });
    expect(result.status).toBe(400);
    expect((await row(therapist.person.id)).active).toBe(true);
  });

  it("an admin cannot deactivate themselves", async () => {
    const result = await onPerson(admin, admin.person.id, { intent: PERSON_INTENTS.deactivate, confirm: "yes" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "")).toEqual([OWN_DEACTIVATION_MESSAGE]);
    expect((await row(admin.person.id)).active).toBe(true);
  });

  it("ends every open session of theirs, so their browser is signed out, and it is audited", async () => {
    const id = therapist.person.id;
    // Two browsers signed in as the therapist.
    await startSession(id, therapist.org.id, getRequest("/login/code"));
    await startSession(id, therapist.org.id, getRequest("/login/code"));
    const open = await db.db.select().from(sessions).where(eq(sessions.personId, id));
    const openIds = open.filter((s) => s.endedAt === null).map((s) => s.id);
    expect(openIds.length).toBeGreaterThanOrEqual(2);
    expect(await loadViewer(openIds[0])).not.toBeNull();

    const result = await onPerson(admin, id, { intent: PERSON_INTENTS.deactivate, confirm: "yes" });
    expect(result).toMatchObject({ status: 302, location: `/admin/people/${id}` });
    expect((await row(id)).active).toBe(false);
    const after = await db.db.select().from(sessions).where(eq(sessions.personId, id));
    expect(after.every((s) => s.endedAt !== null)).toBe(true);
    for (const sessionId of openIds) expect(await loadViewer(sessionId)).toBeNull();

    const [event] = await lastEvents(id, 1);
    expect(event).toMatchObject({ action: "person.deactivated", actorId: admin.person.id });
    expect(JSON.parse(event.detail)).toMatchObject({ active: { before: true, after: false }, sessionsEnded: openIds.length });
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("a deactivated person is listed only under Inactive, and can be reactivated", async () => {
    const id = therapist.person.id;
    const list = async (status: string) =>
      ((await outcome(peopleList.loader(args<ArgsOf<typeof peopleList.loader>>(getRequest(`/admin/people?q=${encodeURIComponent(therapist.person.email)}&status=${status}`), admin)))).body as Awaited<ReturnType<typeof peopleList.loader>>).rows.map((r) => r.id);
    expect(await list("active")).toEqual([]);
    expect(await list("inactive")).toEqual([id]);

    const result = await onPerson(admin, id, { intent: PERSON_INTENTS.reactivate });
    expect(result.status).toBe(302);
    expect((await row(id)).active).toBe(true);
    expect((await lastEvents(id, 1))[0].action).toBe("person.reactivated");
  });
});
