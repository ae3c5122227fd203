/** The filtered matrix as CSV (every matching person, not one page), formula cells neutralised. */
import { requireViewer } from "~/auth/gate.server";
import { STATUS_WORDS } from "~/components/ui/status-mark";
import { matrixScopeFor, matrixView } from "~/db/queries/team-matrix.server";
import { toCsv } from "./csv";
import { parseMatrixSearch } from "./matrix-params";
import type { Route } from "./+types/matrix-export";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  const search = parseMatrixSearch(new URL(request.url).searchParams);
  const scope = await matrixScopeFor(viewer.org.id, viewer.person.id, viewer.roles);
  const { options, matrix, matching: people } = await matrixView(viewer.org.id, scope, viewer.org.timeZone, search);
  const header = ["Name", "Employee id", "Home unit", ...matrix.columns.flatMap((c) => [c.name, `${c.name}: date`])];
  const rows = people.map((p) => [
    p.name,
    p.employeeId ?? "",
    p.homeUnit ?? "",
    ...matrix.columns.flatMap((c) => {
      const cell = p.cells[c.id];
      if (!cell) return ["Does not apply", ""];
      return [STATUS_WORDS[cell.status], cell.waivedThrough ?? cell.extendedTo ?? cell.date ?? ""];
    }),
  ]);
  return new Response(toCsv([header, ...rows]), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="tidemark-compliance-${options.today}.csv"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
