/**
 * A certificate as a PDF download: only to its holder and to a manager of one of their units.
 * Anyone else gets the same 404 as for a certificate that does not exist, so ids cannot be probed.
 */
import { env } from "~/config/env.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { certificateFor } from "~/db/queries/certificates.server";
import { calendarDateIn } from "~/domain/status";
import { renderCertificatePdf, verificationUrl } from "~/pdf/certificate.server";
import type { Route } from "./+types/certificate-pdf";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:credentials");
  const today = calendarDateIn(viewer.org.timeZone, new Date());
  const c = await certificateFor(viewer.org.id, viewer.person.id, can(viewer.roles, "credentials:verify"), params.certificateId, today);
  if (!c) notFound("We could not find that certificate.", true);
  const pdf = await renderCertificatePdf({
    orgName: viewer.org.name,
    personName: c.personName,
    title: c.title,
    sourceType: c.sourceType,
    issuedOn: c.issuedOn,
    validThrough: c.validThrough,
    signerName: c.signerName,
    code: c.code,
    verifyUrl: verificationUrl(env().publicUrl, c.code),
    revoked: c.state === "revoked",
  });
  const name = `certificate-${c.personName}-${c.code}`.replace(/[^\w.-]+/g, "-").slice(0, 120);
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
