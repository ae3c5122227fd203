/**
 * The Team ledger: hairline rules, right-aligned numbers, a sticky header inside its own
 * scrolling region, and sortable columns whose headers are links (so sorting works without
 * JavaScript) carrying `aria-sort` when sorted (WAI-ARIA 1.2, "aria-sort").
 */
import { Link } from "react-router";
import { ROLE_LABELS } from "~/auth/roles";
import { CalendarDate } from "~/components/calendar-date";
import type { TeamRow } from "~/db/queries/team.server";
import { sortHref, type TeamQuery, type TeamSort } from "./search-params";

const SORT_WORDS: Record<TeamSort, string> = { name: "name", unit: "home unit", hire: "hire date", lapsed: "lapsed credentials" };

function SortableHeader({ column, label, query, numeric = false }: { column: TeamSort; label: string; query: TeamQuery; numeric?: boolean }) {
  const sorted = query.sort === column;
  const next = sorted && query.dir === "asc" ? "descending" : sorted ? "ascending" : null;
  return (
    <th
      scope="col"
      aria-sort={sorted ? (query.dir === "asc" ? "ascending" : "descending") : undefined}
      className={`sticky top-0 z-10 border-b border-rule bg-card py-2 pr-4 font-semibold ${numeric ? "text-right" : ""}`}
    >
      <Link to={sortHref(query, column)} className="inline-flex min-h-11 items-center gap-1 no-underline hover:underline">
        {label}
        <span aria-hidden="true" className="text-xs">
          {sorted ? (query.dir === "asc" ? "▲" : "▼") : "↕"}
        </span>
        <span className="sr-only">{next ? `, sort ${next}` : ", sort"}</span>
      </Link>
    </th>
  );
}

function PlainHeader({ label, numeric = false }: { label: string; numeric?: boolean }) {
  return (
    <th scope="col" className={`sticky top-0 z-10 border-b border-rule bg-card py-2 pr-4 font-semibold ${numeric ? "text-right" : ""}`}>
      {label}
    </th>
  );
}

export function TeamTable({ rows, query, scopeLabel }: { rows: TeamRow[]; query: TeamQuery; scopeLabel: string }) {
  const caption = `${scopeLabel}, sorted by ${SORT_WORDS[query.sort]}, ${query.dir === "asc" ? "ascending" : "descending"}`;
  return (
    <div role="region" aria-labelledby="team-caption" tabIndex={0} className="max-h-[70vh] overflow-auto rounded-lg border border-rule bg-card px-4">
      <table className="w-full border-collapse text-left">
        <caption id="team-caption" className="pt-3 pb-2 text-left text-sm text-muted">
          {caption}
        </caption>
        <thead className="text-sm text-muted">
          <tr>
            <SortableHeader column="name" label="Name" query={query} />
            <PlainHeader label="Employee id" />
            <PlainHeader label="Roles" />
            <SortableHeader column="unit" label="Home unit" query={query} />
            <SortableHeader column="hire" label="Hire date" query={query} />
            <PlainHeader label="Active" />
            <SortableHeader column="lapsed" label="Lapsed" query={query} numeric />
            <PlainHeader label="Due soon" numeric />
          </tr>
        </thead>
        <tbody>
          {rows.map((p) => (
            <tr key={p.id} className="border-b border-rule align-top last:border-b-0">
              <th scope="row" className="py-2 pr-4 text-left font-normal">
                <span className="font-semibold">{p.name}</span>
                <span className="block text-sm text-muted">{p.email}</span>
              </th>
              <td className="py-2 pr-4 tabular-nums">{p.employeeId ?? <span className="text-muted">—</span>}</td>
              <td className="py-2 pr-4">{p.roles.map((r) => ROLE_LABELS[r]).join(", ")}</td>
              <td className="py-2 pr-4">
                {p.homeUnit ?? <span className="text-muted">None</span>}
                {p.otherUnits.length > 0 ? <span className="block text-sm text-muted">also {p.otherUnits.join(", ")}</span> : null}
              </td>
              <td className="py-2 pr-4 whitespace-nowrap">{p.hireDate ? <CalendarDate value={p.hireDate} /> : <span className="text-muted">—</span>}</td>
              <td className="py-2 pr-4">{p.active ? "Active" : <span className="font-semibold">Inactive</span>}</td>
              <td className={`py-2 pr-4 text-right tabular-nums ${p.credentials.lapsed > 0 ? "font-semibold text-coral" : ""}`}>{p.credentials.lapsed}</td>
              <td className="py-2 pr-4 text-right tabular-nums">{p.credentials.dueSoon}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
