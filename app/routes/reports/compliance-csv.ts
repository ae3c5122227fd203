/** Compliance by unit as recorded by the end of ?on= (default today), as CSV. */
import { complianceOn } from "~/db/queries/reports.server";
import { toCsv } from "~/routes/team/csv";
import { badRequest, csvResponse, dayFrom, reportViewer } from "./report-load.server";
import { complianceTable } from "./report-tables";
import type { Route } from "./+types/compliance-csv";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const on = dayFrom(request, options.today);
  if (!on.ok) return badRequest(on.message);
  const report = await complianceOn(viewer.org.id, scope, viewer.org.timeZone, on.day, options.reminderDays);
  const table = complianceTable(report);
  return csvResponse(toCsv([table.header, ...table.rows]), `tidemark-compliance-as-of-${on.day}.csv`);
}
