/**
 * The Team matrix: people × requirements, each cell a status from the same engine as My plan
 * (app/domain/status/plan.ts → engine.ts), so a manager and the therapist always see the same
 * word. The organisation-wide rows are loaded in a few bulk queries and assessed once per write
 * (cachedRead); filtering by unit, role, status and name, sorting and paging then run on that
 * cached result for each request, on the server, and only one page goes to the browser.
 */
import { sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import { cachedRead } from "~/db/read-cache.server";
import { isRole, type Role } from "~/auth/roles";
import { addDays, calendarDateIn, STATUS_URGENCY, type IsoDate, type Status, type StatusOptions } from "~/domain/status";
import { buildPlan, type PlanAssignment, type PlanCompletion, type PlanCredential, type PlanExtension, type PlanRequirement, type PlanWaiver } from "~/domain/status/plan";
import { MATRIX_PAGE_SIZE, type CellTuple } from "~/routes/team/matrix-params";
import { onUnits } from "./credential-summary.server";
import { statusOptionsFor } from "./people.server";

export type MatrixColumn = { id: string; name: string; kind: "exam" | "checklist" | "credential" };
export type MatrixCell = { status: Status; date: IsoDate | null; dateMeaning: "due" | "valid-through"; extendedTo: IsoDate | null; waivedThrough: IsoDate | null };
export type MatrixPerson = {
  id: string;
  name: string;
  employeeId: string | null;
  homeUnitId: string | null;
  homeUnit: string | null;
  unitIds: string[];
  roles: Role[];
  cells: Record<string, MatrixCell>;
  /** Precomputed for the per-request filter: the statuses among the cells, and the lower-cased name and id. */
  statuses: Set<Status>;
  lapsedCount: number;
  needle: string;
};
export type Matrix = {
  columns: MatrixColumn[];
  people: MatrixPerson[];
  units: { id: string; name: string }[];
  /** Computed once per assessment, not per request. */
  compliance: UnitCompliance[];
  expiries: { within: Record<30 | 60 | 90, number>; soonest: Expiry[] };
};

export type { CellTuple };

export function cellTuple(cell: MatrixCell | undefined): CellTuple | null {
  if (!cell) return null;
  return [cell.status, cell.dateMeaning === "due" && cell.extendedTo ? cell.extendedTo : cell.date, cell.dateMeaning === "due" ? "d" : "v", cell.waivedThrough];
}

type Scope = { unitIds: string[] | null };

/** The raw rows behind the matrix (people in scope; their records): what the bench times as "the bare SQL". */
export async function readMatrixRows(orgId: string, scope: Scope) {
  const { db } = await database();
  const inScope = onUnits(orgId, scope.unitIds);
  // Rows of people outside the scope are loaded but never looked up (the assessment walks the
  // people in scope): one pass over the organisation's rows measured several times faster than
  // repeating the scope as a sub-query in every statement.
  const [people, roles, members, requirements, credentials, passed, signed, assignments, waivers, extensions, units] = await Promise.all([
    db.all<{ id: string; name: string; employee_id: string | null; home_unit_id: string | null; home_unit: string | null }>(sql`
      select p.id, p.name, p.employee_id, p.home_unit_id, u.name as home_unit
      from people p left join units u on u.id = p.home_unit_id and u.org_id = ${orgId}
      where p.org_id = ${orgId} and p.active = 1 and ${inScope}`),
    db.all<{ person_id: string; role: string }>(sql`select person_id, role from person_roles where org_id = ${orgId}`),
    db.all<{ person_id: string; unit_id: string }>(sql`select person_id, unit_id from person_units where org_id = ${orgId} and relation = 'member'`),
    db.all<{ id: string; name: string; kind: "exam" | "checklist" | "credential"; exam_id: string | null; checklist_id: string | null; credential_type_id: string | null; recurrence: PlanRequirement["recurrence"]; unit_id: string | null; role: string | null; grace_days: number }>(sql`
      select id, name, kind, exam_id, checklist_id, credential_type_id, recurrence, unit_id, role, grace_days
      from requirements where org_id = ${orgId} and active = 1 order by name`),
    db.all<{ id: string; person_id: string; credential_type_id: string; type_name: string; number: string | null; issuer: string | null; issued_on: string; valid_through: string | null; verified: number }>(sql`
      select c.id, c.person_id, c.credential_type_id, t.name as type_name, c.number, c.issuer, c.issued_on, c.valid_through, c.verified_at is not null as verified
      from credentials c join credential_types t on t.id = c.credential_type_id and t.org_id = ${orgId}
      where c.org_id = ${orgId}`),
    db.all<{ person_id: string; ref_id: string; at: number }>(sql`
      select a.person_id, v.exam_id as ref_id, max(a.submitted_at) as at
      from attempts a join exam_versions v on v.id = a.exam_version_id and v.org_id = ${orgId}
      where a.org_id = ${orgId} and a.passed = 1 and a.submitted_at is not null
      group by a.person_id, v.exam_id`),
    db.all<{ person_id: string; ref_id: string; at: number }>(sql`
      select c.person_id, v.checklist_id as ref_id, max(c.signed_at) as at
      from checkoffs c join checklist_versions v on v.id = c.checklist_version_id and v.org_id = ${orgId}
      where c.org_id = ${orgId} and c.outcome = 'competent' and c.status in ('signed', 'acknowledged') and c.signed_at is not null
      group by c.person_id, v.checklist_id`),
    db.all<{ id: string; person_id: string; kind: "exam" | "checklist"; exam_id: string | null; checklist_id: string | null; requirement_id: string | null; due_on: string }>(sql`
      select id, person_id, kind, exam_id, checklist_id, requirement_id, due_on
      from assignments where org_id = ${orgId} and status = 'open' and kind in ('exam', 'checklist')`),
    db.all<{ id: string; person_id: string; requirement_id: string; ends_on: string; reason: string; granted_by: string }>(sql`
      select id, person_id, requirement_id, ends_on, reason, granted_by from waivers
      where org_id = ${orgId} and revoked_at is null`),
    db.all<{ id: string; person_id: string; requirement_id: string; new_due_on: string; reason: string; granted_by: string }>(sql`
      select id, person_id, requirement_id, new_due_on, reason, granted_by from extensions where org_id = ${orgId}`),
    db.all<{ id: string; name: string }>(sql`select id, name from units where org_id = ${orgId} and active = 1 order by name`),
  ]);
  return { people, roles, members, requirements, credentials, passed, signed, assignments, waivers, extensions, units };
}

function groupByPerson<T extends { person_id: string }>(rows: readonly T[]): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const r of rows) {
    const list = out.get(r.person_id);
    if (list) list.push(r);
    else out.set(r.person_id, [r]);
  }
  return out;
}

