/** Passed exams and competent check-offs in ?from=&to= (default the last 90 days): counts and the list, as PDF. */
import { completionsBetween } from "~/db/queries/report-lists.server";
import { renderReportPdf } from "~/pdf/report-table.server";
import { badRequest, completionRangeFrom, pdfResponse, reportViewer } from "./report-load.server";
import { completionCountsTable, completionsTable } from "./report-tables";
import { COMPLETIONS_NOTE } from "./report-words";
import type { Route } from "./+types/completions-pdf";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = completionRangeFrom(request, options.today);
  if (!range.ok) return badRequest(range.message);
  const report = await completionsBetween(viewer.org.id, scope, viewer.org.timeZone, range.from, range.to);
  const pdf = await renderReportPdf({
    orgName: viewer.org.name,
    title: `Completions, ${range.from} to ${range.to}`,
    lines: [COMPLETIONS_NOTE, `${report.rows.length} ${report.rows.length === 1 ? "completion" : "completions"}.`],
    sections: [
      { heading: "By exam or checklist", table: completionCountsTable(report), empty: "Nothing was completed in this range." },
      { heading: "Each completion", table: completionsTable(report), empty: "Nothing was completed in this range." },
    ],
    generatedOn: options.today,
    timeZone: viewer.org.timeZone,
  });
  return pdfResponse(pdf, `tidemark-completions-${range.from}-to-${range.to}.pdf`);
}
