/**
 * The cut-score page as the server renders it from its real loader (issue 6, item 3): the
 * method explained, a labelled percent field per item with its topic, the round selector and
 * round 2's link to the item analysis, the panel table and spread, the adopt button with the
 * rounded cut and the current pass mark, and the per-form explanation. Server rendering only:
 * no Playwright test or axe scan of this page here.
 */
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { saveRatings } from "~/db/queries/angoff.server";
import { createExam, publishExam } from "~/db/queries/exams-authoring.server";
import * as cutRoute from "~/routes/bank/exam-cut-score";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";
import { type ArgsOf } from "./admin-harness";

let educator: Viewer;
let second: Viewer;
let examId = "";

async function render(viewer: Viewer, path: string): Promise<string> {
  const params = { examId };
  const data = await cutRoute.loader(args<ArgsOf<typeof cutRoute.loader>>(getRequest(path), viewer, params));
  const Page = cutRoute.default as unknown as (props: Record<string, unknown>) => React.ReactElement;
  const Component = () => <Page loaderData={data} actionData={undefined} params={params} matches={[]} />;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component }]);
  const context = await handler.query(new Request(`http://localhost${path}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

beforeAll(async () => {
  await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  // A second educator made up in memory from the manager (the page only needs a second judge).
  second = { ...(await viewerFor("manager@kestrelvalley.test")), roles: ["educator"] };
  examId = await createExam(educator.org.id, educator.person.id, {
    title: "Trigger variables check",
    description: null,
    blueprint: { topics: { "trigger-variables": 2 } },
    timeLimitMinutes: null,
    passMarkPercent: 80,
    attemptsAllowed: 2,
    shuffleItems: true,
    shuffleOptions: true,
    reviewPolicy: "score-and-topics",
    multipleResponseScoring: "all-or-nothing",
    orderingScoring: "exact",
    availableFrom: null,
    availableUntil: null,
  });
  await publishExam(educator.org.id, educator.person.id, examId);
});

describe("the cut-score page", () => {
  it("explains the method and draws a labelled percent field per item, with its topic", async () => {
    const html = await render(educator, `/bank/exams/${examId}/cut-score`);
    expect(html).toContain("Livingston and Zieky");
    expect(html).toContain("Coscarelli and colleagues, 2006");
    expect(html).toContain("Tidemark grades every form against the adopted pass mark");
    const fields = [...html.matchAll(/<label for="([^"]+)"[^>]*>Item (\d+) \(%\): [^<]+<\/label><p id="\1-hint"[^>]*>([^<]+)<\/p><input[^>]*inputMode="decimal"/g)];
    expect(fields.length).toBeGreaterThanOrEqual(2);
    for (const f of fields) expect(f[3]).toContain("Trigger variables");
    expect(html).toMatch(/<a[^>]*aria-current="page"[^>]*>Round 1<\/a>/);
    expect(html).toContain("Nobody has rated these items yet.");
    expect(html).not.toContain("as the pass mark</button>");
  });

  it("shows each judge's cut, the spread, and offers to adopt the rounded cut beside the current pass mark", async () => {
    const html0 = await render(educator, `/bank/exams/${examId}/cut-score`);
    const ids = [...html0.matchAll(/name="rating\.([^"]+)"/g)].map((m) => m[1]);
    // Every item at 70 % by one judge and 75 % by the other: panel 72.5 % (Livingston & Zieky 1982, mean of the judges' sums).
    await saveRatings(educator.org.id, educator.person.id, examId, { round: 1, ratings: Object.fromEntries(ids.map((id) => [id, 0.7])) });
    await saveRatings(educator.org.id, second.person.id, examId, { round: 1, ratings: Object.fromEntries(ids.map((id) => [id, 0.75])) });
    const html = await render(educator, `/bank/exams/${examId}/cut-score`);
    expect(html).toMatch(/<caption[^>]*>The panel: each judge&#x27;s cut<\/caption>/);
    expect(html).toContain("72.50 %");
    expect(html).toContain("dividing by N");
    expect(html).toContain("80 % (version 1)");
    expect(html).toContain("Adopt 72.5 % as the pass mark</button>");
    // The judge's own ratings fill the form.
    expect(html).toMatch(new RegExp(`name="rating\\.${ids[0]}"[^>]*value="70"|value="70"[^>]*name="rating\\.${ids[0]}"`));
  });

  it("round 2 links to the item analysis and starts from the judge's round-1 ratings", async () => {
    const html = await render(educator, `/bank/exams/${examId}/cut-score?round=2`);
    expect(html).toMatch(/<a[^>]*aria-current="page"[^>]*>Round 2 \(after the item statistics\)<\/a>/);
    expect(html).toContain(`href="/bank/exams/${examId}/analysis"`);
    expect(html).toContain('value="70"');
    expect(html).toContain("Save my round-2 ratings");
  });
});