/** SQLite stores instants as Unix seconds (drizzle `timestamp` mode) or milliseconds; both become a Date. */
function instantOf(value: number): Date {
  return new Date(value < 1e11 ? value * 1000 : value);
}

// `localeCompare` with locales or options builds a collator on every call (ECMA-402 defines it as
// `new Intl.Collator(locales, options).compare`); sorting 2,000 names makes ~22,000 calls, so
// the collators are built once. Same order as before.
const byNameBase = new Intl.Collator("en", { sensitivity: "base" }).compare;
const byDefault = new Intl.Collator().compare;

async function buildMatrix(orgId: string, scope: Scope, timeZone: string, options: StatusOptions): Promise<Matrix> {
  return assessMatrix(await readMatrixRows(orgId, scope), scope, timeZone, options);
}

/** The assessment of the rows (pure; exported for tests and the bench). */
export function assessMatrix(raw: Awaited<ReturnType<typeof readMatrixRows>>, scope: Scope, timeZone: string, options: StatusOptions): Matrix {
  // Completions of one instant share a calendar date: one Intl call per distinct instant.
  const dates = new Map<number, IsoDate>();
  const dateOf = (at: number): IsoDate => {
    let d = dates.get(at);
    if (d === undefined) {
      d = calendarDateIn(timeZone, instantOf(at));
      dates.set(at, d);
    }
    return d;
  };
  const requirements: PlanRequirement[] = raw.requirements.map((r) => ({
    id: r.id,
    name: r.name,
    kind: r.kind,
    examId: r.exam_id,
    checklistId: r.checklist_id,
    credentialTypeId: r.credential_type_id,
    recurrence: r.recurrence,
    unitId: r.unit_id,
    role: r.role,
    active: true,
    graceDays: Number(r.grace_days ?? 0),
  }));
  const roles = groupByPerson(raw.roles);
  const members = groupByPerson(raw.members);
  const creds = groupByPerson(raw.credentials);
  const passed = groupByPerson(raw.passed);
  const signed = groupByPerson(raw.signed);
  const assigned = groupByPerson(raw.assignments);
  const waived = groupByPerson(raw.waivers);
  const extended = groupByPerson(raw.extensions);
  const people: MatrixPerson[] = raw.people.map((p) => {
    const unitIds = [...new Set([...(p.home_unit_id ? [p.home_unit_id] : []), ...(members.get(p.id) ?? []).map((m) => m.unit_id)])];
    const personRoles = (roles.get(p.id) ?? []).map((r) => r.role).filter(isRole);
    const completions: PlanCompletion[] = [
      ...(passed.get(p.id) ?? []).map((c) => ({ kind: "exam" as const, refId: c.ref_id, completedOn: dateOf(Number(c.at)) })),
      ...(signed.get(p.id) ?? []).map((c) => ({ kind: "checklist" as const, refId: c.ref_id, completedOn: dateOf(Number(c.at)) })),
    ];
    const credentials: PlanCredential[] = (creds.get(p.id) ?? []).map((c) => ({
      id: c.id,
      credentialTypeId: c.credential_type_id,
      typeName: c.type_name,
      number: c.number,
      issuer: c.issuer,
      issuedOn: c.issued_on,
      validThrough: c.valid_through,
      verified: Boolean(c.verified),
    }));
    const assignments: PlanAssignment[] = (assigned.get(p.id) ?? []).map((a) => ({ id: a.id, kind: a.kind, refId: a.kind === "exam" ? a.exam_id : a.checklist_id, requirementId: a.requirement_id, title: "", dueOn: a.due_on }));
    const waivers: PlanWaiver[] = (waived.get(p.id) ?? []).map((w) => ({ id: w.id, requirementId: w.requirement_id, endsOn: w.ends_on, reason: w.reason, grantedBy: w.granted_by }));
    const extensions: PlanExtension[] = (extended.get(p.id) ?? []).map((e) => ({ id: e.id, requirementId: e.requirement_id, newDueOn: e.new_due_on, reason: e.reason, grantedBy: e.granted_by }));
    const rows = buildPlan({ person: { roles: personRoles, unitIds }, requirements, credentials, assignments, completions, waivers, extensions }, options, { requirementsOnly: true });
    const cells: Record<string, MatrixCell> = {};
    const statuses = new Set<Status>();
    let lapsedCount = 0;
    for (const row of rows) {
      if (!row.requirementId || !row.key.startsWith("requirement:")) continue;
      cells[row.requirementId] = { status: row.result.status, date: row.result.date, dateMeaning: row.dateMeaning, extendedTo: row.extendedTo, waivedThrough: row.result.waivedThrough ?? null };
      // One row per requirement (buildPlan), so counting here counts each cell once.
      statuses.add(row.result.status);
      if (row.result.status === "lapsed") lapsedCount += 1;
    }
    return {
      id: p.id,
      name: p.name,
      employeeId: p.employee_id,
      homeUnitId: p.home_unit_id,
      homeUnit: p.home_unit,
      unitIds,
      roles: personRoles,
      cells,
      statuses,
      lapsedCount,
      needle: `${p.name}\n${p.employee_id ?? ""}`.toLowerCase(),
    };
  });
  people.sort((a, b) => byNameBase(a.name, b.name) || (a.id < b.id ? -1 : 1));
  const units = scope.unitIds === null ? raw.units : raw.units.filter((u) => scope.unitIds!.includes(u.id));
  const partial = { columns: raw.requirements.map((r) => ({ id: r.id, name: r.name, kind: r.kind })), people, units };
  return { ...partial, compliance: complianceByUnit(partial), expiries: upcomingExpiries(partial, options.today) };
}

