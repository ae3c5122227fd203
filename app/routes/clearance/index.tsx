import { Form, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { CautionFooter } from "~/components/caution";
import { formatLongCalendarDate } from "~/components/calendar-date";
import { LevelMark } from "~/components/clearance/level-mark";
import { Button } from "~/components/ui/button";
import { SelectField } from "~/components/ui/field";
import { FilterActions } from "~/components/ui/filter-actions";
import { clearanceUnitsFor, deriveBoard } from "~/db/queries/clearance.server";
import { CLEARANCE_LEVELS, countLevels, LEVEL_WORDS } from "~/domain/clearance";
import { filterProblem, parseClearanceSearch } from "./search-params";
import type { Route } from "./+types/index";

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:clearance");
  const search = parseClearanceSearch(new URL(request.url).searchParams);
  const units = await clearanceUnitsFor(viewer);
  const unitIds = units.map((u) => u.id);
  const board = await deriveBoard(viewer.org.id, viewer.org.timeZone, {
    unitIds: search.unit && unitIds.includes(search.unit) ? [search.unit] : unitIds,
    checklistId: search.skill || null,
  });
  const problem = filterProblem(search, unitIds, board.skills.map((s) => s.checklistId));
  const shownSkills = search.skill ? board.skills.filter((s) => s.checklistId === search.skill) : board.skills;
  return {
    search,
    today: board.today,
    // Formatted here, in the organisation's zone, so server and browser print the same words.
    derivedAt: new Intl.DateTimeFormat("en-GB", { timeZone: viewer.org.timeZone, day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(board.derivedAt),
    timeZone: viewer.org.timeZone,
    orgName: viewer.org.name,
    units,
    skills: board.skills,
    shownSkills: problem ? [] : shownSkills,
    boards: problem ? [] : board.boards,
    problem,
  };
}

type Data = Awaited<ReturnType<typeof loader>>;

export default function ClearanceBoardPage() {
  const data = useLoaderData<typeof loader>();
  const filtered = Boolean(data.search.unit || data.search.skill);
  return (
    <>
      <h1 className="text-3xl font-semibold">Clearance board</h1>
      <p className="mt-2 max-w-3xl">
        Who may do what today, <strong>{formatLongCalendarDate(data.today)}</strong>, on each unit and skill — derived from signed check-offs,
        requirements and credentials as they stand now.
      </p>
      <p className="mt-1 text-sm text-muted" data-testid="board-time">
        {data.orgName} · board as of {data.derivedAt} ({data.timeZone})
      </p>

      <Legend />

      {data.units.length === 0 ? (
        <p className="mt-6 max-w-3xl rounded-md border border-rule bg-card p-4" data-testid="no-units">
          You are not on any unit yet, so there is no board to show. Your manager or an administrator adds you to your units.
        </p>
      ) : (
        <Form method="get" role="search" aria-label="Filter the board" className="mt-6 flex flex-wrap items-end gap-x-4 rounded-md border border-rule bg-card p-4 print:hidden">
          <SelectField
            id="clearance-unit"
            name="unit"
            label="Unit"
            defaultValue={data.search.unit}
            options={[{ value: "", label: data.units.length > 1 ? "All my units" : "My unit" }, ...data.units.map((u) => ({ value: u.id, label: u.name }))]}
            className="flex min-w-48 flex-col gap-1"
          />
          <SelectField
            id="clearance-skill"
            name="skill"
            label="Skill"
            defaultValue={data.search.skill}
            options={[{ value: "", label: "All skills" }, ...data.skills.map((s) => ({ value: s.checklistId, label: s.name }))]}
            className="flex min-w-60 flex-col gap-1"
          />
          <FilterActions clearTo="/clearance" filtered={filtered} className="mb-7" />
          <Button type="button" className="mb-7" onClick={() => window.print()}>
            Print for the shift
          </Button>
        </Form>
      )}

      {data.problem ? (
        <p role="alert" className="mt-4 max-w-3xl rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3" data-testid="filter-problem">
          {data.problem}
        </p>
      ) : null}

      {data.boards.map((b, i) => (
        <UnitBoard key={b.unit.id} board={b} skills={data.shownSkills} first={i === 0} />
      ))}

      <p className="mt-8 hidden text-sm print:block">
        Printed from Tidemark for {data.orgName}: board as of {data.derivedAt} ({data.timeZone}). The board changes as records change; check Tidemark before
        relying on an older copy.
      </p>
      <CautionFooter />
    </>
  );
}

function Legend() {
  const meaning = {
    independent: "signed competent, and every requirement it depends on is met",
    supervised: "may do it with a cleared colleague or preceptor present",
    "not-cleared": "may not do it on this unit today",
  } as const;
  return (
    <section aria-labelledby="legend-heading" className="mt-4">
      <h2 id="legend-heading" className="sr-only">
        What the levels mean
      </h2>
      <ul className="flex flex-wrap gap-x-6 gap-y-1 text-sm">
        {CLEARANCE_LEVELS.map((level) => (
          <li key={level} className="flex items-center gap-2">
            <LevelMark level={level} /> <span className="text-muted">{meaning[level]}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}

function UnitBoard({ board, skills, first }: { board: Data["boards"][number]; skills: Data["shownSkills"]; first: boolean }) {
  const headingId = `unit-${board.unit.id}`;
  const counts = countLevels(board.people.flatMap((p) => p.cells));
  return (
    <section aria-labelledby={headingId} className={`mt-10 break-inside-avoid-page ${first ? "" : "print:break-before-page"} print:mt-4`} data-testid="unit-board" data-unit={board.unit.name}>
      <h2 id={headingId} className="text-2xl font-semibold">
        {board.unit.name}
      </h2>
      <p className="mt-1 text-sm text-muted" data-testid="unit-counts">
        {board.people.length} {board.people.length === 1 ? "person" : "people"} ·{" "}
        {CLEARANCE_LEVELS.map((l) => `${LEVEL_WORDS[l]} ${counts[l]}`).join(" · ")}
      </p>
      {board.people.length === 0 ? (
        <p className="mt-3">No therapists work on this unit.</p>
      ) : (
        <div className="mt-3 overflow-x-auto rounded-lg border border-rule bg-card print:overflow-visible print:border-0" role="region" aria-label={`${board.unit.name}: clearance table, scrolls sideways`} tabIndex={0}>
          <table className="w-full border-collapse text-left text-sm print:text-xs">
            <caption className="sr-only">
              Clearance on {board.unit.name}: one row per person, one column per skill; each cell gives the level and why
            </caption>
            <thead>
              <tr className="border-b border-rule text-muted">
                <th scope="col" className="sticky top-0 bg-card px-3 py-2 align-bottom">
                  Person
                </th>
                {skills.map((s) => (
                  <th key={s.checklistId} scope="col" className="sticky top-0 min-w-44 bg-card px-3 py-2 align-bottom print:min-w-0">
                    {s.name}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {board.people.map((p) => (
                <tr key={p.id} className="border-b border-rule align-top break-inside-avoid" data-testid="board-row" data-person={p.name}>
                  <th scope="row" className="px-3 py-2 font-semibold">
                    {p.name}
                    {p.title ? <span className="block text-xs font-normal text-muted">{p.title}</span> : null}
                    {p.homeUnitId !== board.unit.id ? <span className="block text-xs font-normal text-muted">Also works here</span> : null}
                  </th>
                  {skills.map((s) => {
                    const cell = p.cells.find((c) => c.checklistId === s.checklistId);
                    return (
                      <td key={s.checklistId} className="px-3 py-2" data-testid="board-cell" data-skill={s.name} data-level={cell?.level}>
                        {cell ? (
                          <>
                            <LevelMark level={cell.level} />
                            <span className="mt-0.5 block text-xs text-muted print:text-[0.65rem]">{cell.reason}</span>
                          </>
                        ) : null}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Clearance board · Tidemark" }];
