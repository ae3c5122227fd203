/**
 * Admin data access for people: the searchable list, one person with roles and managed units,
 * adding, editing and deactivating. The organisation id always comes first and always from the
 * signed-in admin. Roles and managed units: admin-roles.server.ts; history: admin-history.server.ts.
 */
import { and, asc, count, eq, exists, isNull, ne, or, sql, type SQL } from "drizzle-orm";
import { ROLES, isRole, type Role } from "~/auth/roles";
import type { NewPersonValues, PeopleFilter, PersonChecks, PersonValues } from "~/routes/admin/schemas";
import { recordAudit } from "../audit.server";
import { database, type Tx } from "../client.server";
import { people, personRoles, personUnits, sessions, units, type Person } from "../schema";
import { fieldChanges } from "./field-changes";
import { uniqueViolation } from "./unique-violation";

export const PEOPLE_PAGE_SIZE = 100;

const byRoleOrder = (a: Role, b: Role) => ROLES.indexOf(a) - ROLES.indexOf(b);

function rolesOf(list: string | null): Role[] {
  return (list ?? "").split(",").filter(isRole).sort(byRoleOrder);
}

/** `%`, `_` and the escape itself typed into the search box are matched literally. */
function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export type PersonListRow = {
  id: string;
  name: string;
  email: string;
  employeeId: string | null;
  title: string | null;
  credentialLetters: string | null;
  hireDate: string | null;
  homeUnit: string | null;
  active: boolean;
  roles: Role[];
};

/** One page of the organisation's people matching the search and filters, by name. */
export async function listPeople(orgId: string, filter: PeopleFilter): Promise<{ rows: PersonListRow[]; total: number; page: number; pageSize: number }> {
  const { db } = await database();
  const where: (SQL | undefined)[] = [eq(people.orgId, orgId)];
  if (filter.q) {
    const p = likePattern(filter.q);
    where.push(
      or(
        sql`${people.name} like ${p} escape '\\'`,
        sql`${people.email} like ${p} escape '\\'`,
        sql`${people.employeeId} like ${p} escape '\\'`,
      ),
    );
  }
  if (filter.status !== "all") where.push(eq(people.active, filter.status === "active"));
  if (filter.role) {
    where.push(
      exists(
        db
          .select({ one: sql`1` })
          .from(personRoles)
          .where(and(eq(personRoles.personId, people.id), eq(personRoles.orgId, orgId), eq(personRoles.role, filter.role))),
      ),
    );
  }
  if (filter.unit) {
    // A unit "has" a person who calls it home, works on it, or manages it.
    where.push(
      or(
        eq(people.homeUnitId, filter.unit),
        exists(
          db
            .select({ one: sql`1` })
            .from(personUnits)
            .where(and(eq(personUnits.personId, people.id), eq(personUnits.orgId, orgId), eq(personUnits.unitId, filter.unit))),
        ),
      ),
    );
  }
  const condition = and(...where);
  const [{ total }] = await db.select({ total: count() }).from(people).where(condition);
  const pages = Math.max(1, Math.ceil(total / PEOPLE_PAGE_SIZE));
  const page = Math.min(filter.page, pages);
  const rows = await db
    .select({
      id: people.id,
      name: people.name,
      email: people.email,
      employeeId: people.employeeId,
      title: people.title,
      credentialLetters: people.credentialLetters,
      hireDate: people.hireDate,
      homeUnit: units.name,
      active: people.active,
      roleList: sql<string | null>`(select group_concat(pr.role) from person_roles pr where pr.person_id = "people"."id" and pr.org_id = ${orgId})`,
    })
    .from(people)
    .leftJoin(units, and(eq(units.id, people.homeUnitId), eq(units.orgId, orgId)))
    .where(condition)
    .orderBy(asc(sql`lower(${people.name})`), asc(people.id))
    .limit(PEOPLE_PAGE_SIZE)
    .offset((page - 1) * PEOPLE_PAGE_SIZE);
  return { rows: rows.map(({ roleList, ...r }) => ({ ...r, roles: rolesOf(roleList) })), total, page, pageSize: PEOPLE_PAGE_SIZE };
}

export type UnitOption = { id: string; name: string; code: string; active: boolean };

/** Every unit of the organisation, for selects and filters. */
export async function unitOptions(orgId: string): Promise<UnitOption[]> {
  const { db } = await database();
  return db
    .select({ id: units.id, name: units.name, code: units.code, active: units.active })
    .from(units)
    .where(eq(units.orgId, orgId))
    .orderBy(asc(units.name));
}

export type PersonDetail = Person & { roles: Role[]; managedUnits: UnitOption[] };

/** One person of this organisation with roles and managed units; undefined for anyone else's. */
export async function getPerson(orgId: string, personId: string): Promise<PersonDetail | undefined> {
  const { db } = await database();
  const [person] = await db.select().from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  if (!person) return undefined;
  const roles = await db
    .select({ role: personRoles.role })
    .from(personRoles)
    .where(and(eq(personRoles.orgId, orgId), eq(personRoles.personId, personId)));
  const managedUnits = await db
    .select({ id: units.id, name: units.name, code: units.code, active: units.active })
    .from(personUnits)
    .innerJoin(units, and(eq(units.id, personUnits.unitId), eq(units.orgId, orgId)))
    .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, personId), eq(personUnits.relation, "manages")))
    .orderBy(asc(units.name));
  return { ...person, roles: roles.map((r) => r.role).sort(byRoleOrder), managedUnits };
}

