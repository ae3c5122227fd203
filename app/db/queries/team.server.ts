/**
 * The Team ledger: the people a manager manages (through their units) or, for an educator, the
 * whole organisation, with roles, units, hire date, active flag and a credentials summary.
 * Search, sort and paging run in SQL so a 2,000-person hospital sends one page of rows, and the
 * page works from its address alone (app/routes/team/search-params.ts).
 */
import { and, asc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { database } from "~/db/client.server";
import { cachedRead } from "~/db/read-cache.server";
import { personRoles, personUnits, units } from "~/db/schema";
import { isRole, ROLES, type Role } from "~/auth/roles";
import type { CredentialCounts, IsoDate, StatusOptions } from "~/domain/status";
import type { TeamQuery, TeamSort } from "~/routes/team/search-params";
import { credentialSummaryCtes, onUnits } from "./credential-summary.server";
import type { UnitRef } from "./people.server";

/** Rows per page: a screenful a manager can scan; 2,000 people make 40 pages. */
export const TEAM_PAGE_SIZE = 50;

/** Who the viewer may see: people of the units they manage, or the whole organisation (read). */
export type TeamScope = { kind: "units"; units: UnitRef[] } | { kind: "organisation" };

export type TeamRow = {
  id: string;
  name: string;
  email: string;
  employeeId: string | null;
  title: string | null;
  hireDate: IsoDate | null;
  active: boolean;
  homeUnit: string | null;
  otherUnits: string[];
  roles: Role[];
  credentials: CredentialCounts;
};

export type TeamPage = {
  rows: TeamRow[];
  /** People in scope before the search. */
  inScope: number;
  /** People matching the search. */
  matching: number;
  page: number;
  pageCount: number;
  pageSize: number;
};

/** Case-insensitive substring of name, e-mail or employee id (SQLite's LIKE folds ASCII letters only). */
function matchesSearch(q: string): SQL {
  const needle = q.trim();
  if (!needle) return sql`1`;
  const pattern = `%${needle.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return sql`(p.name like ${pattern} escape '\\' or p.email like ${pattern} escape '\\' or coalesce(p.employee_id, '') like ${pattern} escape '\\')`;
}

/** ORDER BY for a column; ties fall back to the name, then the id, so paging is stable. */
function orderBy(sort: TeamSort, direction: "asc" | "desc"): SQL {
  const dir = sql.raw(direction === "asc" ? "asc" : "desc");
  const byName = sql`p.name collate nocase asc, p.id asc`;
  switch (sort) {
    case "name":
      return sql`p.name collate nocase ${dir}, p.id ${dir}`;
    case "unit":
      return sql`(hu.name is null) asc, hu.name collate nocase ${dir}, ${byName}`;
    case "hire":
      return sql`(p.hire_date is null) asc, p.hire_date ${dir}, ${byName}`;
    case "lapsed":
      return sql`coalesce(s.lapsed, 0) ${dir}, coalesce(s.due_soon, 0) ${dir}, ${byName}`;
  }
}

type PageRow = {
  id: string;
  name: string;
  email: string;
  employee_id: string | null;
  title: string | null;
  hire_date: string | null;
  active: number;
  home_unit_id: string | null;
  home_unit: string | null;
  lapsed: number | null;
  due_soon: number | null;
  current: number | null;
  waived: number | null;
};

/** One page of the Team ledger for the viewer's organisation and scope (cached until the next write). */
export async function listTeam(orgId: string, scope: TeamScope, query: TeamQuery, options: StatusOptions): Promise<TeamPage> {
  const key = JSON.stringify(["team", orgId, scope, query, options]);
  return cachedRead(await database(), key, () => readTeamPage(orgId, scope, query, options));
}

async function readTeamPage(orgId: string, scope: TeamScope, query: TeamQuery, options: StatusOptions): Promise<TeamPage> {
  const { db } = await database();
  const inScope = onUnits(orgId, scope.kind === "units" ? scope.units.map((u) => u.id) : null);
  const search = matchesSearch(query.q);
  const [totals] = await db.all<{ in_scope: number; matching: number | null }>(sql`
    select count(*) as in_scope, sum(case when ${search} then 1 else 0 end) as matching
    from people p
    where p.org_id = ${orgId} and ${inScope}`);
  const matching = Number(totals?.matching ?? 0);
  const pageCount = Math.max(1, Math.ceil(matching / TEAM_PAGE_SIZE));
  const page = Math.min(Math.max(1, query.page), pageCount);

  const rows =
    matching === 0
      ? []
      : await db.all<PageRow>(sql`
    with ${credentialSummaryCtes(orgId, options)}
    select p.id, p.name, p.email, p.employee_id, p.title, p.hire_date, p.active, p.home_unit_id, hu.name as home_unit,
           s.lapsed, s.due_soon, s.current, s.waived
    from people p
    left join units hu on hu.id = p.home_unit_id and hu.org_id = ${orgId}
    left join summary s on s.person_id = p.id
    where p.org_id = ${orgId} and ${inScope} and ${search}
    order by ${orderBy(query.sort, query.dir)}
    limit ${TEAM_PAGE_SIZE} offset ${(page - 1) * TEAM_PAGE_SIZE}`);

  const ids = rows.map((r) => r.id);
  const [roleRows, memberRows] =
    ids.length === 0
      ? [[], []]
      : await Promise.all([
          db
            .select({ personId: personRoles.personId, role: personRoles.role })
            .from(personRoles)
            .where(and(eq(personRoles.orgId, orgId), inArray(personRoles.personId, ids))),
          db
            .select({ personId: personUnits.personId, unitId: personUnits.unitId, name: units.name })
            .from(personUnits)
            .innerJoin(units, and(eq(units.id, personUnits.unitId), eq(units.orgId, orgId)))
            .where(and(eq(personUnits.orgId, orgId), eq(personUnits.relation, "member"), inArray(personUnits.personId, ids)))
            .orderBy(asc(units.name)),
        ]);
  const rolesOf = new Map<string, Role[]>();
  for (const r of roleRows) if (isRole(r.role)) rolesOf.set(r.personId, [...(rolesOf.get(r.personId) ?? []), r.role]);
  const unitsOf = new Map<string, { unitId: string; name: string }[]>();
  for (const m of memberRows) unitsOf.set(m.personId, [...(unitsOf.get(m.personId) ?? []), m]);

  return {
    rows: rows.map((r) => ({
      id: r.id,
      name: r.name,
      email: r.email,
      employeeId: r.employee_id,
      title: r.title,
      hireDate: r.hire_date,
      active: Boolean(r.active),
      homeUnit: r.home_unit,
      otherUnits: (unitsOf.get(r.id) ?? []).filter((u) => u.unitId !== r.home_unit_id).map((u) => u.name),
      roles: (rolesOf.get(r.id) ?? []).sort((a, b) => ROLES.indexOf(a) - ROLES.indexOf(b)),
      credentials: { lapsed: Number(r.lapsed ?? 0), dueSoon: Number(r.due_soon ?? 0), current: Number(r.current ?? 0), waived: Number(r.waived ?? 0) },
    })),
    inScope: Number(totals?.in_scope ?? 0),
    matching,
    page,
    pageCount,
    pageSize: TEAM_PAGE_SIZE,
  };
}

/** The units a person manages (person_units relation "manages"). */
export async function listManagedUnits(orgId: string, personId: string): Promise<UnitRef[]> {
  const { db } = await database();
  return db
    .select({ id: units.id, name: units.name })
    .from(personUnits)
    .innerJoin(units, and(eq(units.id, personUnits.unitId), eq(units.orgId, orgId)))
    .where(and(eq(personUnits.orgId, orgId), eq(personUnits.personId, personId), eq(personUnits.relation, "manages")))
    .orderBy(asc(units.name));
}
