/**
 * Each report as rows of text, the same for its CSV and its PDF (and so for a surveyor reading
 * either). Status words are Tidemark's own (PRODUCT.md "Status words and marks").
 */
import { STATUS_WORDS } from "~/components/ui/status-mark";
import type { CompletionsReport, ExpiryRow } from "~/db/queries/report-lists.server";
import type { ComplianceReport } from "~/db/queries/reports.server";
import { methodLabel } from "~/domain/checkoffs/methods";
import { STATUSES } from "~/domain/status";

export type ReportTable = { header: string[]; rows: string[][]; numeric: number[] };

const KIND_WORDS = { exam: "Exam", checklist: "Check-off", credential: "Credential" } as const;

export function complianceTable(report: ComplianceReport): ReportTable {
  const header = ["Unit", "People", "Requirement records", "% Current", ...STATUSES.map((s) => STATUS_WORDS[s])];
  const line = (name: string, t: { people: number; cells: number; percentCurrent: number; counts: ComplianceReport["total"]["counts"] }) => [
    name,
    String(t.people),
    String(t.cells),
    t.percentCurrent.toFixed(1),
    ...STATUSES.map((s) => String(t.counts[s])),
  ];
  return {
    header,
    rows: [...report.units.map((u) => line(u.unit, u)), line("Everyone in this report (each person once)", report.total)],
    numeric: [1, 2, 3, 4, 5, 6, 7, 8],
  };
}

export function expiriesTable(rows: readonly ExpiryRow[]): ReportTable {
  return {
    header: ["Unit", "Name", "Employee id", "What", "Kind", "Date", "Date is", "Status"],
    rows: rows.map((r) => [r.unit, r.name, r.employeeId ?? "", r.what, KIND_WORDS[r.kind], r.date, r.dateMeaning === "due" ? "Due" : "Valid through", STATUS_WORDS[r.status]]),
    numeric: [],
  };
}

export function completionCountsTable(report: CompletionsReport): ReportTable {
  return { header: ["Kind", "Exam or checklist", "Completions"], rows: report.counts.map((c) => [KIND_WORDS[c.kind], c.what, String(c.count)]), numeric: [2] };
}

export function completionsTable(report: CompletionsReport): ReportTable {
  return {
    header: ["Date", "Kind", "Exam or checklist", "Name", "Employee id", "Unit", "Score %", "Assessor", "Method"],
    rows: report.rows.map((r) => [
      r.on,
      KIND_WORDS[r.kind],
      r.what,
      r.name,
      r.employeeId ?? "",
      r.unit,
      r.scorePercent === null ? "" : r.scorePercent.toFixed(1),
      r.assessor ?? "",
      r.method ? methodLabel(r.method) : "",
    ]),
    numeric: [6],
  };
}
