import { Form, Link, useLoaderData } from "react-router";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { StatusMark } from "~/components/ui/status-mark";
import { complianceOn } from "~/db/queries/reports.server";
import { STATUSES } from "~/domain/status";
import { dayFrom, reportViewer } from "./report-load.server";
import { AS_RECORDED_NOTE } from "./report-words";
import type { Route } from "./+types/compliance";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const on = dayFrom(request, options.today);
  const base = { today: options.today, raw: on.raw, timeZone: viewer.org.timeZone, reminderDays: options.reminderDays };
  if (!on.ok) return { ...base, error: on.message, report: null };
  const report = await complianceOn(viewer.org.id, scope, viewer.org.timeZone, on.day, options.reminderDays);
  return { ...base, error: null, report };
}

export default function ComplianceReportPage() {
  const { today, raw, error, report, timeZone, reminderDays } = useLoaderData<typeof loader>();
  const query = report ? `?on=${report.day}` : "";
  return (
    <>
      <h1 className="text-3xl font-semibold">Compliance by unit</h1>
      <p className="mt-2 max-w-3xl text-muted">{AS_RECORDED_NOTE}</p>

      <Form method="get" className="mt-6 flex max-w-xl flex-wrap items-start gap-3" aria-label="Choose the day">
        <TextField
          id="report-on"
          name="on"
          type="date"
          label="As recorded by the end of"
          hint={`Today (${today}) or an earlier day, as YYYY-MM-DD.`}
          defaultValue={raw || today}
          max={today}
          errors={error ? [error] : null}
          className="flex min-w-64 flex-1 flex-col gap-1"
        />
        <div className="pt-14">
          <Button type="submit">Show</Button>
        </div>
      </Form>

      {report ? (
        <section aria-labelledby="compliance-heading" className="mt-4 flex flex-col gap-3">
          <h2 id="compliance-heading" className="text-2xl font-semibold">
            As recorded by the end of <CalendarDate value={report.day} long />
          </h2>
          <p>
            {report.total.people} {report.total.people === 1 ? "person" : "people"}, {report.total.cells} person × requirement records, {report.total.percentCurrent.toFixed(1)} % Current
            (time zone {timeZone}; “due soon” means within {reminderDays} days of that day).
            {report.leftOut.hiredLater || report.leftOut.inactive
              ? ` Left out: ${report.leftOut.hiredLater} hired after that day, ${report.leftOut.inactive} not active at its end.`
              : ""}
          </p>
          <p className="flex gap-4">
            <a href={`/reports/compliance.csv${query}`} download className="font-semibold">
              Download CSV
            </a>
            <a href={`/reports/compliance.pdf${query}`} download className="font-semibold">
              Download PDF
            </a>
          </p>
          {report.units.length === 0 ? (
            <p className="text-muted">No units to report on.</p>
          ) : (
            <LedgerTable caption={`Compliance by unit as recorded by the end of ${report.day}`}>
              <thead>
                <tr>
                  <Th>Unit</Th>
                  <Th numeric>People</Th>
                  <Th numeric>Records</Th>
                  <Th numeric>% Current</Th>
                  {STATUSES.map((s) => (
                    <Th key={s} numeric>
                      <StatusMark status={s} />
                    </Th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {[...report.units.map((u) => ({ key: u.unitId, name: u.unit, t: u })), { key: "total", name: "Everyone in this report (each person once)", t: report.total }].map(({ key, name, t }) => (
                  <tr key={key}>
                    <th scope="row" className={`border-b border-rule px-3 py-2 text-left align-top ${key === "total" ? "font-semibold" : "font-normal"}`}>
                      {name}
                    </th>
                    <Td numeric>{t.people}</Td>
                    <Td numeric>{t.cells}</Td>
                    <Td numeric>{t.percentCurrent.toFixed(1)} %</Td>
                    {STATUSES.map((s) => (
                      <Td key={s} numeric>
                        {t.counts[s]}
                      </Td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </LedgerTable>
          )}
          <p className="text-sm text-muted">
            A person on more than one unit counts on each. <Link to="/team/matrix">Today's matrix</Link> shows each person's records.
          </p>
        </section>
      ) : null}
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Compliance by unit · Reports · Tidemark" }];
