/**
 * Admin › Organisation settings and Units, as loaders and actions on a seeded copy of the demo
 * database: saved with audit events, refused with field errors, deactivation asked twice.
 */
import { count, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import type { Database } from "~/db/client.server";
import { auditEvents, organisations, units } from "~/db/schema";
import * as settingsRoute from "~/routes/admin/index";
import * as unitsRoute from "~/routes/admin/units";
import { UNIT_INTENTS } from "~/routes/admin/schemas";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, keptValue, outcome } from "./admin-harness";

let db: Database;
let admin: Viewer;
let therapist: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  admin = await viewerFor("admin@kestrelvalley.test");
  therapist = await viewerFor("therapist@kestrelvalley.test");
});

const saveSettings = (viewer: Viewer, fields: Record<string, string>) =>
  outcome(settingsRoute.action(args<ArgsOf<typeof settingsRoute.action>>(postForm("/admin?index", fields), viewer)));
const onUnits = (viewer: Viewer, fields: Record<string, string>) =>
  outcome(unitsRoute.action(args<ArgsOf<typeof unitsRoute.action>>(postForm("/admin/units", fields), viewer)));
const unitList = async (viewer: Viewer) =>
  ((await outcome(unitsRoute.loader(args<ArgsOf<typeof unitsRoute.loader>>(getRequest("/admin/units"), viewer)))).body as Awaited<ReturnType<typeof unitsRoute.loader>>).units;

async function auditCount(): Promise<number> {
  const [{ n }] = await db.db.select({ n: count() }).from(auditEvents);
  return n;
}
async function lastEvent() {
  const [e] = await db.db.select().from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1);
  return e;
}
async function org() {
  const [o] = await db.db.select().from(organisations).where(eq(organisations.id, admin.org.id));
  return o;
}

describe("organisation settings", () => {
  it("loads the organisation's settings and the server's IANA time zones", async () => {
    const page = await outcome(settingsRoute.loader(args<ArgsOf<typeof settingsRoute.loader>>(getRequest("/admin"), admin)));
    const body = page.body as Awaited<ReturnType<typeof settingsRoute.loader>>;
    expect(body.settings).toMatchObject({ name: "Kestrel Valley Medical Center", timeZone: "America/Chicago" });
    expect(body.timeZones).toContain("America/Chicago");
    expect(body.timeZones).toContain("Pacific/Honolulu");
  });

  it("saves, audits the changed fields only, and keeps the other settings (reminder policy)", async () => {
    const before = await org();
    const result = await saveSettings(admin, {
      name: "Kestrel Valley Medical Center",
      timeZone: "America/Denver",
      educationLeadName: "Leonie Okonkwo, MEd, RRT",
      contactEmail: before.settings.contactEmail ?? "",
    });
    expect(result).toMatchObject({ status: 302, location: "/admin" });
    const after = await org();
    expect(after.timeZone).toBe("America/Denver");
    expect(after.settings.educationLeadName).toBe("Leonie Okonkwo, MEd, RRT");
    expect(after.settings.reminderDays).toEqual(before.settings.reminderDays);
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "organisation.updated", entityType: "organisation", entityId: admin.org.id, actorId: admin.person.id });
    expect(JSON.parse(event.detail)).toEqual({
      changed: {
        timeZone: { before: "America/Chicago", after: "America/Denver" },
        educationLeadName: { before: before.settings.educationLeadName, after: "Leonie Okonkwo, MEd, RRT" },
      },
    });
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("refuses a time zone the server does not know, keeps what was typed, writes nothing", async () => {
    const before = await auditCount();
    const result = await saveSettings(admin, { name: "Renamed Hospital", timeZone: "Mars/Olympus_Mons", contactEmail: "not-an-address" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "timeZone")[0]).toMatch(/Choose a time zone from the list/);
    expect(fieldErrors(result.body, "contactEmail")[0]).toMatch(/full e-mail address/);
    expect(keptValue(result.body, "name")).toBe("Renamed Hospital");
    expect((await org()).name).toBe("Kestrel Valley Medical Center");
    expect(await auditCount()).toBe(before);
  });

  it("requires the organisation's name", async () => {
    const result = await saveSettings(admin, { name: "  ", timeZone: "America/Chicago" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "name")).toEqual(["Enter the organisation's name."]);
  });

  it("a therapist gets 403 from the settings loader and action", async () => {
    expect((await outcome(settingsRoute.loader(args<ArgsOf<typeof settingsRoute.loader>>(getRequest("/admin"), therapist)))).status).toBe(403);
    expect((await saveSettings(therapist, { name: "Taken over", timeZone: "UTC" })).status).toBe(403);
    expect((await org()).name).toBe("Kestrel Valley Medical Center");
  });
});

