/**
 * Admin data access: organisation settings and units. Every function takes the signed-in
 * admin's organisation id first (never one from a form), and every change is written with its
 * audit event in one transaction. People, roles and managed units: admin-people.server.ts.
 */
import { and, asc, eq, ne, sql } from "drizzle-orm";
import type { OrganisationValues, UnitValues } from "~/routes/admin/schemas";
import { recordAudit } from "../audit.server";
import { database } from "../client.server";
import { organisations, people, units, type Unit } from "../schema";
import { fieldChanges } from "./field-changes";
import { uniqueViolation } from "./unique-violation";

// ── Organisation ────────────────────────────────────────────────────────────────────────────

export type OrganisationSettingsView = OrganisationValues & { id: string };

export async function getOrganisationSettings(orgId: string): Promise<OrganisationSettingsView | undefined> {
  const { db } = await database();
  const [org] = await db.select().from(organisations).where(eq(organisations.id, orgId));
  if (!org) return undefined;
  return {
    id: org.id,
    name: org.name,
    timeZone: org.timeZone,
    educationLeadName: org.settings.educationLeadName ?? null,
    contactEmail: org.settings.contactEmail ?? null,
  };
}

/** Saves the settings; returns the changed fields (none: nothing written, no audit event). */
export async function updateOrganisationSettings(orgId: string, actorId: string, values: OrganisationValues, now: Date = new Date()) {
  const { write } = await database();
  return write(async (tx) => {
    const [org] = await tx.select().from(organisations).where(eq(organisations.id, orgId));
    if (!org) throw new Error(`organisation ${orgId} not found`);
    const before = {
      name: org.name,
      timeZone: org.timeZone,
      educationLeadName: org.settings.educationLeadName ?? null,
      contactEmail: org.settings.contactEmail ?? null,
    };
    const changed = fieldChanges(before, values);
    if (Object.keys(changed).length === 0) return changed;
    // Settings is one JSON column shared with other sections (reminder policy…): merge, don't replace.
    const settings = { ...org.settings };
    if (values.educationLeadName) settings.educationLeadName = values.educationLeadName;
    else delete settings.educationLeadName;
    if (values.contactEmail) settings.contactEmail = values.contactEmail;
    else delete settings.contactEmail;
    await tx
      .update(organisations)
      .set({ name: values.name, timeZone: values.timeZone, settings, updatedAt: now })
      .where(eq(organisations.id, orgId));
    await recordAudit(tx, { orgId, actorId, action: "organisation.updated", entityType: "organisation", entityId: orgId, detail: { changed } }, now);
    return changed;
  });
}

// ── Units ───────────────────────────────────────────────────────────────────────────────────

export type UnitRow = Pick<Unit, "id" | "name" | "code" | "active"> & { homeStaff: number; managers: number };

/** The organisation's units, active first, with how many active people call each home. */
export async function listUnits(orgId: string): Promise<UnitRow[]> {
  const { db } = await database();
  return db
    .select({
      id: units.id,
      name: units.name,
      code: units.code,
      active: units.active,
      // Spelled out: in a one-table select Drizzle renders ${units.id} as a bare "id", which
      // inside the subquery would mean the inner table's id.
      homeStaff: sql<number>`(select count(*) from people p where p.home_unit_id = "units"."id" and p.org_id = ${orgId} and p.active = 1)`,
      managers: sql<number>`(select count(*) from person_units pu where pu.unit_id = "units"."id" and pu.org_id = ${orgId} and pu.relation = 'manages')`,
    })
    .from(units)
    .where(eq(units.orgId, orgId))
    .orderBy(sql`${units.active} desc`, asc(units.name));
}

/** A unit of this organisation, or undefined (a unit of another organisation is "not found"). */
export async function getUnit(orgId: string, unitId: string): Promise<Unit | undefined> {
  const { db } = await database();
  const [unit] = await db.select().from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
  return unit;
}

/** Uniqueness checks for the unit form (any letter case), leaving out the unit being renamed. */
export function unitChecks(orgId: string, exceptUnitId?: string) {
  const taken = async (column: typeof units.name | typeof units.code, value: string) => {
    const { db } = await database();
    const [row] = await db
      .select({ id: units.id })
      .from(units)
      .where(and(eq(units.orgId, orgId), sql`lower(${column}) = lower(${value})`, exceptUnitId ? ne(units.id, exceptUnitId) : undefined))
      .limit(1);
    return !!row;
  };
  return {
    nameTaken: (name: string) => taken(units.name, name),
    codeTaken: (code: string) => taken(units.code, code),
  };
}

export type UnitWriteResult = { ok: true; unitId: string } | { ok: false; field: "name" | "code" };

function unitConflict(error: unknown): UnitWriteResult | null {
  const target = uniqueViolation(error);
  if (target === "units.org_id, units.name") return { ok: false, field: "name" };
  if (target === "units.org_id, units.code") return { ok: false, field: "code" };
  return null;
}

export async function createUnit(orgId: string, actorId: string, values: UnitValues, now: Date = new Date()): Promise<UnitWriteResult> {
  const { write } = await database();
  try {
    return await write(async (tx) => {
      const [unit] = await tx.insert(units).values({ orgId, name: values.name, code: values.code, createdAt: now, updatedAt: now }).returning();
      await recordAudit(tx, { orgId, actorId, action: "unit.created", entityType: "unit", entityId: unit.id, detail: { name: unit.name, code: unit.code } }, now);
      return { ok: true as const, unitId: unit.id };
    });
  } catch (error) {
    const conflict = unitConflict(error);
    if (conflict) return conflict;
    throw error;
  }
}

/** Renames a unit (name and short code); no change writes nothing. */
export async function renameUnit(orgId: string, actorId: string, unitId: string, values: UnitValues, now: Date = new Date()): Promise<UnitWriteResult> {
  const { write } = await database();
  try {
    return await write(async (tx) => {
      const [unit] = await tx.select().from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
      if (!unit) throw new Error(`unit ${unitId} not in organisation ${orgId}`);
      const changed = fieldChanges({ name: unit.name, code: unit.code }, values);
      if (Object.keys(changed).length === 0) return { ok: true as const, unitId };
      await tx.update(units).set({ name: values.name, code: values.code, updatedAt: now }).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
      await recordAudit(tx, { orgId, actorId, action: "unit.renamed", entityType: "unit", entityId: unitId, detail: { changed } }, now);
      return { ok: true as const, unitId };
    });
  } catch (error) {
    const conflict = unitConflict(error);
    if (conflict) return conflict;
    throw error;
  }
}

/**
 * Deactivates or reactivates a unit. People keep it as their home unit and managers keep it:
 * a deactivated unit is only left out of the choices for new assignments.
 */
export async function setUnitActive(orgId: string, actorId: string, unitId: string, active: boolean, now: Date = new Date()): Promise<boolean> {
  const { write } = await database();
  return write(async (tx) => {
    const [unit] = await tx.select().from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
    if (!unit) throw new Error(`unit ${unitId} not in organisation ${orgId}`);
    if (unit.active === active) return false;
    await tx.update(units).set({ active, updatedAt: now }).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
    const [{ homeStaff }] = await tx
      .select({ homeStaff: sql<number>`count(*)` })
      .from(people)
      .where(and(eq(people.orgId, orgId), eq(people.homeUnitId, unitId), eq(people.active, true)));
    await recordAudit(
      tx,
      { orgId, actorId, action: active ? "unit.reactivated" : "unit.deactivated", entityType: "unit", entityId: unitId, detail: { name: unit.name, code: unit.code, homeStaff } },
      now,
    );
    return true;
  });
}
