/**
 * Public verification of a certificate's code (printed on the PDF and held in its QR code).
 * Shows only the person's name, what was met, the dates and whether it is valid, expired or
 * revoked. An unknown code answers a bare 404 — no page, no layout, nothing to learn from — and
 * each client's lookups are rate-limited (OWASP ASVS 4.0.3 V11.1.4, anti-automation).
 */
import { createContext, useLoaderData } from "react-router";
import { clientKey, hitRateLimit } from "~/auth/rate-limit.server";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { CertificateStateMark } from "~/components/certificates/certificate-state-mark";
import { verifyCertificateCode, type VerifiedCertificate } from "~/db/queries/certificates.server";
import type { Route } from "./+types/verify";

/** 60 lookups a minute per client: plenty for a person scanning a stack of certificates. */
const LOOKUPS_PER_CLIENT = { limit: 60, windowMs: 60_000 };

const verifiedContext = createContext<VerifiedCertificate | null>(null);

/** The bare answers: plain text, nothing of the site around them. */
function bare(status: 404 | 429, headers: Record<string, string> = {}): Response {
  return new Response(status === 404 ? "Not Found" : "Too Many Requests", {
    status,
    headers: { "Content-Type": "text/plain; charset=utf-8", "Cache-Control": "no-store", "X-Content-Type-Options": "nosniff", ...headers },
  });
}

/** Runs before the page renders, so an unknown code never reaches the layout or error page. */
export const middleware: Route.MiddlewareFunction[] = [
  async ({ request, params, context }, next) => {
    const limited = await hitRateLimit(`verify:client:${clientKey(request)}`, LOOKUPS_PER_CLIENT);
    if (!limited.allowed) return bare(429, { "Retry-After": String(limited.retryAfterSeconds) });
    const found = await verifyCertificateCode(params.code);
    if (!found) return bare(404);
    context.set(verifiedContext, found);
    return next();
  },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const found = context.get(verifiedContext) ?? (await verifyCertificateCode(params.code));
  if (!found) throw bare(404);
  return { certificate: found };
}

export default function Verify() {
  const { certificate: c } = useLoaderData<typeof loader>();
  return (
    <main className="mx-auto max-w-2xl px-6 py-12">
      <p className="text-sm text-muted">Tidemark · certificate check</p>
      <h1 className="mt-2 text-3xl font-semibold">Certificate check</h1>
      <dl className="mt-6 grid grid-cols-[max-content_1fr] gap-x-6 gap-y-2">
        <dt className="text-muted">Name</dt>
        <dd>{c.personName}</dd>
        <dt className="text-muted">What was met</dt>
        <dd className="font-semibold">{c.title}</dd>
        <dt className="text-muted">Issued</dt>
        <dd>
          <CalendarDate value={c.issuedOn} long />
        </dd>
        <dt className="text-muted">Valid through</dt>
        <dd>{c.validThrough ? <CalendarDate value={c.validThrough} long /> : "No expiry"}</dd>
        <dt className="text-muted">State</dt>
        <dd data-testid="certificate-state">
          <CertificateStateMark state={c.state} />
        </dd>
      </dl>
      <p className="mt-6 text-sm text-muted">
        Checked today in the issuing organisation's time zone ({c.timeZone}). A valid certificate is valid through its date, inclusive.
      </p>
      <CautionFooter />
    </main>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Certificate check · Tidemark" }, { name: "robots", content: "noindex" }];