/** The whole matrix for a scope, assessed once per write (or 30 s). */
export async function loadMatrix(orgId: string, scope: Scope, timeZone: string, options: StatusOptions): Promise<Matrix> {
  const key = JSON.stringify(["team-matrix", orgId, scope, timeZone, options]);
  return cachedRead(await database(), key, () => buildMatrix(orgId, scope, timeZone, options));
}

export type MatrixFilter = { q: string; unit: string; role: string; status: string; sort: "name" | "unit" | "lapsed"; dir: "asc" | "desc"; page: number };
export { MATRIX_PAGE_SIZE };

/** People matching the filter, sorted; status filters keep people with at least one cell of that status. */
export function filterMatrix(matrix: Matrix, f: MatrixFilter): MatrixPerson[] {
  const needle = f.q.trim().toLowerCase();
  const out = matrix.people.filter(
    (p) =>
      (!f.unit || p.unitIds.includes(f.unit)) &&
      (!f.role || p.roles.includes(f.role as Role)) &&
      (!f.status || p.statuses.has(f.status as Status)) &&
      (!needle || p.needle.includes(needle)),
  );
  const sign = f.dir === "desc" ? -1 : 1;
  const lapsed = (p: MatrixPerson) => p.lapsedCount;
  if (f.sort === "unit") out.sort((a, b) => sign * byDefault(a.homeUnit ?? "~", b.homeUnit ?? "~") || byDefault(a.name, b.name));
  else if (f.sort === "lapsed") out.sort((a, b) => sign * (lapsed(a) - lapsed(b)) || byDefault(a.name, b.name));
  else if (f.dir === "desc") out.reverse();
  return out;
}

