import { requireViewer } from "~/auth/gate.server";
import { renderCheckoffRecordPdf } from "~/pdf/checkoff-record.server";
import { recordViewData } from "./record-data.server";
import { requireVisibleCheckoff } from "./record-access.server";
import type { Route } from "./+types/record-pdf";

/** The record as a PDF download, for whoever may see the check-off. */
export async function loader({ context, params }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const record = await requireVisibleCheckoff(viewer, params.checkoffId);
  const pdf = await renderCheckoffRecordPdf(recordViewData(viewer, record));
  const name = `checkoff-${record.person.name}-${record.checklist.skill}`.replace(/[^\w.-]+/g, "-").slice(0, 120);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${name}.pdf"`,
      "Content-Length": String(pdf.length),
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
