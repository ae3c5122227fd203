/** Words the report pages and their PDFs share: what each report counts and how. */
import type { ComplianceReport } from "~/db/queries/reports.server";

export const AS_RECORDED_NOTE =
  "Counts only what had been recorded by the end of that day in the organisation's time zone: credentials entered (and verified) by then, exams passed and check-offs signed by then, waivers and extensions granted and not yet revoked by then, and work assigned by then. People hired after that day, or deactivated at the end of it, are left out. Requirements, roles, units and the reminder window are taken as they are today.";

export const EXPIRIES_NOTE =
  "Every requirement of the people in this report (credential, exam or check-off) whose valid-through date, or due date for work not yet done (an extension's date when one is in force), falls in the range, with today's status.";

export const COMPLETIONS_NOTE = "Exam attempts passed and check-offs signed competent on days in the range (organisation's calendar), by the people in this report.";

export function complianceLines(report: ComplianceReport, timeZone: string): string[] {
  const lines = [
    `As recorded by the end of ${report.day} in ${timeZone} (${report.cutoff.slice(0, 16).replace("T", " ")} UTC). ${report.total.people} people, ${report.total.cells} person × requirement records; ${report.total.percentCurrent.toFixed(1)} % Current.`,
    AS_RECORDED_NOTE,
  ];
  if (report.leftOut.hiredLater || report.leftOut.inactive)
    lines.push(`Left out: ${report.leftOut.hiredLater} hired after ${report.day}, ${report.leftOut.inactive} not active at the end of that day.`);
  return lines;
}
