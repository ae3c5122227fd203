/** Compliance by unit as recorded by the end of ?on= (default today), as PDF. */
import { complianceOn } from "~/db/queries/reports.server";
import { renderReportPdf } from "~/pdf/report-table.server";
import { badRequest, dayFrom, pdfResponse, reportViewer } from "./report-load.server";
import { complianceLines } from "./report-words";
import { complianceTable } from "./report-tables";
import type { Route } from "./+types/compliance-pdf";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const on = dayFrom(request, options.today);
  if (!on.ok) return badRequest(on.message);
  const report = await complianceOn(viewer.org.id, scope, viewer.org.timeZone, on.day, options.reminderDays);
  const pdf = await renderReportPdf({
    orgName: viewer.org.name,
    title: `Compliance by unit as recorded by the end of ${on.day}`,
    lines: complianceLines(report, viewer.org.timeZone),
    sections: [{ heading: "By unit", table: complianceTable(report), empty: "No units in this report." }],
    generatedOn: options.today,
    timeZone: viewer.org.timeZone,
  });
  return pdfResponse(pdf, `tidemark-compliance-as-of-${on.day}.pdf`);
}
