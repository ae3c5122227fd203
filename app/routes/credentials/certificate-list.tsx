/** The "Certificates" section of Credentials: what a person holds, each with its details and PDF. */
import { Link } from "react-router";
import { CalendarDate } from "~/components/calendar-date";
import { CertificateStateMark } from "~/components/certificates/certificate-state-mark";
import type { CertificateRow } from "~/db/queries/certificates.server";

export function CertificateList({ rows, isSelf, subjectName }: { rows: CertificateRow[]; isSelf: boolean; subjectName: string }) {
  return (
    <section aria-labelledby="certificates-heading" className="mt-10">
      <h2 id="certificates-heading" className="text-2xl font-semibold">
        {isSelf ? "Your certificates" : `${subjectName}’s certificates`}
      </h2>
      <p className="mt-1 max-w-3xl text-muted">Issued when an exam is passed or a check-off is signed competent. Each carries a code anyone can check at its verification address.</p>
      {rows.length === 0 ? (
        <p className="mt-2">No certificates yet.</p>
      ) : (
        <table className="mt-3 w-full border-collapse text-left">
          <caption className="sr-only">Certificates with their dates, state and download</caption>
          <thead>
            <tr className="border-b border-rule text-sm text-muted">
              <th scope="col" className="py-2 pr-4">Certificate</th>
              <th scope="col" className="py-2 pr-4">Issued</th>
              <th scope="col" className="py-2 pr-4">Valid through</th>
              <th scope="col" className="py-2 pr-4">State</th>
              <th scope="col" className="py-2">PDF</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((c) => (
              <tr key={c.id} className="border-b border-rule align-top">
                <td className="py-2 pr-4">
                  <Link to={`/credentials/certificates/${c.id}`} className="font-semibold">
                    {c.title}
                  </Link>
                  <span className="block font-mono text-sm text-muted">{c.code}</span>
                </td>
                <td className="py-2 pr-4">
                  <CalendarDate value={c.issuedOn} />
                </td>
                <td className="py-2 pr-4">{c.validThrough ? <CalendarDate value={c.validThrough} /> : "No expiry"}</td>
                <td className="py-2 pr-4">
                  <CertificateStateMark state={c.state} />
                </td>
                <td className="py-2 text-sm">
                  <a href={`/credentials/certificates/${c.id}/certificate.pdf`} download>
                    Download<span className="sr-only"> the certificate {c.title}</span>
                  </a>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
