/** Passed exams and competent check-offs in ?from=&to= (default the last 90 days), one row each, as CSV. */
import { completionsBetween } from "~/db/queries/report-lists.server";
import { toCsv } from "~/routes/team/csv";
import { badRequest, completionRangeFrom, csvResponse, reportViewer } from "./report-load.server";
import { completionsTable } from "./report-tables";
import type { Route } from "./+types/completions-csv";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = completionRangeFrom(request, options.today);
  if (!range.ok) return badRequest(range.message);
  const report = await completionsBetween(viewer.org.id, scope, viewer.org.timeZone, range.from, range.to);
  const table = completionsTable(report);
  return csvResponse(toCsv([table.header, ...table.rows]), `tidemark-completions-${range.from}-to-${range.to}.csv`);
}
