import { renderToStaticMarkup } from "react-dom/server";
import { MemoryRouter } from "react-router";
import { describe, expect, it } from "vitest";
import type { TeamRow } from "~/db/queries/team.server";
import { parseTeamSearch, sortHref, teamHref } from "./search-params";
import { TeamTable } from "./team-table";

const row: TeamRow = {
  id: "p1",
  name: "Ada Example",
  email: "ada@example.test",
  employeeId: "E-1",
  title: "Respiratory Therapist I",
  hireDate: "2026-03-31",
  active: true,
  homeUnit: "Emergency",
  otherUnits: ["Adult ICU"],
  roles: ["therapist", "preceptor"],
  credentials: { lapsed: 2, dueSoon: 1, current: 3, waived: 0 },
};

function render(search: string): string {
  return renderToStaticMarkup(
    <MemoryRouter>
      <TeamTable rows={[row]} query={parseTeamSearch(new URLSearchParams(search))} scopeLabel="People of your units" />
    </MemoryRouter>,
  );
}

describe("the Team ledger", () => {
  // WAI-ARIA 1.2 "aria-sort": set on the one sorted header only.
  it("marks only the sorted column with aria-sort, in its direction", () => {
    const html = render("sort=hire&dir=desc");
    expect(html.match(/aria-sort="[a-z]+"/g)).toEqual(['aria-sort="descending"']);
    expect(html).toMatch(/<th[^>]*aria-sort="descending"[^>]*><a[^>]*href="\/team\?sort=hire"[^>]*>Hire date/);
    expect(html).toContain("<caption");
    expect(html).toContain("sorted by hire date, descending");
  });

  it("writes the hire date as a calendar date without a time-zone shift, and right-aligns the counts", () => {
    const html = render("");
    expect(html).toContain('<time dateTime="2026-03-31">31 Mar 2026</time>');
    expect(html).toMatch(/text-right[^"]*">2<\/td>/);
  });

  it("header links flip the direction of the sorted column and start others in their own direction", () => {
    const q = parseTeamSearch(new URLSearchParams("q=ada&sort=name"));
    expect(sortHref(q, "name")).toBe("/team?q=ada&dir=desc");
    expect(sortHref(q, "lapsed")).toBe("/team?q=ada&sort=lapsed");
    expect(teamHref({ ...q, page: 3 })).toBe("/team?q=ada&page=3");
  });
});
