/**
 * Admin data access for what a person may do: their roles and, for managers, the units they
 * manage (person_units, relation "manages"). Organisation id first, from the signed-in admin;
 * each change and its audit event in one transaction. The audit entity is the person, so the
 * change shows in that person's history.
 */
import { and, eq, ne } from "drizzle-orm";
import type { Role } from "~/auth/roles";
import { roleRemovalRefusal } from "~/routes/admin/policy";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { people, personRoles, personUnits, units } from "../schema";

/** Routes answer 404 before calling; this keeps a direct caller from crossing organisations. */
async function assertPersonInOrg(tx: Tx, orgId: string, personId: string) {
  const [person] = await tx.select({ id: people.id }).from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  if (!person) throw new Error(`person ${personId} not in organisation ${orgId}`);
}

export const LAST_ADMIN_MESSAGE = "This is the organisation's last active admin: grant the Admin role to someone else first.";

export type RoleChangeResult = { ok: true; changed: boolean } | { ok: false; message: string };

export async function grantRole(orgId: string, actorId: string, personId: string, role: Role, now: Date = new Date()): Promise<RoleChangeResult> {
  const { write } = await database();
  return write(async (tx) => {
    await assertPersonInOrg(tx, orgId, personId);
    const inserted = await tx
      .insert(personRoles)
      .values({ personId, orgId, role, grantedBy: actorId, createdAt: now })
      .onConflictDoNothing()
      .returning({ role: personRoles.role });
    if (inserted.length === 0) return { ok: true, changed: false };
    await recordAudit(tx, { orgId, actorId, action: "role.granted", entityType: "person", entityId: personId, detail: { role } }, now);
    return { ok: true, changed: true };
  });
}

export async function removeRole(orgId: string, actorId: string, personId: string, role: Role, now: Date = new Date()): Promise<RoleChangeResult> {
  // Checked here as well as in the action, so no caller can lock the organisation out.
  const refusal = roleRemovalRefusal(actorId, personId, role);
  if (refusal) return { ok: false, message: refusal };
  const { write } = await database();
  return write(async (tx) => {
    if (role === "admin") {
      // Two admins removing each other at the same moment must not leave nobody to undo it.
      const admins = await tx
        .select({ personId: personRoles.personId })
        .from(personRoles)
        .innerJoin(people, eq(people.id, personRoles.personId))
        .where(and(eq(personRoles.orgId, orgId), eq(personRoles.role, "admin"), eq(people.active, true), ne(personRoles.personId, personId)));
      if (admins.length === 0) return { ok: false as const, message: LAST_ADMIN_MESSAGE };
    }
    const removed = await tx
      .delete(personRoles)
      .where(and(eq(personRoles.orgId, orgId), eq(personRoles.personId, personId), eq(personRoles.role, role)))
      .returning({ role: personRoles.role });
    if (removed.length === 0) return { ok: true, changed: false };
    await recordAudit(tx, { orgId, actorId, action: "role.removed", entityType: "person", entityId: personId, detail: { role } }, now);
    return { ok: true, changed: true };
  });
}

export type ManagedUnitResult = { ok: true; changed: boolean; unitName: string } | { ok: false; message: string };

export async function addManagedUnit(orgId: string, actorId: string, personId: string, unitId: string, now: Date = new Date()): Promise<ManagedUnitResult> {
  const { write } = await database();
  return write(async (tx) => {
    await assertPersonInOrg(tx, orgId, personId);
    const [unit] = await tx.select().from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
    if (!unit) return { ok: false, message: "Choose one of your organisation's units." };
    const inserted = await tx
      .insert(personUnits)
      .values({ personId, unitId, orgId, relation: "manages" })
      .onConflictDoNothing()
      .returning({ unitId: personUnits.unitId });
    if (inserted.length === 0) return { ok: true, changed: false, unitName: unit.name };
    await recordAudit(
      tx,
      { orgId, actorId, action: "managed-unit.added", entityType: "person", entityId: personId, detail: { unitId, unit: unit.name } },
      now,
    );
    return { ok: true, changed: true, unitName: unit.name };
  });
}

export async function removeManagedUnit(orgId: string, actorId: string, personId: string, unitId: string, now: Date = new Date()): Promise<ManagedUnitResult> {
  const { write } = await database();
  return write(async (tx) => {
    await assertPersonInOrg(tx, orgId, personId);
    const [unit] = await tx.select().from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId)));
    if (!unit) return { ok: false, message: "Choose one of your organisation's units." };
    const removed = await tx
      .delete(personUnits)
      .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, personId), eq(personUnits.unitId, unitId), eq(personUnits.relation, "manages")))
      .returning({ unitId: personUnits.unitId });
    if (removed.length === 0) return { ok: true, changed: false, unitName: unit.name };
    await recordAudit(
      tx,
      { orgId, actorId, action: "managed-unit.removed", entityType: "person", entityId: personId, detail: { unitId, unit: unit.name } },
      now,
    );
    return { ok: true, changed: true, unitName: unit.name };
  });
}
