import { Link, useLoaderData } from "react-router";
import { CautionFooter } from "~/components/caution";
import { TrendChart } from "~/components/reports/trend-chart";
import { complianceTrend } from "~/db/queries/reports.server";
import { reportViewer } from "./report-load.server";
import { AS_RECORDED_NOTE } from "./report-words";
import type { Route } from "./+types/index";

export async function loader({ context }: Route.LoaderArgs) {
  const { viewer, scope, options } = await reportViewer(context);
  const trend = await complianceTrend(viewer.org.id, scope, viewer.org.timeZone, options);
  return { today: options.today, scopeKind: scope.unitIds === null ? ("organisation" as const) : ("units" as const), orgName: viewer.org.name, trend };
}

const REPORTS = [
  {
    to: "/reports/compliance",
    title: "Compliance by unit on a chosen day",
    what: "The share of requirement records that were Current, and the count of each status, per unit — as recorded by the end of the day you choose, so you can answer for the past.",
    downloads: true,
  },
  {
    to: "/reports/expiries",
    title: "Expiries and due dates",
    what: "Every credential, exam and check-off whose valid-through or due date falls in a date range (the next 90 days unless you choose), by unit and person, with today's status.",
    downloads: true,
  },
  {
    to: "/reports/completions",
    title: "Completions",
    what: "Exams passed and check-offs signed competent in a date range: how many of each, and the list.",
    downloads: true,
  },
  {
    to: "/reports/packet",
    title: "Survey evidence packet",
    what: "One PDF for a person or a whole unit: every requirement with its status and evidence — credential numbers and who verified them, exam scores, check-off methods, assessors and signatures — and their certificates.",
    downloads: false,
  },
] as const;

export default function ReportsIndex() {
  const { scopeKind, orgName, trend } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Reports</h1>
      <p className="mt-2 max-w-3xl text-muted">
        {scopeKind === "organisation" ? `Everyone at ${orgName}.` : "The people of the units you manage."} Each report is a page, a CSV for a spreadsheet and a PDF to hand a surveyor.
      </p>
      <ul className="mt-6 grid max-w-5xl gap-4 md:grid-cols-2">
        {REPORTS.map((r) => (
          <li key={r.to} className="rounded-md border border-rule bg-card p-4">
            <h2 className="text-xl font-semibold">
              <Link to={r.to}>{r.title}</Link>
            </h2>
            <p className="mt-1">{r.what}</p>
            {r.downloads ? (
              <p className="mt-2 flex gap-4 text-sm">
                <a href={`${r.to}.csv`} download>
                  CSV<span className="sr-only"> of {r.title.toLowerCase()}</span>
                </a>
                <a href={`${r.to}.pdf`} download>
                  PDF<span className="sr-only"> of {r.title.toLowerCase()}</span>
                </a>
              </p>
            ) : null}
          </li>
        ))}
      </ul>
      <TrendChart trend={trend} />
      <p className="mt-2 max-w-3xl text-sm text-muted">{AS_RECORDED_NOTE}</p>
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Reports · Tidemark" }];
