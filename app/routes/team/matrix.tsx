import { useEffect } from "react";
import { Link, useFetcher, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { ROLE_LABELS, ROLES } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { MatrixTable } from "~/components/team/matrix-table";
import { Button } from "~/components/ui/button";
import { SelectField, TextField } from "~/components/ui/field";
import { STATUS_WORDS } from "~/components/ui/status-mark";
import { cellTuple, matrixScopeFor, matrixView } from "~/db/queries/team-matrix.server";
import { STATUSES } from "~/domain/status";
import {
  encodeCells,
  MATRIX_PAGE_SIZE,
  matrixSearch,
  parseMatrixSearch,
  type MatrixSearch,
} from "./matrix-params";
import type { Route } from "./+types/matrix";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  const search = parseMatrixSearch(new URL(request.url).searchParams);
  const scope = await matrixScopeFor(
    viewer.org.id,
    viewer.person.id,
    viewer.roles,
  );
  const { options, matrix, matching } = await matrixView(viewer.org.id, scope, viewer.org.timeZone, search);
  const pageCount = Math.max(1, Math.ceil(matching.length / MATRIX_PAGE_SIZE));
  const page = Math.min(search.page, pageCount);
  return {
    search: { ...search, page },
    today: options.today,
    reminderDays: options.reminderDays,
    columns: matrix.columns,
    units: matrix.units,
    compliance: matrix.compliance,
    expiries: matrix.expiries,
    // Compact cells aligned with the columns: 25 people × 40 requirements stay a small response.
    rows: matching
      .slice((page - 1) * MATRIX_PAGE_SIZE, page * MATRIX_PAGE_SIZE)
      .map((p) => ({
        id: p.id,
        name: p.name,
        homeUnit: p.homeUnit,
        cells: encodeCells(matrix.columns.map((c) => cellTuple(p.cells[c.id]))),
      })),
    matching: matching.length,
    inScope: matrix.people.length,
    page,
    pageCount,
  };
}

type Data = Awaited<ReturnType<typeof loader>>;

export default function TeamMatrix() {
  const initial = useLoaderData<typeof loader>();
  const fetcher = useFetcher<typeof loader>();
  // The page's first data comes with the document; every later view is fetched alone (no reload).
  const view: Data = fetcher.data ?? initial;
  const busy = fetcher.state !== "idle";
  useEffect(() => {
    if (fetcher.data)
      window.history.replaceState(
        window.history.state,
        "",
        `/team/matrix${matrixSearch(fetcher.data.search)}`,
      );
  }, [fetcher.data]);
  const go = (s: MatrixSearch) =>
    fetcher.load(`/team/matrix${matrixSearch(s)}`);
  return (
    <>
      <h1 className="text-3xl font-semibold">Compliance</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Every person × requirement, on <CalendarDate value={view.today} long />.
        “Due soon” means within {view.reminderDays} days or inside a grace
        period. <Link to="/team/requirements">What each requirement asks</Link>.
      </p>

      <UnitCompliance compliance={view.compliance} />
      <Expiries expiries={view.expiries} />

      <section aria-labelledby="matrix-heading" className="mt-10">
        <h2 id="matrix-heading" className="text-2xl font-semibold">
          People and requirements
        </h2>
        <fetcher.Form
          method="get"
          action="/team/matrix"
          role="search"
          aria-label="Filter the matrix"
          className="mt-3 flex flex-wrap items-start gap-3"
        >
          <TextField
            id="matrix-q"
            name="q"
            type="search"
            label="Name or employee id"
            defaultValue={view.search.q}
            maxLength={100}
            className="flex min-w-56 flex-col gap-1"
          />
          <SelectField
            id="matrix-unit"
            name="unit"
            label="Unit"
            defaultValue={view.search.unit}
            options={[
              { value: "", label: "All units" },
              ...view.units.map((u) => ({ value: u.id, label: u.name })),
            ]}
            className="flex min-w-44 flex-col gap-1"
          />
          <SelectField
            id="matrix-role"
            name="role"
            label="Role"
            defaultValue={view.search.role}
            options={[
              { value: "", label: "All roles" },
              ...ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] })),
            ]}
            className="flex min-w-40 flex-col gap-1"
          />
          <SelectField
            id="matrix-status"
            name="status"
            label="Has a cell that is"
            defaultValue={view.search.status}
            options={[
              { value: "", label: "Any status" },
              ...STATUSES.map((s) => ({ value: s, label: STATUS_WORDS[s] })),
            ]}
            className="flex min-w-40 flex-col gap-1"
          />
          <input type="hidden" name="sort" value={view.search.sort} />
          <input type="hidden" name="dir" value={view.search.dir} />
          <div className="flex gap-2 pt-8">
            <Button type="submit">Filter</Button>
            <a
              href={`/team/matrix/export${matrixSearch({ ...view.search, page: 1 })}`}
              className="inline-flex min-h-11 items-center px-2 font-semibold"
              download
            >
              Export CSV
            </a>
          </div>
        </fetcher.Form>

        <p className="mb-3" aria-live="polite" data-testid="matrix-count">
          {busy
            ? "Loading…"
            : view.matching === 0
              ? "No one matches."
              : `Showing ${(view.page - 1) * MATRIX_PAGE_SIZE + 1}–${Math.min(view.page * MATRIX_PAGE_SIZE, view.matching)} of ${view.matching.toLocaleString("en-US")} people (of ${view.inScope.toLocaleString("en-US")}).`}
        </p>

        {view.rows.length > 0 ? <MatrixTable view={view} go={go} /> : null}
      </section>
      <CautionFooter />
    </>
  );
}

