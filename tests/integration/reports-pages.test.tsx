/**
 * The report pages as the server renders them from their real loaders (issue 9 §4, §5), for a
 * manager of the demo organisation: each page draws without error, a refused date is shown beside
 * its field (aria-invalid, described by the message), the trend chart carries its text
 * alternative, and Team shows the same trend. Server rendering only: the browser and axe are in
 * tests/e2e/reports.spec.ts.
 */
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import * as completionsPage from "~/routes/reports/completions";
import * as compliancePage from "~/routes/reports/compliance";
import * as expiriesPage from "~/routes/reports/expiries";
import * as indexPage from "~/routes/reports/index";
import * as packetPage from "~/routes/reports/packet";
import * as teamPage from "~/routes/team/index";
import { args, getRequest } from "../setup/request";
import { dayOffset, useTodayPlanTeamWorld } from "./today-plan-team-harness";

const world = useTodayPlanTeamWorld();

type AnyRoute = { loader: (a: never) => Promise<unknown>; default: unknown };

async function render(route: AnyRoute, viewer: Viewer, path: string): Promise<string> {
  const data = await route.loader(args<never>(getRequest(path), viewer));
  const Page = route.default as unknown as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component: Page }]);
  const context = await handler.query(new Request(`http://localhost${path}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

describe("report pages", () => {
  it("the overview lists the reports and draws the trend with its caption and table", async () => {
    const html = await render(indexPage as unknown as AnyRoute, world.viewers.manager, "/reports");
    for (const title of ["Compliance by unit on a chosen day", "Expiries and due dates", "Completions", "Survey evidence packet"]) expect(html).toContain(title);
    expect(html).toMatch(/<svg[^>]*role="img"[^>]*aria-labelledby="[^"]+-caption"/);
    expect(html).toContain("% Current per unit at each month end");
    expect(html).toContain('<time dateTime="2026-11-30">30 Nov 2026</time>');
    expect(html).toContain("licensed clinical judgement");
  });

  it("compliance shows the table for a past day, and a refused date beside its field", async () => {
    const ok = await render(compliancePage as unknown as AnyRoute, world.viewers.manager, `/reports/compliance?on=${dayOffset(-30)}`);
    expect(ok).toContain(`Compliance by unit as recorded by the end of ${dayOffset(-30)}`);
    expect(ok).toContain(`/reports/compliance.csv?on=${dayOffset(-30)}`);
    const refused = await render(compliancePage as unknown as AnyRoute, world.viewers.manager, `/reports/compliance?on=${dayOffset(5)}`);
    const input = /<input[^>]*id="report-on"[^>]*>/.exec(refused)?.[0] ?? "";
    expect(input).toContain('aria-invalid="true"');
    expect(input).toMatch(/aria-describedby="[^"]*report-on-error"/);
    expect(input).toContain(`value="${dayOffset(5)}"`);
    expect(refused).toMatch(/id="report-on-error"[^>]*>.*Choose today \(2026-12-02\) or an earlier day/);
    expect(refused).not.toContain("Download CSV");
  });

  it("expiries, completions and the packet page draw their lists", async () => {
    const expiries = await render(expiriesPage as unknown as AnyRoute, world.viewers.manager, "/reports/expiries");
    expect(expiries).toContain(`Expiries and due dates from 2026-12-02 to ${dayOffset(90)}`);
    const wrongWay = await render(expiriesPage as unknown as AnyRoute, world.viewers.manager, `/reports/expiries?from=2026-12-02&to=2026-01-01`);
    expect(wrongWay).toMatch(/id="report-to-error"[^>]*>.*The last day must be on or after the first day/);
    const completions = await render(completionsPage as unknown as AnyRoute, world.viewers.educator, `/reports/completions?from=${dayOffset(-365)}`);
    expect(completions).toContain("Completions by exam or checklist");
    const packet = await render(packetPage as unknown as AnyRoute, world.viewers.manager, `/reports/packet?q=${encodeURIComponent(world.viewers.therapist.person.name)}`);
    expect(packet).toContain(`/reports/packet.pdf?person=${world.viewers.therapist.person.id}`);
    expect(packet).toContain(`packet for ${world.viewers.therapist.person.name}`);
  });

  it("Team streams the compliance trend after the page: a placeholder first, then the trend", async () => {
    // renderToString cannot wait for the streamed part; the browser spec (reports.spec.ts) sees the chart.
    const html = await render(teamPage as unknown as AnyRoute, world.viewers.manager, "/team");
    expect(html).toContain("Working out the past 12 months");
    const data = (await teamPage.loader(args(getRequest("/team"), world.viewers.manager) as never)) as { trend: Promise<{ monthEnds: string[]; series: unknown[] }> };
    const trend = await data.trend;
    expect(trend.monthEnds).toHaveLength(12);
    expect(trend.series.length).toBeGreaterThan(0);
  });
});
