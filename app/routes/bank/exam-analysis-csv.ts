/** The item analysis as a CSV download (rows: ./analysis-csv.ts). */
import { requireViewer } from "~/auth/gate.server";
import { analysisCsv } from "./analysis-csv";
import { downloadName, loadAnalysis } from "./exam-analysis-load.server";
import type { Route } from "./+types/exam-analysis-csv";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:bank");
  const view = await loadAnalysis(viewer.org.id, params.examId, request);
  return new Response(analysisCsv(view), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${downloadName(view, "csv")}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
