import { requireViewer } from "~/auth/gate.server";
import { exportContents } from "~/db/queries/bank.server";
import { exportCsv, exportJson } from "~/domain/bank/interchange";
import { ITEM_STATUS_LIST, type ItemStatus } from "~/domain/bank/lifecycle";
import type { Route } from "./+types/export";

/** The bank as a file, in the format import reads (a round trip changes nothing). */
export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const url = new URL(request.url);
  const format = url.searchParams.get("format") === "json" ? "json" : "csv";
  const status = url.searchParams.get("status") ?? "";
  const filter = (ITEM_STATUS_LIST as readonly string[]).includes(status) ? { status: status as ItemStatus } : {};
  const contents = await exportContents(viewer.org.id, filter);
  const body = format === "json" ? exportJson(contents) : exportCsv(contents);
  return new Response(body, {
    headers: {
      "Content-Type": format === "json" ? "application/json; charset=utf-8" : "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="tidemark-items.${format}"`,
      "Cache-Control": "no-store",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
