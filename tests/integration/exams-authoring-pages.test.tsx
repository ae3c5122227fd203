/**
 * The exam authoring pages as the server renders them, from their real loaders: the list, the
 * shared exam form (new and edit) with every field labelled and the bank's supply beside each
 * topic, and the exam page with its settings, feasibility warning, version history, assign panel
 * and open assignments. Server rendering only: no Playwright test or axe scan of these pages yet.
 */
import { eq } from "drizzle-orm";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { loadPool } from "~/db/queries/exam-pool.server";
import { exams } from "~/db/schema";
import * as editRoute from "~/routes/bank/exam-edit";
import * as newRoute from "~/routes/bank/exam-new";
import * as examRoute from "~/routes/bank/exam";
import * as listRoute from "~/routes/bank/exams";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";
import { type ArgsOf } from "./admin-harness";

let db: Database;
let educator: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
});

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a route module of any shape
async function render(route: { loader: (a: any) => Promise<unknown>; default: unknown }, path: string, params: Record<string, string> = {}): Promise<string> {
  const data = await route.loader(args<ArgsOf<typeof route.loader>>(getRequest(path), educator, params));
  const Page = route.default as unknown as (props: Record<string, unknown>) => React.ReactElement;
  const Component = () => <Page loaderData={data} actionData={undefined} params={params} matches={[]} />;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component }]);
  const context = await handler.query(new Request(`http://localhost${path}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

describe("the exam authoring pages", () => {
  it("the list links to each exam and to writing one", async () => {
    const html = await render(listRoute, "/bank/exams");
    expect(html).toContain('href="/bank/exams/new"');
    expect(html).toContain("Write an exam");
    expect(html).toContain("Annual ventilation modes exam");
    expect(html).toMatch(/<caption[^>]*>Exams of the bank<\/caption>/);
    expect(html).toMatch(/<th scope="col"[^>]*>Open assignments<\/th>/);
  });

  it("the new-exam form labels every field and shows the bank's published items per topic", async () => {
    const html = await render(newRoute, "/bank/exams/new");
    const pool = await loadPool(db.db, educator.org.id);
    const modes = pool.filter((p) => p.topics.includes("modes")).length;
    expect(html).toMatch(/<label for="([^"]+)"[^>]*>Modes<\/label>[\s\S]*?<p id="\1-hint"[^>]*>[^<]*?(\d+) published items?/);
    expect(html).toContain(`${modes} published item`);
    for (const label of ["Title", "Description", "Time limit (minutes)", "Pass mark (%)", "Attempts allowed", "After submitting, the therapist sees", "Multiple-response items", "Ordering items", "Available from", "Available until", "Easy (%)"]) {
      expect(html).toMatch(new RegExp(`<label for="[^"]+"[^>]*>${label.replace(/[()%]/g, "\\$&")}</label>`));
    }
    expect(html).toContain("Score and topic subscores");
    expect(html).toContain("Full rationale for every item");
    expect(html).toMatch(/<details[\s\S]*<summary[^>]*>Fixed items: asked in every attempt \(0 chosen\)<\/summary>[\s\S]*<input type="checkbox"[^>]*name="fixed"/);
    expect(html).toMatch(/<input type="checkbox"(?=[^>]*name="shuffleItems")(?=[^>]*checked="")[^>]*>/);
  });

  it("the edit form starts from the latest version's values", async () => {
    const [annual] = await db.db.select({ id: exams.id }).from(exams).where(eq(exams.title, "Annual ventilation modes exam"));
    const html = await render(editRoute, `/bank/exams/${annual.id}/edit`, { examId: annual.id });
    expect(html).toContain("Saving makes version 2");
    expect(html).toMatch(/name="topics\.modes"[^>]*value="6"|value="6"[^>]*name="topics\.modes"/);
    expect(html).toMatch(/name="timeLimitMinutes"[^>]*value="30"|value="30"[^>]*name="timeLimitMinutes"/);
  });

  it("the exam page shows the live version, its blueprint, history, the assign panel and open assignments", async () => {
    const [annual] = await db.db.select({ id: exams.id }).from(exams).where(eq(exams.title, "Annual ventilation modes exam"));
    const html = await render(examRoute, `/bank/exams/${annual.id}`, { examId: annual.id });
    expect(html).toContain("Live: version 1");
    expect(html).toMatch(/<caption[^>]*>Blueprint<\/caption>/);
    expect(html).toMatch(/<caption[^>]*>Version history<\/caption>/);
    expect(html).toMatch(/<legend[^>]*>Assign to<\/legend>/);
    expect(html).toMatch(/<label for="[^"]+"[^>]*>Due date<\/label>/);
    expect(html).toMatch(/Open assignments \(\d+\)/);
    expect(html).toContain("Retire");
  });
});
