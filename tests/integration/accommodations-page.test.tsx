/**
 * The /team/accommodations page as the server renders it, from its real loader: the plain-language
 * explanation, the grant form's fields (each labelled), and the table with a revoke button only
 * for adjustments in force. Server rendering only: no Playwright test or axe scan of this page yet.
 */
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { grantAccommodation, revokeAccommodation } from "~/db/queries/accommodations.server";
import * as route from "~/routes/team/accommodations";
import { args, getRequest } from "../setup/request";
import { useTodayPlanTeamWorld } from "./today-plan-team-harness";

type LoaderArgs = Parameters<typeof route.loader>[0];

const world = useTodayPlanTeamWorld();

async function render(viewer: Viewer): Promise<string> {
  const data = await route.loader(args<LoaderArgs>(getRequest("/team/accommodations"), viewer));
  const Page = route.default as unknown as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "accommodations", path: "/team/accommodations", loader: () => data, Component: Page }]);
  const context = await handler.query(new Request("http://localhost/team/accommodations"));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  // React separates adjacent text with empty comments; drop them so the text reads as on screen.
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

describe("the accommodations page", () => {
  it("explains extra time in plain words and labels every field of the grant form", async () => {
    const html = await render(world.viewers.manager);
    expect(html).toContain("<h1");
    expect(html).toContain("1.5 gives half as long again");
    expect(html).toContain("warns the person before their time runs out");
    expect(html).toContain("never ends early because the person&#x27;s sign-in session ends");
    // Person select, labelled and bound by id, with "Name — unit" options.
    expect(html).toMatch(/<label for="([^"]+)"[^>]*>Person<\/label>[\s\S]*<select[^>]*id="\1"/);
    expect(html).toContain(`${world.viewers.therapist.person.name} — `);
    // The kind as two radios in a fieldset with a legend; extra time chosen by default.
    expect(html).toMatch(/<fieldset[\s\S]*<legend[^>]*>What to give<\/legend>/);
    expect(html).toMatch(/<input type="radio"[^>]*name="kind" checked="" value="multiplier"/);
    expect(html).toMatch(/<input type="radio"[^>]*name="kind" value="untimed"/);
    expect(html).toContain("Extra time");
    expect(html).toContain("No time limit");
    // The multiplier: a number with a 0.25 step and its hint tied to it.
    expect(html).toMatch(/<input[^>]*type="number"[^>]*step="0.25"[^>]*max="10"/);
    expect(html).toContain("1.5 = half as long again; up to 10.");
    expect(html).toMatch(/<textarea[^>]*name="reason"/);
    expect(html).toContain("Ends after (optional)");
  });

  it("lists adjustments: a revoke button for those in force, who revoked and when for the others", async () => {
    const manager = world.viewers.manager;
    const orgId = manager.org.id;
    const person = world.viewers.therapist.person;
    await grantAccommodation(orgId, manager.person.id, { personId: person.id, kind: "multiplier", multiplier: 2, reason: "Processing speed, per assessment", endsOn: null });
    const gone = await grantAccommodation(orgId, manager.person.id, { personId: person.id, kind: "untimed", multiplier: null, reason: "Short-term, now over", endsOn: null });
    expect(await revokeAccommodation(orgId, manager.person.id, gone)).toBe(true);
    const html = await render(manager);
    expect(html).toContain("2 × the time limit");
    expect(html).toContain("Processing speed, per assessment");
    expect(html).toContain("Until revoked");
    expect(html).toContain(`Revoke for ${person.name}`);
    expect(html.match(/data-state="in-force"/g)).toHaveLength(1);
    expect(html).toMatch(/data-state="revoked"[\s\S]*Revoked [0-9]{1,2} Dec 2026[\s\S]*by /);
  });
});
