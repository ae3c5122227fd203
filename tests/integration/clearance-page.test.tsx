/**
 * The /clearance page as the server renders it, from its real loader: levels as words with a
 * shape (PRODUCT.md: never colour alone), the reason in every cell, the date and time the board
 * was derived, a "Print for the shift" button with the filter form kept off paper, and the usual
 * caution. The page in a browser (and its axe scan) is tests/e2e/clearance.spec.ts.
 */
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Viewer } from "~/auth/context";
import { CAUTION_TEXT } from "~/components/caution";
import * as route from "~/routes/clearance/index";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";

type LoaderArgs = Parameters<typeof route.loader>[0];

let therapist: Viewer;
let manager: Viewer;

beforeAll(async () => {
  await useSeededDatabase();
  vi.useFakeTimers({ toFake: ["Date"] });
  // 13:05 in Chicago (UTC−6 in December).
  vi.setSystemTime(new Date(`${TEST_TODAY}T19:05:00Z`));
  therapist = await viewerFor("therapist@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
});

afterAll(() => {
  vi.useRealTimers();
});

async function render(viewer: Viewer, search = ""): Promise<string> {
  const data = await route.loader(args<LoaderArgs>(getRequest(`/clearance${search}`), viewer));
  const Page = route.default as unknown as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "clearance", path: "/clearance", loader: () => data, Component: Page }]);
  const context = await handler.query(new Request(`http://localhost/clearance${search}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

const text = (html: string) => html.replace(/<[^>]+>/g, " ").replace(/&#x27;/g, "'").replace(/\s+/g, " ");

describe("the Clearance board page", () => {
  it("shows the day, the time the board was derived, the print button and the caution", async () => {
    const html = await render(therapist);
    const words = text(html);
    expect(words).toContain("Wednesday 2 December 2026");
    expect(words).toMatch(/board as of 2 Dec 2026, 13:05 \(America\/Chicago\)/);
    expect(words).toContain("Print for the shift");
    expect(words).toContain(CAUTION_TEXT);
    // The filter form and the button stay off paper; the printed-from line only appears on paper.
    expect(html).toMatch(/<form[^>]*class="[^"]*print:hidden/);
    expect(html).toMatch(/class="[^"]*hidden[^"]*print:block[^"]*">Printed from Tidemark/);
  });

  it("every cell carries a level word beside its shape, and a reason", async () => {
    const html = await render(manager);
    const cells = [...html.matchAll(/<td[^>]*data-testid="board-cell"[^>]*>([\s\S]*?)<\/td>/g)].map((m) => m[1]);
    expect(cells.length).toBeGreaterThan(100);
    for (const cell of cells) {
      expect(cell).toMatch(/<svg[^>]*aria-hidden="true"/);
      expect(text(cell)).toMatch(/^ ?(Independent|Supervised|Not cleared) .{10,}/);
    }
    // The demo shows all three levels.
    for (const level of ["independent", "supervised", "not-cleared"]) expect(html).toContain(`data-level="${level}"`);
  });

  it("says plainly when a filter names a unit the viewer cannot see", async () => {
    const words = text(await render(therapist, "?unit=not-a-unit"));
    expect(words).toContain("That unit is not one whose board you can see.");
    expect(words).not.toContain("Also works here");
  });
});
