/** The item analysis on one page, as a PDF download (app/pdf/item-analysis.server.tsx). */
import { requireViewer } from "~/auth/gate.server";
import { renderItemAnalysisPdf } from "~/pdf/item-analysis.server";
import { downloadName, loadAnalysis } from "./exam-analysis-load.server";
import type { Route } from "./+types/exam-analysis-pdf";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:bank");
  const view = await loadAnalysis(viewer.org.id, params.examId, request);
  const pdf = await renderItemAnalysisPdf(view, viewer.org.name);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${downloadName(view, "pdf")}"`,
      "Content-Length": String(pdf.length),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