/**
 * One view of the matrix — the assessment for a scope on the organisation's today, filtered and
 * sorted as asked — for every reader of it: the Team matrix page (its document and the views it
 * fetches in place) and the API's /api/v1/team-matrix, so the two can never disagree. Callers
 * take their page of `matching` (the page by page number, the API by cursor).
 */
export async function matrixView(orgId: string, scope: Scope, timeZone: string, filter: Omit<MatrixFilter, "page">, now: Date = new Date()) {
  const options = await statusOptionsFor(orgId, timeZone, now);
  const matrix = await loadMatrix(orgId, scope, timeZone, options);
  return { options, matrix, matching: filterMatrix(matrix, { ...filter, page: 1 }) };
}

export type UnitCompliance = { unitId: string; unit: string; people: number; cells: number; counts: Record<Status, number>; percentCurrent: number };

/** Compliance by unit (home unit or member): counts per status over every applying cell, and the share Current. */
export function complianceByUnit(matrix: Pick<Matrix, "units" | "people">): UnitCompliance[] {
  // One pass over the people (each person's cells read once, whatever the number of units).
  const byUnit = new Map(matrix.units.map((u) => [u.id, { people: 0, counts: { current: 0, "due-soon": 0, lapsed: 0, "not-started": 0, waived: 0 } as Record<Status, number> }]));
  for (const p of matrix.people) {
    const tallies = [...new Set(p.unitIds)].map((id) => byUnit.get(id)).filter((t) => t !== undefined);
    if (tallies.length === 0) continue;
    for (const t of tallies) t.people += 1;
    for (const key in p.cells) {
      const status = p.cells[key].status;
      for (const t of tallies) t.counts[status] += 1;
    }
  }
  return matrix.units.map((u) => {
    const { people: peopleCount, counts } = byUnit.get(u.id)!;
    const cells = Object.values(counts).reduce((a, b) => a + b, 0);
    return { unitId: u.id, unit: u.name, people: peopleCount, cells, counts, percentCurrent: cells === 0 ? 0 : Math.round((counts.current / cells) * 1000) / 10 };
  });
}

export type Expiry = { personId: string; name: string; requirementId: string; requirement: string; validThrough: IsoDate; status: Status };

/** Held records whose valid-through date falls within the next 30, 60 and 90 days (inclusive of today). */
export function upcomingExpiries(matrix: Pick<Matrix, "columns" | "people">, today: IsoDate): { within: Record<30 | 60 | 90, number>; soonest: Expiry[] } {
  const horizon = addDays(today, 90);
  const names = new Map(matrix.columns.map((c) => [c.id, c.name]));
  const all: (Expiry & { order: number })[] = [];
  matrix.people.forEach((p, order) => {
    for (const [reqId, c] of Object.entries(p.cells))
      if (c.dateMeaning === "valid-through" && c.date !== null && c.date >= today && c.date <= horizon)
        all.push({ personId: p.id, name: p.name, requirementId: reqId, requirement: names.get(reqId) ?? "", validThrough: c.date, status: c.status, order });
  });
  // Date, name, then the person's own order — the order of their plan (urgency, then title),
  // whatever order their cells were filled in.
  all.sort(
    (a, b) =>
      (a.validThrough < b.validThrough ? -1 : a.validThrough > b.validThrough ? 1 : 0) ||
      byDefault(a.name, b.name) ||
      a.order - b.order ||
      STATUS_URGENCY[a.status] - STATUS_URGENCY[b.status] ||
      byDefault(a.requirement, b.requirement),
  );
  const count = (days: number) => all.filter((e) => e.validThrough <= addDays(today, days)).length;
  return { within: { 30: count(30), 60: count(60), 90: count(90) }, soonest: all.slice(0, 20).map(({ order: _order, ...e }) => e) };
}

/** Who the viewer may see in the matrix: an educator the whole organisation (read), a manager the people of their units. */
export async function matrixScopeFor(orgId: string, personId: string, roles: readonly Role[]): Promise<Scope> {
  if (roles.includes("educator")) return { unitIds: null };
  const { db } = await database();
  const rows = await db.all<{ unit_id: string }>(sql`select unit_id from person_units where org_id = ${orgId} and person_id = ${personId} and relation = 'manages' order by unit_id`);
  return { unitIds: rows.map((r) => r.unit_id) };
}

/** Whether a person is inside a scope (for the cell page and its actions). */
export async function personInScope(orgId: string, scope: Scope, personId: string): Promise<boolean> {
  const { db } = await database();
  const rows = await db.all<{ id: string }>(sql`select p.id from people p where p.org_id = ${orgId} and p.id = ${personId} and ${onUnits(orgId, scope.unitIds)}`);
  return rows.length > 0;
}
