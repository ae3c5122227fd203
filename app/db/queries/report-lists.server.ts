/**
 * The list reports (issue 9 §4): requirements whose valid-through or due date falls in a date
 * range (today's statuses, from the Team matrix's assessment), and exams passed and check-offs
 * signed competent in a date range. Scoped like the matrix: a manager's units, or the whole
 * organisation for an educator.
 */
import { sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import { addDays, calendarDateIn, type IsoDate, type Status, type StatusOptions } from "~/domain/status";
import { startOfDayIn } from "~/domain/status/engine";
import { onUnits } from "./credential-summary.server";
import { ms, type ReportScope } from "./reports.server";
import { loadMatrix } from "./team-matrix.server";

// ---- Expiries -----------------------------------------------------------------------------------

export type ExpiryRow = {
  unit: string;
  personId: string;
  name: string;
  employeeId: string | null;
  requirementId: string;
  what: string;
  kind: "exam" | "checklist" | "credential";
  dateMeaning: "due" | "valid-through";
  date: IsoDate;
  status: Status;
};

/**
 * Requirements (credentials, exams, check-offs) of the people in scope whose valid-through or due
 * date (an extension's date when one is in force) falls in [from, to], with today's status;
 * ordered by date, unit and name.
 */
export async function expiriesBetween(orgId: string, scope: ReportScope, timeZone: string, options: Required<StatusOptions>, from: IsoDate, to: IsoDate): Promise<ExpiryRow[]> {
  const matrix = await loadMatrix(orgId, scope, timeZone, options);
  const columns = new Map(matrix.columns.map((c) => [c.id, c]));
  const out: ExpiryRow[] = [];
  for (const p of matrix.people)
    for (const [reqId, cell] of Object.entries(p.cells)) {
      const date = cell.dateMeaning === "due" && cell.extendedTo && (cell.date === null || cell.extendedTo > cell.date) ? cell.extendedTo : cell.date;
      if (date === null || date < from || date > to) continue;
      const col = columns.get(reqId);
      out.push({ unit: p.homeUnit ?? "", personId: p.id, name: p.name, employeeId: p.employeeId, requirementId: reqId, what: col?.name ?? "", kind: col?.kind ?? "credential", dateMeaning: cell.dateMeaning, date, status: cell.status });
    }
  const byText = new Intl.Collator("en", { sensitivity: "base" }).compare;
  return out.sort((a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : 0) || byText(a.unit, b.unit) || byText(a.name, b.name) || byText(a.what, b.what));
}

// ---- Completions --------------------------------------------------------------------------------

export type CompletionRow = {
  kind: "exam" | "checklist";
  refId: string;
  what: string;
  personId: string;
  name: string;
  employeeId: string | null;
  unit: string;
  on: IsoDate;
  /** Exam: score in percent; check-off: null. */
  scorePercent: number | null;
  /** Check-off: the preceptor who signed, and the method. */
  assessor: string | null;
  method: string | null;
};
export type CompletionCount = { kind: "exam" | "checklist"; refId: string; what: string; count: number };
export type CompletionsReport = { counts: CompletionCount[]; rows: CompletionRow[] };

/** Passed exam attempts and check-offs signed competent of the people in scope, on days from..to (organisation's calendar). */
export async function completionsBetween(orgId: string, scope: ReportScope, timeZone: string, from: IsoDate, to: IsoDate): Promise<CompletionsReport> {
  const { db } = await database();
  const start = startOfDayIn(timeZone, from).getTime();
  const end = startOfDayIn(timeZone, addDays(to, 1)).getTime();
  const inScope = onUnits(orgId, scope.unitIds);
  const [exams, checkoffs] = await Promise.all([
    db.all<{ ref_id: string; what: string; person_id: string; name: string; employee_id: string | null; unit: string | null; at: number; score_percent: number | null }>(sql`
      select v.exam_id as ref_id, e.title as what, p.id as person_id, p.name, p.employee_id, u.name as unit, a.submitted_at as at, a.score_percent
      from attempts a
      join exam_versions v on v.id = a.exam_version_id and v.org_id = ${orgId}
      join exams e on e.id = v.exam_id and e.org_id = ${orgId}
      join people p on p.id = a.person_id and p.org_id = ${orgId}
      left join units u on u.id = p.home_unit_id and u.org_id = ${orgId}
      where a.org_id = ${orgId} and a.passed = 1 and a.submitted_at >= ${start} and a.submitted_at < ${end} and ${inScope}`),
    db.all<{ ref_id: string; what: string; person_id: string; name: string; employee_id: string | null; unit: string | null; at: number; assessor: string | null; method: string }>(sql`
      select v.checklist_id as ref_id, k.title as what, p.id as person_id, p.name, p.employee_id, u.name as unit, c.signed_at as at, pr.name as assessor, v.method
      from checkoffs c
      join checklist_versions v on v.id = c.checklist_version_id and v.org_id = ${orgId}
      join checklists k on k.id = v.checklist_id and k.org_id = ${orgId}
      join people p on p.id = c.person_id and p.org_id = ${orgId}
      left join people pr on pr.id = c.preceptor_id and pr.org_id = ${orgId}
      left join units u on u.id = p.home_unit_id and u.org_id = ${orgId}
      where c.org_id = ${orgId} and c.outcome = 'competent' and c.status in ('signed', 'acknowledged')
        and c.signed_at >= ${start} and c.signed_at < ${end} and ${inScope}`),
  ]);
  const rows: CompletionRow[] = [
    ...exams.map((r) => ({ kind: "exam" as const, refId: r.ref_id, what: r.what, personId: r.person_id, name: r.name, employeeId: r.employee_id, unit: r.unit ?? "", on: calendarDateIn(timeZone, new Date(ms(r.at)!)), scorePercent: r.score_percent, assessor: null, method: null })),
    ...checkoffs.map((r) => ({ kind: "checklist" as const, refId: r.ref_id, what: r.what, personId: r.person_id, name: r.name, employeeId: r.employee_id, unit: r.unit ?? "", on: calendarDateIn(timeZone, new Date(ms(r.at)!)), scorePercent: null, assessor: r.assessor, method: r.method })),
  ];
  const byText = new Intl.Collator("en", { sensitivity: "base" }).compare;
  rows.sort((a, b) => (a.on < b.on ? -1 : a.on > b.on ? 1 : 0) || byText(a.what, b.what) || byText(a.name, b.name));
  const counts = new Map<string, CompletionCount>();
  for (const r of rows) {
    const k = `${r.kind}:${r.refId}`;
    const c = counts.get(k) ?? { kind: r.kind, refId: r.refId, what: r.what, count: 0 };
    c.count += 1;
    counts.set(k, c);
  }
  return { counts: [...counts.values()].sort((a, b) => (a.kind === b.kind ? byText(a.what, b.what) : a.kind === "exam" ? -1 : 1)), rows };
}

