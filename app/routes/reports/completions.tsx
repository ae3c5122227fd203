import { useLoaderData } from "react-router";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { RangeForm } from "~/components/reports/range-form";
import { completionsBetween } from "~/db/queries/report-lists.server";
import { methodLabel } from "~/domain/checkoffs/methods";
import { completionRangeFrom, reportViewer } from "./report-load.server";
import { COMPLETIONS_NOTE } from "./report-words";
import type { Route } from "./+types/completions";

const KIND_WORDS = { exam: "Exam", checklist: "Check-off" } as const;

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const range = completionRangeFrom(request, options.today);
  if (!range.ok) return { raw: range.raw, error: { field: range.field, message: range.message }, range: null, report: null };
  const report = await completionsBetween(viewer.org.id, scope, viewer.org.timeZone, range.from, range.to);
  return { raw: range.raw, error: null, range: { from: range.from, to: range.to }, report };
}

export default function CompletionsReportPage() {
  const { raw, error, range, report } = useLoaderData<typeof loader>();
  const query = range ? `?from=${range.from}&to=${range.to}` : "";
  return (
    <>
      <h1 className="text-3xl font-semibold">Completions</h1>
      <p className="mt-2 max-w-3xl text-muted">{COMPLETIONS_NOTE}</p>
      <RangeForm raw={raw} range={range} error={error} />
      {range && report ? (
        <section aria-labelledby="completions-heading" className="mt-4 flex flex-col gap-3">
          <h2 id="completions-heading" className="text-2xl font-semibold">
            <CalendarDate value={range.from} /> to <CalendarDate value={range.to} />: {report.rows.length} {report.rows.length === 1 ? "completion" : "completions"}
          </h2>
          <p className="flex gap-4">
            <a href={`/reports/completions.csv${query}`} download className="font-semibold">
              Download CSV
            </a>
            <a href={`/reports/completions.pdf${query}`} download className="font-semibold">
              Download PDF
            </a>
          </p>
          {report.rows.length === 0 ? (
            <p className="text-muted">Nothing was completed in this range.</p>
          ) : (
            <>
              <LedgerTable caption="Completions by exam or checklist" maxHeight="max-h-96">
                <thead>
                  <tr>
                    <Th>Exam or checklist</Th>
                    <Th>Kind</Th>
                    <Th numeric>Completions</Th>
                  </tr>
                </thead>
                <tbody>
                  {report.counts.map((c) => (
                    <tr key={`${c.kind}:${c.refId}`}>
                      <Td>{c.what}</Td>
                      <Td>{KIND_WORDS[c.kind]}</Td>
                      <Td numeric>{c.count}</Td>
                    </tr>
                  ))}
                </tbody>
              </LedgerTable>
              <LedgerTable caption="Each completion, by date">
                <thead>
                  <tr>
                    <Th>Date</Th>
                    <Th>Exam or checklist</Th>
                    <Th>Person</Th>
                    <Th>Unit</Th>
                    <Th numeric>Score</Th>
                    <Th>Assessor and method</Th>
                  </tr>
                </thead>
                <tbody>
                  {report.rows.map((r, i) => (
                    <tr key={i}>
                      <Td>
                        <CalendarDate value={r.on} />
                      </Td>
                      <Td>
                        {r.what} <span className="text-sm text-muted">({KIND_WORDS[r.kind]})</span>
                      </Td>
                      <Td>
                        {r.name}
                        {r.employeeId ? <span className="text-sm text-muted"> · {r.employeeId}</span> : null}
                      </Td>
                      <Td>{r.unit || "—"}</Td>
                      <Td numeric>{r.scorePercent === null ? "—" : `${r.scorePercent.toFixed(1)} %`}</Td>
                      <Td>{r.kind === "checklist" ? `${r.assessor ?? "—"} · ${r.method ? methodLabel(r.method) : "—"}` : "—"}</Td>
                    </tr>
                  ))}
                </tbody>
              </LedgerTable>
            </>
          )}
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Completions · Reports · Tidemark" }];