/** The database checks of the person form, leaving out the person being edited. */
export function personChecks(orgId: string, exceptPersonId?: string): PersonChecks {
  const notSelf = exceptPersonId ? ne(people.id, exceptPersonId) : undefined;
  return {
    // E-mail is unique across all of Tidemark: one address signs in to one organisation.
    async emailHolder(email) {
      const { db } = await database();
      const [row] = await db
        .select({ orgId: people.orgId, name: people.name })
        .from(people)
        .where(and(eq(people.email, email), notSelf))
        .limit(1);
      return row ? { sameOrganisation: row.orgId === orgId, name: row.name } : null;
    },
    async employeeIdHolder(employeeId) {
      const { db } = await database();
      const [row] = await db
        .select({ name: people.name })
        .from(people)
        .where(and(eq(people.orgId, orgId), eq(people.employeeId, employeeId), notSelf))
        .limit(1);
      return row ?? null;
    },
    async unitKnown(unitId) {
      const { db } = await database();
      const [row] = await db.select({ id: units.id }).from(units).where(and(eq(units.orgId, orgId), eq(units.id, unitId))).limit(1);
      return !!row;
    },
  };
}

export type PersonWriteResult = { ok: true; personId: string } | { ok: false; field: "email" | "employeeId" };

function personConflict(error: unknown): PersonWriteResult | null {
  const target = uniqueViolation(error);
  if (target === "people.email") return { ok: false, field: "email" };
  if (target === "people.org_id, people.employee_id") return { ok: false, field: "employeeId" };
  return null;
}

function personColumns(v: PersonValues) {
  return {
    name: v.name,
    email: v.email,
    employeeId: v.employeeId,
    title: v.title,
    credentialLetters: v.credentialLetters,
    hireDate: v.hireDate,
    homeUnitId: v.homeUnitId,
    birthMonth: v.birthMonth,
  };
}

export async function createPerson(orgId: string, actorId: string, values: NewPersonValues, now: Date = new Date()): Promise<PersonWriteResult> {
  const { write } = await database();
  try {
    return await write(async (tx) => {
      const columns = personColumns(values);
      const [person] = await tx
        .insert(people)
        .values({ ...columns, orgId, active: true, createdAt: now, updatedAt: now })
        .returning({ id: people.id });
      await recordAudit(tx, { orgId, actorId, action: "person.created", entityType: "person", entityId: person.id, detail: { values: columns } }, now);
      if (values.firstRole) {
        await tx.insert(personRoles).values({ personId: person.id, orgId, role: values.firstRole, grantedBy: actorId, createdAt: now });
        await recordAudit(tx, { orgId, actorId, action: "role.granted", entityType: "person", entityId: person.id, detail: { role: values.firstRole } }, now);
      }
      return { ok: true as const, personId: person.id };
    });
  } catch (error) {
    const conflict = personConflict(error);
    if (conflict) return conflict;
    throw error;
  }
}

/** Saves the person's details; an unchanged save writes nothing. */
export async function updatePerson(
  orgId: string,
  actorId: string,
  personId: string,
  values: PersonValues,
  now: Date = new Date(),
): Promise<PersonWriteResult & { changed?: string[] }> {
  const { write } = await database();
  try {
    return await write(async (tx) => {
      const [before] = await tx.select().from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
      if (!before) throw new Error(`person ${personId} not in organisation ${orgId}`);
      const columns = personColumns(values);
      const changed = fieldChanges(before, columns);
      const fields = Object.keys(changed);
      if (fields.length === 0) return { ok: true as const, personId, changed: fields };
      await tx.update(people).set({ ...columns, updatedAt: now }).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
      await recordAudit(tx, { orgId, actorId, action: "person.updated", entityType: "person", entityId: personId, detail: { changed } }, now);
      return { ok: true as const, personId, changed: fields };
    });
  } catch (error) {
    const conflict = personConflict(error);
    if (conflict) return conflict;
    throw error;
  }
}

/**
 * Inside a write: sets a person active or not and audits it; deactivating also ends their open
 * sessions. `source` marks where the change came from (e.g. "roster"). Returns sessions ended.
 */
export async function applyActive(tx: Tx, orgId: string, actorId: string, personId: string, active: boolean, now: Date, source?: string): Promise<number> {
  await tx.update(people).set({ active, updatedAt: now }).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
  let sessionsEnded = 0;
  if (!active) {
    const ended = await tx
      .update(sessions)
      .set({ endedAt: now })
      .where(and(eq(sessions.orgId, orgId), eq(sessions.personId, personId), isNull(sessions.endedAt)))
      .returning({ id: sessions.id });
    sessionsEnded = ended.length;
  }
  const from = source ? { source } : {};
  await recordAudit(
    tx,
    {
      orgId,
      actorId,
      action: active ? "person.reactivated" : "person.deactivated",
      entityType: "person",
      entityId: personId,
      detail: active ? { active: { before: false, after: true }, ...from } : { active: { before: true, after: false }, sessionsEnded, ...from },
    },
    now,
  );
  return sessionsEnded;
}

/**
 * Deactivates or reactivates a person. Deactivating also ends every open session of theirs
 * (sessions.endedAt), so a browser still signed in as them stops working at its next request.
 */
export async function setPersonActive(
  orgId: string,
  actorId: string,
  personId: string,
  active: boolean,
  now: Date = new Date(),
): Promise<{ changed: boolean; sessionsEnded: number }> {
  const { write } = await database();
  return write(async (tx) => {
    const [person] = await tx.select().from(people).where(and(eq(people.orgId, orgId), eq(people.id, personId)));
    if (!person) throw new Error(`person ${personId} not in organisation ${orgId}`);
    if (person.active === active) return { changed: false, sessionsEnded: 0 };
    const sessionsEnded = await applyActive(tx, orgId, actorId, personId, active, now);
    return { changed: true, sessionsEnded };
  });
}
