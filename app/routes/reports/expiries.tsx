import { useLoaderData } from "react-router";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { RangeForm } from "~/components/reports/range-form";
import { StatusMark } from "~/components/ui/status-mark";
import { expiriesBetween } from "~/db/queries/report-lists.server";
import { expiryRangeFrom, reportViewer } from "./report-load.server";
import { EXPIRIES_NOTE } from "./report-words";
import type { Route } from "./+types/expiries";

const KIND_WORDS = { exam: "Exam", checklist: "Check-off", credential: "Credential" } as const;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = expiryRangeFrom(request, options.today);
  const base = { today: options.today, raw: range.raw };
  if (!range.ok) return { ...base, error: { field: range.field, message: range.message }, range: null, rows: [] };
  const rows = await expiriesBetween(viewer.org.id, scope, viewer.org.timeZone, options, range.from, range.to);
  return { ...base, error: null, range: { from: range.from, to: range.to }, rows };
}

export default function ExpiriesReportPage() {
  const { raw, error, range, rows, today } = useLoaderData<typeof loader>();
  const query = range ? `?from=${range.from}&to=${range.to}` : "";
  return (
    <>
      <h1 className="text-3xl font-semibold">Expiries and due dates</h1>
      <p className="mt-2 max-w-3xl text-muted">{EXPIRIES_NOTE}</p>
      <RangeForm raw={raw} range={range} error={error} />
      {range ? (
        <section aria-labelledby="expiries-heading" className="mt-4 flex flex-col gap-3">
          <h2 id="expiries-heading" className="text-2xl font-semibold">
            <CalendarDate value={range.from} /> to <CalendarDate value={range.to} />: {rows.length} {rows.length === 1 ? "record" : "records"}
          </h2>
          <p className="flex gap-4">
            <a href={`/reports/expiries.csv${query}`} download className="font-semibold">
              Download CSV
            </a>
            <a href={`/reports/expiries.pdf${query}`} download className="font-semibold">
              Download PDF
            </a>
          </p>
          {rows.length === 0 ? (
            <p className="text-muted">No valid-through or due date falls in this range.</p>
          ) : (
            <LedgerTable caption={`Expiries and due dates from ${range.from} to ${range.to}, statuses as of ${today}`}>
              <thead>
                <tr>
                  <Th>Date</Th>
                  <Th>Unit</Th>
                  <Th>Person</Th>
                  <Th>What</Th>
                  <Th>Status today</Th>
                </tr>
              </thead>
              <tbody>
                {rows.map((r) => (
                  <tr key={`${r.personId}:${r.requirementId}`}>
                    <Td>
                      <CalendarDate value={r.date} /> <span className="text-sm text-muted">{r.dateMeaning === "due" ? "due" : "valid through"}</span>
                    </Td>
                    <Td>{r.unit || "—"}</Td>
                    <Td>
                      {r.name}
                      {r.employeeId ? <span className="text-sm text-muted"> · {r.employeeId}</span> : null}
                    </Td>
                    <Td>
                      {r.what} <span className="text-sm text-muted">({KIND_WORDS[r.kind]})</span>
                    </Td>
                    <Td>
                      <StatusMark status={r.status} />
                    </Td>
                  </tr>
                ))}
              </tbody>
            </LedgerTable>
          )}
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Expiries · Reports · Tidemark" }];
