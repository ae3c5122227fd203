/**
 * Reports (issue 9 §4, §5): compliance by unit as recorded by the end of a chosen day, the
 * 12-month compliance trend (expiries and completions in a date range: report-lists.server.ts). The status of every
 * person × requirement comes from the same engine as My plan and the Team matrix
 * (`assessMatrix` → `buildPlan`), fed only with what had been recorded by then.
 *
 * "Recorded by the end of day D" (the organisation's local midnight after D, `startOfDayIn`):
 * - a credential counts if its row was created by then, and is "verified" only if verified by then;
 * - a passed exam counts if submitted by then; a competent check-off if signed by then;
 * - a waiver counts if granted by then and not revoked by then (a later revocation does not reach back);
 * - an extension counts if granted by then; an assignment if made by then and still open then
 *   (open now, or completed after D). A cancelled assignment has no cancellation time and is left out.
 * - people: only those hired on or before D (no hire date: counted), and active at the end of D
 *   according to the audit log's "person.deactivated" / "person.reactivated" events (with none,
 *   their state today).
 * Not kept historically, so taken as they are today (said on the page): requirements and their
 * rules (a requirement retired since is not shown; one added since is applied to the past),
 * people's roles and units, the organisation's reminder window, and corrections made to a
 * credential's dates after it was first recorded.
 */
import { sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import { cachedRead } from "~/db/read-cache.server";
import { monthEndsBefore, percentOf, recordedBy, wasActiveAt, type ActivationChange } from "~/domain/reports/as-of";
import { addDays, STATUSES, type IsoDate, type Status, type StatusOptions } from "~/domain/status";
import { startOfDayIn } from "~/domain/status/engine";
import { onUnits } from "./credential-summary.server";
import { assessMatrix, type Matrix, type UnitCompliance } from "./team-matrix.server";

/** Who a report covers: the units a manager manages, or (null) the whole organisation for an educator. */
export type ReportScope = { unitIds: string[] | null };

type MatrixRows = Parameters<typeof assessMatrix>[0];

/** SQLite instants are milliseconds (drizzle `timestamp_ms`); older rows may hold seconds. */
export function ms(value: number | null): number | null {
  if (value === null || value === undefined) return null;
  const n = Number(value);
  return n < 1e11 ? n * 1000 : n;
}

/** Every row a compliance report may need, with the instants that say when each was recorded. */
async function readReportRows(orgId: string, scope: ReportScope) {
  const { db } = await database();
  const inScope = onUnits(orgId, scope.unitIds);
  const [people, activation, roles, members, requirements, credentials, passed, signed, assignments, waivers, extensions, units] = await Promise.all([
    db.all<{ id: string; name: string; employee_id: string | null; home_unit_id: string | null; home_unit: string | null; hire_date: string | null; active: number }>(sql`
      select p.id, p.name, p.employee_id, p.home_unit_id, u.name as home_unit, p.hire_date, p.active
      from people p left join units u on u.id = p.home_unit_id and u.org_id = ${orgId}
      where p.org_id = ${orgId} and ${inScope}`),
    db.all<{ entity_id: string; action: string; at: string }>(sql`
      select entity_id, action, at from audit_events
      where org_id = ${orgId} and entity_type = 'person' and action in ('person.deactivated', 'person.reactivated')`),
    db.all<{ person_id: string; role: string }>(sql`select person_id, role from person_roles where org_id = ${orgId}`),
    db.all<{ person_id: string; unit_id: string }>(sql`select person_id, unit_id from person_units where org_id = ${orgId} and relation = 'member'`),
    db.all<MatrixRows["requirements"][number]>(sql`
      select id, name, kind, exam_id, checklist_id, credential_type_id, recurrence, unit_id, role, grace_days
      from requirements where org_id = ${orgId} and active = 1 order by name`),
    db.all<MatrixRows["credentials"][number] & { created_at: number; verified_at: number | null }>(sql`
      select c.id, c.person_id, c.credential_type_id, t.name as type_name, c.number, c.issuer, c.issued_on, c.valid_through,
             c.created_at, c.verified_at
      from credentials c join credential_types t on t.id = c.credential_type_id and t.org_id = ${orgId}
      where c.org_id = ${orgId}`),
    db.all<{ person_id: string; ref_id: string; at: number }>(sql`
      select a.person_id, v.exam_id as ref_id, a.submitted_at as at
      from attempts a join exam_versions v on v.id = a.exam_version_id and v.org_id = ${orgId}
      where a.org_id = ${orgId} and a.passed = 1 and a.submitted_at is not null`),
    db.all<{ person_id: string; ref_id: string; at: number }>(sql`
      select c.person_id, v.checklist_id as ref_id, c.signed_at as at
      from checkoffs c join checklist_versions v on v.id = c.checklist_version_id and v.org_id = ${orgId}
      where c.org_id = ${orgId} and c.outcome = 'competent' and c.status in ('signed', 'acknowledged') and c.signed_at is not null`),
    db.all<MatrixRows["assignments"][number] & { status: string; created_at: number; completed_at: number | null }>(sql`
      select id, person_id, kind, exam_id, checklist_id, requirement_id, due_on, status, created_at, completed_at
      from assignments where org_id = ${orgId} and status in ('open', 'completed') and kind in ('exam', 'checklist')`),
    db.all<MatrixRows["waivers"][number] & { created_at: number; revoked_at: number | null }>(sql`
      select id, person_id, requirement_id, ends_on, reason, granted_by, created_at, revoked_at from waivers where org_id = ${orgId}`),
    db.all<MatrixRows["extensions"][number] & { created_at: number }>(sql`
      select id, person_id, requirement_id, new_due_on, reason, granted_by, created_at from extensions where org_id = ${orgId}`),
    db.all<{ id: string; name: string }>(sql`select id, name from units where org_id = ${orgId} and active = 1 order by name`),
  ]);
  const changes = new Map<string, ActivationChange[]>();
  for (const e of activation) {
    const list = changes.get(e.entity_id) ?? [];
    list.push({ at: Date.parse(e.at), active: e.action === "person.reactivated" });
    changes.set(e.entity_id, list);
  }
  return { people, changes, roles, members, requirements, credentials, passed, signed, assignments, waivers, extensions, units };
}

export type ReportRows = Awaited<ReturnType<typeof readReportRows>>;

/** Who a report as of `day` leaves out, and why. */
export type LeftOut = { hiredLater: number; inactive: number };

/**
 * The rows as they stood at `cutoff` (ms, the local midnight after `day`), in the Team matrix's
 * shape, for the status engine. Pure; exported for tests.
 */
export function rowsRecordedBy(rows: ReportRows, day: IsoDate, cutoff: number): { rows: MatrixRows; leftOut: LeftOut } {
  const leftOut: LeftOut = { hiredLater: 0, inactive: 0 };
  const people = rows.people.filter((p) => {
    if (p.hire_date !== null && p.hire_date > day) {
      leftOut.hiredLater += 1;
      return false;
    }
    if (!wasActiveAt(Boolean(p.active), rows.changes.get(p.id) ?? [], cutoff)) {
      leftOut.inactive += 1;
      return false;
    }
    return true;
  });
  return {
    leftOut,
    rows: {
      people: people.map(({ id, name, employee_id, home_unit_id, home_unit }) => ({ id, name, employee_id, home_unit_id, home_unit })),
      roles: rows.roles,
      members: rows.members,
      requirements: rows.requirements,
      credentials: rows.credentials
        .filter((c) => recordedBy(ms(c.created_at), cutoff))
        .map(({ created_at: _c, verified_at, ...c }) => ({ ...c, verified: recordedBy(ms(verified_at), cutoff) ? 1 : 0 })),
      passed: rows.passed.filter((c) => recordedBy(ms(c.at), cutoff)),
      signed: rows.signed.filter((c) => recordedBy(ms(c.at), cutoff)),
      assignments: rows.assignments
        .filter((a) => recordedBy(ms(a.created_at), cutoff) && (a.status === "open" || !recordedBy(ms(a.completed_at), cutoff)))
        .map(({ id, person_id, kind, exam_id, checklist_id, requirement_id, due_on }) => ({ id, person_id, kind, exam_id, checklist_id, requirement_id, due_on })),
      waivers: rows.waivers
        .filter((w) => recordedBy(ms(w.created_at), cutoff) && !recordedBy(ms(w.revoked_at), cutoff))
        .map(({ id, person_id, requirement_id, ends_on, reason, granted_by }) => ({ id, person_id, requirement_id, ends_on, reason, granted_by })),
      extensions: rows.extensions
        .filter((e) => recordedBy(ms(e.created_at), cutoff))
        .map(({ id, person_id, requirement_id, new_due_on, reason, granted_by }) => ({ id, person_id, requirement_id, new_due_on, reason, granted_by })),
      units: rows.units,
    },
  };
}

export type ComplianceTotals = { people: number; cells: number; counts: Record<Status, number>; percentCurrent: number };

export type ComplianceReport = {
  day: IsoDate;
  /** The instant the day ended in the organisation's zone (ISO), the cut-off for what counts. */
  cutoff: string;
  units: UnitCompliance[];
  /** Everyone in scope, each person counted once whatever their number of units. */
  total: ComplianceTotals;
  leftOut: LeftOut;
};

function emptyCounts(): Record<Status, number> {
  return Object.fromEntries(STATUSES.map((s) => [s, 0])) as Record<Status, number>;
}

function totalsOf(matrix: Pick<Matrix, "people">): ComplianceTotals {
  const counts = emptyCounts();
  let cells = 0;
  for (const p of matrix.people)
    for (const key in p.cells) {
      counts[p.cells[key].status] += 1;
      cells += 1;
    }
  return { people: matrix.people.length, cells, counts, percentCurrent: percentOf(counts.current, cells) };
}

/** Compliance of already-read rows as recorded by the end of `day` (pure but for the clock-free engine). */
export function complianceFromRows(rows: ReportRows, scope: ReportScope, timeZone: string, day: IsoDate, reminderDays: number): ComplianceReport {
  const cutoff = startOfDayIn(timeZone, addDays(day, 1));
  const { rows: asOf, leftOut } = rowsRecordedBy(rows, day, cutoff.getTime());
  const matrix = assessMatrix(asOf, scope, timeZone, { today: day, reminderDays });
  return { day, cutoff: cutoff.toISOString(), units: matrix.compliance, total: totalsOf(matrix), leftOut };
}

/** Compliance by unit as recorded by the end of `day` (cached until the next write). */
export async function complianceOn(orgId: string, scope: ReportScope, timeZone: string, day: IsoDate, reminderDays: number): Promise<ComplianceReport> {
  const key = JSON.stringify(["report-compliance", orgId, scope, timeZone, day, reminderDays]);
  return cachedRead(await database(), key, async () => complianceFromRows(await readReportRows(orgId, scope), scope, timeZone, day, reminderDays));
}

export type TrendPoint = { day: IsoDate; percentCurrent: number; cells: number };
export type TrendSeries = { unitId: string; unit: string; points: TrendPoint[] };
export type ComplianceTrend = { monthEnds: IsoDate[]; series: TrendSeries[] };

/**
 * % Current per unit at each of the 12 month ends before this month, each as recorded by the end
 * of that day. One read of the rows, twelve assessments; cached like the Team views.
 */
export async function complianceTrend(orgId: string, scope: ReportScope, timeZone: string, options: Required<StatusOptions>): Promise<ComplianceTrend> {
  const key = JSON.stringify(["report-trend", orgId, scope, timeZone, options]);
  return cachedRead(await database(), key, async () => {
    const rows = await readReportRows(orgId, scope);
    const monthEnds = monthEndsBefore(options.today, 12);
    const reports: ComplianceReport[] = [];
    for (const day of monthEnds) {
      reports.push(complianceFromRows(rows, scope, timeZone, day, options.reminderDays));
      // Each assessment of a large organisation is long synchronous work: let requests in between.
      await new Promise<void>((resolve) => setImmediate(resolve));
    }
    const units = reports[reports.length - 1]?.units ?? [];
    return {
      monthEnds,
      series: units.map((u) => ({
        unitId: u.unitId,
        unit: u.unit,
        points: reports.map((r, i) => {
          const found = r.units.find((x) => x.unitId === u.unitId);
          return { day: monthEnds[i], percentCurrent: found?.percentCurrent ?? 0, cells: found?.cells ?? 0 };
        }),
      })),
    };
  });
}