function UnitCompliance({ compliance }: { compliance: Data["compliance"] }) {
  return (
    <section aria-labelledby="units-heading" className="mt-8">
      <h2 id="units-heading" className="text-2xl font-semibold">
        Compliance by unit
      </h2>
      <table className="mt-3 w-full max-w-5xl border-collapse text-left">
        <caption className="sr-only">
          Share of requirements Current, and counts per status, by unit
        </caption>
        <thead>
          <tr className="border-b border-rule text-sm text-muted">
            <th scope="col" className="py-2 pr-4">
              Unit
            </th>
            <th scope="col" className="py-2 pr-4 text-right">
              People
            </th>
            <th scope="col" className="py-2 pr-4 text-right">
              % Current
            </th>
            {STATUSES.map((s) => (
              <th key={s} scope="col" className="py-2 pr-4 text-right">
                {STATUS_WORDS[s]}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {compliance.map((u) => (
            <tr
              key={u.unitId}
              className="border-b border-rule"
              data-testid="unit-compliance"
            >
              <th scope="row" className="py-2 pr-4 font-semibold">
                {u.unit}
              </th>
              <td className="py-2 pr-4 text-right">{u.people}</td>
              <td className="py-2 pr-4 text-right">
                {u.percentCurrent.toFixed(1)} %
              </td>
              {STATUSES.map((s) => (
                <td key={s} className="py-2 pr-4 text-right">
                  {u.counts[s]}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}

function Expiries({ expiries }: { expiries: Data["expiries"] }) {
  return (
    <section aria-labelledby="expiries-heading" className="mt-8">
      <h2 id="expiries-heading" className="text-2xl font-semibold">
        Upcoming expiries
      </h2>
      <p className="mt-1" data-testid="expiry-counts">
        Within 30 days: <strong>{expiries.within[30]}</strong> · within 60 days:{" "}
        <strong>{expiries.within[60]}</strong> · within 90 days:{" "}
        <strong>{expiries.within[90]}</strong>
      </p>
      {expiries.soonest.length > 0 ? (
        <ul className="mt-2 max-w-3xl">
          {expiries.soonest.map((e) => (
            <li
              key={`${e.personId}-${e.requirementId}`}
              className="border-b border-rule py-1"
            >
              <CalendarDate value={e.validThrough} /> — {e.name}:{" "}
              {e.requirement}
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [
  { title: "Compliance · Team · Tidemark" },
];