describe("units", () => {
  it("lists the organisation's units with how many active people call each home", async () => {
    const list = await unitList(admin);
    expect(list.map((u) => u.code).sort()).toEqual(["AICU", "ED", "FLR", "NICU"]);
    const total = list.reduce((n, u) => n + u.homeStaff, 0);
    expect(total).toBe(42); // PRODUCT.md demo scenario: 40 therapists, 1 manager, 1 admin, each with a home unit
  });

  it("adds a unit, audited", async () => {
    const result = await onUnits(admin, { intent: UNIT_INTENTS.create, name: "Pediatric ICU", code: "picu" });
    expect(result.status).toBe(302);
    expect(result.location).toMatch(/^\/admin\/units\?added=/);
    const [unit] = await db.db.select().from(units).where(eq(units.name, "Pediatric ICU"));
    expect(unit).toMatchObject({ orgId: admin.org.id, code: "PICU", active: true });
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "unit.created", entityType: "unit", entityId: unit.id, actorId: admin.person.id });
    expect(JSON.parse(event.detail)).toEqual({ name: "Pediatric ICU", code: "PICU" });
  });

  it("refuses a name or short code already used in the organisation, in any letter case", async () => {
    const before = await auditCount();
    const result = await onUnits(admin, { intent: UNIT_INTENTS.create, name: "adult icu", code: "nicu" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "name")).toEqual(["Your organisation already has a unit called adult icu."]);
    expect(fieldErrors(result.body, "code")).toEqual(["The short code NICU is already used by another unit."]);
    expect(await auditCount()).toBe(before);
  });

  it("refuses a short code with spaces or symbols", async () => {
    const result = await onUnits(admin, { intent: UNIT_INTENTS.create, name: "Burn Unit", code: "BU RN!" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "code")[0]).toMatch(/letters, digits and hyphens/);
  });

  it("renames a unit with before and after in the audit event; its own name is not a clash", async () => {
    const [unit] = await db.db.select().from(units).where(eq(units.name, "Pediatric ICU"));
    const result = await onUnits(admin, { intent: UNIT_INTENTS.rename, unitId: unit.id, name: "Paediatric ICU", code: "PICU" });
    expect(result.status).toBe(302);
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "unit.renamed", entityId: unit.id });
    expect(JSON.parse(event.detail)).toEqual({ changed: { name: { before: "Pediatric ICU", after: "Paediatric ICU" } } });
  });

  it("renaming onto another unit's name is refused", async () => {
    const [unit] = await db.db.select().from(units).where(eq(units.code, "PICU"));
    const result = await onUnits(admin, { intent: UNIT_INTENTS.rename, unitId: unit.id, name: "Emergency", code: "PICU" });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "name")[0]).toMatch(/already has a unit called Emergency/);
  });

  it("deactivation asks twice; confirmed, the unit is inactive and it is audited; it can be reactivated", async () => {
    const [unit] = await db.db.select().from(units).where(eq(units.code, "PICU"));
    const unconfirmed = await onUnits(admin, { intent: UNIT_INTENTS.deactivate, unitId: unit.id });
    expect(unconfirmed.status).toBe(400);
    expect((await db.db.select().from(units).where(eq(units.id, unit.id)))[0].active).toBe(true);

    const confirmed = await onUnits(admin, { intent: UNIT_INTENTS.deactivate, unitId: unit.id, confirm: "yes" });
    expect(confirmed.status).toBe(302);
    expect((await db.db.select().from(units).where(eq(units.id, unit.id)))[0].active).toBe(false);
    expect(await lastEvent()).toMatchObject({ action: "unit.deactivated", entityId: unit.id });

    expect((await onUnits(admin, { intent: UNIT_INTENTS.reactivate, unitId: unit.id })).status).toBe(302);
    expect((await db.db.select().from(units).where(eq(units.id, unit.id)))[0].active).toBe(true);
    expect(await lastEvent()).toMatchObject({ action: "unit.reactivated", entityId: unit.id });
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });

  it("an unknown intent is a 400, and a therapist gets 403", async () => {
    expect((await onUnits(admin, { intent: "delete-everything" })).status).toBe(400);
    expect((await onUnits(therapist, { intent: UNIT_INTENTS.create, name: "Shadow Unit", code: "SHD" })).status).toBe(403);
    expect(await db.db.select().from(units).where(eq(units.code, "SHD"))).toEqual([]);
    expect((await outcome(unitsRoute.loader(args<ArgsOf<typeof unitsRoute.loader>>(getRequest("/admin/units"), therapist)))).status).toBe(403);
  });
});
