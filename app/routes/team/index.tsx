import { Suspense } from "react";
import { Await, Form, Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { TrendChart } from "~/components/reports/trend-chart";
import { Button } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { statusOptionsFor } from "~/db/queries/people.server";
import { complianceTrend } from "~/db/queries/reports.server";
import { listManagedUnits, listTeam, type TeamScope } from "~/db/queries/team.server";
import { parseTeamSearch, teamHref } from "./search-params";
import { TeamTable } from "./team-table";
import type { Route } from "./+types/index";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "team:read");
  const orgId = viewer.org.id;
  const query = parseTeamSearch(new URL(request.url).searchParams);
  // An educator reads the whole organisation; a manager sees the people of the units they manage.
  const scope: TeamScope = viewer.roles.includes("educator")
    ? { kind: "organisation" }
    : { kind: "units", units: await listManagedUnits(orgId, viewer.person.id) };
  const options = await statusOptionsFor(orgId, viewer.org.timeZone);
  // The 12-month trend is cached (cachedRead) with the same key as on Reports: unit ids sorted.
  // Not awaited: twelve assessments of a large organisation after a write take seconds, so the
  // page streams without it and the chart follows when it is ready (at once when cached).
  const trendScope = { unitIds: scope.kind === "organisation" ? null : scope.units.map((u) => u.id).sort() };
  const trend = complianceTrend(orgId, trendScope, viewer.org.timeZone, options);
  const team = await listTeam(orgId, scope, query, options);
  return {
    query: { ...query, page: team.page },
    scope: scope.kind === "organisation" ? { kind: "organisation" as const, units: [] } : { kind: "units" as const, units: scope.units.map((u) => u.name) },
    orgName: viewer.org.name,
    today: options.today,
    reminderDays: options.reminderDays,
    team,
    trend,
  };
}

export default function Team() {
  const { query, scope, orgName, team, reminderDays, trend } = useLoaderData<typeof loader>();
  const first = team.matching === 0 ? 0 : (team.page - 1) * team.pageSize + 1;
  const last = Math.min(team.page * team.pageSize, team.matching);
  const noUnits = scope.kind === "units" && scope.units.length === 0;
  return (
    <>
      <h1 className="text-3xl font-semibold">Team</h1>
      <p className="mt-2 max-w-3xl text-muted">
        {scope.kind === "organisation"
          ? `Everyone at ${orgName}, read only.`
          : noUnits
            ? "You do not manage any units yet, so no one is listed. Your administrator can add the units you manage."
            : `The people of the units you manage: ${scope.units.join(", ")}.`}{" "}
        Credential counts use each person's current card of each type; “due soon” means within {reminderDays} days.
      </p>

      <p className="mt-3 flex flex-wrap gap-x-6 gap-y-1">
        <Link to="/team/matrix" className="font-semibold">
          Compliance: by unit, upcoming expiries, people × requirements
        </Link>
        <Link to="/team/requirements" className="font-semibold">
          Requirements and their regulatory references
        </Link>
      </p>

      <Form method="get" role="search" aria-label="People" className="mt-6 flex max-w-2xl flex-wrap items-start gap-3">
        <TextField
          id="team-q"
          name="q"
          type="search"
          label="Search by name, e-mail or employee id"
          defaultValue={query.q}
          maxLength={100}
          className="flex min-w-64 flex-1 flex-col gap-1"
        />
        {query.sort !== "name" ? <input type="hidden" name="sort" value={query.sort} /> : null}
        <input type="hidden" name="dir" value={query.dir} />
        <div className="flex gap-2 pt-8">
          <Button type="submit">Search</Button>
          {query.q ? (
            <Link to={teamHref({ ...query, q: "", page: 1 })} className="inline-flex min-h-11 items-center px-2 font-semibold">
              Clear
            </Link>
          ) : null}
        </div>
      </Form>

      <p className="mb-3" aria-live="polite" data-testid="team-count">
        {team.matching === 0
          ? query.q
            ? `No one matches “${query.q}”.`
            : "No one to show."
          : `Showing ${first.toLocaleString("en-US")}–${last.toLocaleString("en-US")} of ${team.matching.toLocaleString("en-US")} ${team.matching === 1 ? "person" : "people"}${query.q ? ` matching “${query.q}”` : ""}.`}
      </p>

      {team.rows.length > 0 ? <TeamTable rows={team.rows} query={query} scopeLabel={scope.kind === "organisation" ? `Everyone at ${orgName}` : "People of your units"} /> : null}

      {team.pageCount > 1 ? (
        <nav aria-label="Pages" className="mt-4 flex flex-wrap items-center gap-4">
          {team.page > 1 ? (
            <Link to={teamHref({ ...query, page: team.page - 1 })} rel="prev" className="inline-flex min-h-11 items-center font-semibold">
              Previous page
            </Link>
          ) : null}
          <span>
            Page {team.page} of {team.pageCount}
          </span>
          {team.page < team.pageCount ? (
            <Link to={teamHref({ ...query, page: team.page + 1 })} rel="next" className="inline-flex min-h-11 items-center font-semibold">
              Next page
            </Link>
          ) : null}
        </nav>
      ) : null}

      {noUnits ? null : (
        <Suspense fallback={<p className="mt-10 text-muted">Working out the past 12 months…</p>}>
          <Await resolve={trend} errorElement={<p className="mt-10">The 12-month trend could not be worked out just now; reload the page to try again.</p>}>
            {(resolved) => <TrendChart trend={resolved} heading="Compliance by unit over the past 12 months" />}
          </Await>
        </Suspense>
      )}
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Team · Tidemark" }];
