/** One short line per role the person holds: what their units, people or organisation look like today. */
import type { ReactNode } from "react";
import { Link } from "react-router";
import { CalendarDate } from "~/components/calendar-date";
import type { TodayData } from "./index";

const count = (n: number, one: string, many = `${one}s`) => `${n.toLocaleString("en-US")} ${n === 1 ? one : many}`;

function Line({ label, children }: { label: string; children: ReactNode }) {
  return (
    <li className="border-b border-rule py-3 last:border-b-0">
      <span className="block text-sm font-semibold text-muted">{label}</span>
      {children}
    </li>
  );
}

export function RoleLines({ lines, orgName, canSeeTeam }: { lines: TodayData["lines"]; orgName: string; canSeeTeam: boolean }) {
  const { unitCounts, educator, orientees, organisation } = lines;
  if (!unitCounts && !educator && !orientees && !organisation) return null;
  const teamLink = canSeeTeam ? (
    <>
      {" "}
      <Link to="/team" className="font-semibold">
        Open Team
      </Link>
    </>
  ) : null;
  return (
    <section aria-labelledby="today-roles" className="rounded-lg border border-rule bg-card px-4 py-2">
      <h2 id="today-roles" className="sr-only">
        Your roles today
      </h2>
      <ul>
        {unitCounts ? (
          <Line label="As manager">
            {unitCounts.units.length === 0 ? (
              <>You do not manage any units yet. Your administrator can add them on your record.</>
            ) : (
              <>
                {unitCounts.units.map((u) => u.name).join(", ")}: {count(unitCounts.people, "person", "people")} ·{" "}
                <span className={unitCounts.lapsed > 0 ? "font-semibold text-coral" : undefined}>{count(unitCounts.lapsed, "lapsed credential")}</span> ·{" "}
                {count(unitCounts.dueSoon, "credential")} due soon.{teamLink}
              </>
            )}
          </Line>
        ) : null}
        {educator ? (
          <Line label="As educator">
            {orgName} has {count(educator.activePeople, "active person", "active people")}, {educator.inOrientation} in orientation. You have{" "}
            {count(educator.openAssigned, "open assignment")} out
            {educator.openAssigned > 0 ? <>, {educator.overdueAssigned} overdue</> : null}.{teamLink}
          </Line>
        ) : null}
        {orientees ? (
          <Line label="As preceptor">
            {orientees.length === 0 ? (
              <>No orientees are assigned to you right now.</>
            ) : (
              <>
                You precept {count(orientees.length, "orientee")}:{" "}
                {orientees.map((o, i) => (
                  <span key={o.planId}>
                    {i > 0 ? "; " : null}
                    {o.name}
                    {o.homeUnit ? ` (${o.homeUnit})` : null}, orientation ends <CalendarDate value={o.endsOn} />
                  </span>
                ))}
                .
              </>
            )}
          </Line>
        ) : null}
        {organisation ? (
          <Line label="As administrator">
            {orgName}: {count(organisation.activePeople, "active person", "active people")}
            {organisation.inactivePeople > 0 ? ` (${organisation.inactivePeople} inactive)` : null} on {count(organisation.activeUnits, "unit")}.{" "}
            <Link to="/admin" className="font-semibold">
              Open Admin
            </Link>
          </Line>
        ) : null}
      </ul>
    </section>
  );
}
