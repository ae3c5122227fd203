import { parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Link, useLoaderData } from "react-router";
import { env } from "~/config/env.server";
import { redirectWithToast } from "~/auth/flash.server";
import { forbidden, notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { AskTwice } from "~/components/admin/ask-twice";
import { CautionFooter } from "~/components/caution";
import { CalendarDate, formatInstantDate } from "~/components/calendar-date";
import { TextAreaField } from "~/components/ui/field";
import { certificateFor, revokeCertificate } from "~/db/queries/certificates.server";
import { calendarDateIn } from "~/domain/status";
import { verificationUrl } from "~/pdf/certificate.server";
import { CERTIFICATE_INTENTS, revokeCertificateSchema } from "./certificate-schemas";
import { CertificateStateMark } from "~/components/certificates/certificate-state-mark";
import type { Route } from "./+types/certificate";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:credentials");
  const canVerify = can(viewer.roles, "credentials:verify");
  const today = calendarDateIn(viewer.org.timeZone, new Date());
  const certificate = await certificateFor(viewer.org.id, viewer.person.id, canVerify, params.certificateId, today);
  if (!certificate) notFound("We could not find that certificate.", true);
  const isHolder = certificate.personId === viewer.person.id;
  return {
    certificate,
    isHolder,
    orgName: viewer.org.name,
    timeZone: viewer.org.timeZone,
    verifyUrl: verificationUrl(env().publicUrl, certificate.code),
    verifyPath: `/verify/${encodeURIComponent(certificate.code)}`,
    // A manager of the holder's units revokes; nobody revokes their own certificate.
    mayRevoke: canVerify && !isHolder && certificate.state !== "revoked",
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:credentials");
  const formData = await request.formData();
  if (formData.get("intent") !== CERTIFICATE_INTENTS.revoke) throw data({ message: "Unknown action." }, { status: 400 });
  if (!can(viewer.roles, "credentials:verify")) forbidden("Only a manager of the holder's unit revokes a certificate.");
  const submission = parseWithZod(formData, { schema: revokeCertificateSchema });
  if (submission.status !== "success") return data(submission.reply(), { status: 400 });
  const outcome = await revokeCertificate(viewer.org.id, viewer.person.id, params.certificateId, submission.value.reason);
  if (outcome === "not-found") notFound("We could not find that certificate on your units.", true);
  if (outcome === "already-revoked") return data(submission.reply({ formErrors: ["This certificate was already revoked. Reload the page to see who revoked it."] }), { status: 409 });
  return redirectWithToast(`/credentials/certificates/${params.certificateId}`, "Certificate revoked. Its verification address now shows Revoked; your name, the time and the reason are recorded.");
}

export default function CertificatePage() {
  const { certificate: c, isHolder, orgName, timeZone, verifyUrl, verifyPath, mayRevoke } = useLoaderData<typeof loader>();
  return (
    <>
      <p className="text-sm">
        <Link to={isHolder ? "/credentials" : `/credentials?person=${encodeURIComponent(c.personId)}`}>← Credentials</Link>
      </p>
      <h1 className="mt-2 text-3xl font-semibold">Certificate</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Issued by {orgName} when {isHolder ? "you" : c.personName} {c.sourceType === "attempt" ? "passed the exam" : "was judged competent at a signed check-off"}. Dates are calendar dates in {timeZone}.
      </p>

      <dl className="mt-6 grid max-w-3xl grid-cols-[max-content_1fr] gap-x-6 gap-y-2">
        <dt className="text-muted">Person</dt>
        <dd>{c.personName}</dd>
        <dt className="text-muted">What was met</dt>
        <dd className="font-semibold">{c.title}</dd>
        <dt className="text-muted">Issued</dt>
        <dd>
          <CalendarDate value={c.issuedOn} long />
        </dd>
        <dt className="text-muted">Valid through</dt>
        <dd>{c.validThrough ? <CalendarDate value={c.validThrough} long /> : "No expiry"}</dd>
        <dt className="text-muted">Signed by</dt>
        <dd>
          {c.signerName} ({c.sourceType === "attempt" ? "education lead" : "preceptor"})
        </dd>
        <dt className="text-muted">State</dt>
        <dd>
          <CertificateStateMark state={c.state} />
          {c.revokedAt ? (
            <span className="mt-1 block text-sm">
              Revoked {formatInstantDate(c.revokedAt, timeZone)}
              {c.revokedByName ? ` by ${c.revokedByName}` : ""}: {c.revokedReason}
            </span>
          ) : null}
        </dd>
        <dt className="text-muted">Verification code</dt>
        <dd className="font-mono">{c.code}</dd>
        <dt className="text-muted">Verification address</dt>
        <dd>
          <a href={verifyPath}>{verifyUrl}</a>
        </dd>
      </dl>

      <p className="mt-6">
        <a href={`/credentials/certificates/${c.id}/certificate.pdf`} download className="font-semibold">
          Download the certificate (PDF)
        </a>
      </p>

      {mayRevoke ? <RevokeSection certificateId={c.id} personName={c.personName} title={c.title} /> : null}
      <CautionFooter />
    </>
  );
}

function RevokeSection({ certificateId, personName, title }: { certificateId: string; personName: string; title: string }) {
  const [reason, setReason] = useState("");
  return (
    <section aria-labelledby="revoke-heading" className="mt-10 max-w-3xl">
      <h2 id="revoke-heading" className="text-2xl font-semibold">
        Revoke
      </h2>
      <p className="mt-1 text-muted">For a certificate issued in error, or a record found wrong. Anyone checking its code will see Revoked; the reason stays in the audit trail.</p>
      <TextAreaField id="revoke-reason" name="reason-text" label="Reason for revoking" value={reason} onChange={(e) => setReason(e.target.value)} required rows={3} maxLength={500} />
      <AskTwice
        id={`revoke-${certificateId}`}
        triggerLabel="Revoke this certificate"
        question={`Revoke ${personName}'s certificate “${title}”? This cannot be undone.`}
        confirmLabel="Yes, revoke"
        intent={CERTIFICATE_INTENTS.revoke}
        fields={{ reason }}
      />
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data ? `Certificate: ${data.certificate.title}` : "Certificate"} · Credentials · Tidemark` }];
