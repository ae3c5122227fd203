/** Requirements whose valid-through or due date falls in ?from=&to= (default today to +90 days), as CSV. */
import { expiriesBetween } from "~/db/queries/report-lists.server";
import { toCsv } from "~/routes/team/csv";
import { badRequest, csvResponse, expiryRangeFrom, reportViewer } from "./report-load.server";
import { expiriesTable } from "./report-tables";
import type { Route } from "./+types/expiries-csv";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = expiryRangeFrom(request, options.today);
  if (!range.ok) return badRequest(range.message);
  const rows = await expiriesBetween(viewer.org.id, scope, viewer.org.timeZone, options, range.from, range.to);
  const table = expiriesTable(rows);
  return csvResponse(toCsv([table.header, ...table.rows]), `tidemark-expiries-${range.from}-to-${range.to}.csv`);
}
