/** Requirements whose valid-through or due date falls in ?from=&to= (default today to +90 days), as PDF. */
import { expiriesBetween } from "~/db/queries/report-lists.server";
import { renderReportPdf } from "~/pdf/report-table.server";
import { badRequest, expiryRangeFrom, pdfResponse, reportViewer } from "./report-load.server";
import { expiriesTable } from "./report-tables";
import { EXPIRIES_NOTE } from "./report-words";
import type { Route } from "./+types/expiries-pdf";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = expiryRangeFrom(request, options.today);
  if (!range.ok) return badRequest(range.message);
  const rows = await expiriesBetween(viewer.org.id, scope, viewer.org.timeZone, options, range.from, range.to);
  const pdf = await renderReportPdf({
    orgName: viewer.org.name,
    title: `Expiries and due dates, ${range.from} to ${range.to}`,
    lines: [EXPIRIES_NOTE, `Statuses as of ${options.today}. ${rows.length} ${rows.length === 1 ? "record" : "records"}.`],
    sections: [{ heading: "By date", table: expiriesTable(rows), empty: "No valid-through or due date falls in this range." }],
    generatedOn: options.today,
    timeZone: viewer.org.timeZone,
  });
  return pdfResponse(pdf, `tidemark-expiries-${range.from}-to-${range.to}.pdf`);
}
