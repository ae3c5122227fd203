/**
 * The My calendar page as the server renders it from its real loader (issue 10 §3). Server
 * rendering only; the browser, axe and the ask-twice interaction belong to Playwright.
 */
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import * as calendarPage from "~/routes/plan/calendar";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";

beforeAll(async () => {
  await useSeededDatabase();
});

async function render(email: string): Promise<{ html: string; data: Awaited<ReturnType<typeof calendarPage.loader>> }> {
  const data = await calendarPage.loader(args<never>(getRequest("/plan/calendar"), await viewerFor(email)));
  const Page = calendarPage.default as unknown as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component: Page }]);
  const context = await handler.query(new Request("http://localhost/plan/calendar"));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return { html: renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", ""), data };
}

describe("My calendar page", () => {
  it("shows a therapist their own private address with a labelled, read-only field and a reset, and no units feed", async () => {
    const { html, data } = await render("therapist@kestrelvalley.test");
    expect(html).toContain(`value="${data.person.address}"`);
    expect(html).toMatch(/<label for="person-feed-address"[^>]*>Private address<\/label>/);
    expect(html).toContain("readOnly");
    expect(html).toContain("Reset the address");
    expect(html).toContain("America/Chicago");
    expect(html).not.toContain("Expiries in my units");
  });

  it("shows a manager a second address for their units' expiries, with its own reset", async () => {
    const { html, data } = await render("manager@kestrelvalley.test");
    expect(data.units).not.toBeNull();
    expect(html).toContain("Expiries in my units");
    expect(html).toContain(`value="${data.units!.address}"`);
    expect(html).toContain("next 180 days");
    expect(html.match(/Reset the address/g)).toHaveLength(2);
  });
});
