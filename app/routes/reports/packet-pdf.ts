/**
 * The survey evidence packet as PDF: ?person=<id> or ?unit=<id>. Record-scoped: 404 without a
 * target, or for a person or unit outside the viewer's organisation or scope.
 */
import { notFound } from "~/auth/gate.server";
import { loadPacket, type PacketTarget } from "~/db/queries/report-packet.server";
import { renderSurveyPacketPdf } from "~/pdf/survey-packet.server";
import { pdfResponse, reportViewer } from "./report-load.server";
import type { Route } from "./+types/packet-pdf";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const params = new URL(request.url).searchParams;
  const person = params.get("person")?.trim();
  const unit = params.get("unit")?.trim();
  const target: PacketTarget | null = person ? { kind: "person", id: person } : unit ? { kind: "unit", id: unit } : null;
  if (!target) notFound("Choose a person or a unit for the survey evidence packet.", true);
  const packet = await loadPacket(viewer.org.id, scope, viewer.org.timeZone, options, target);
  if (!packet) notFound("We could not find that person or unit among the people you may report on.", true);
  const pdf = await renderSurveyPacketPdf(packet, viewer.org.name, options.today, viewer.org.timeZone);
  const name = `survey-packet-${packet.subject}-${options.today}`.replace(/[^\w.-]+/g, "-").slice(0, 120);
  return pdfResponse(pdf, `${name}.pdf`);
}
