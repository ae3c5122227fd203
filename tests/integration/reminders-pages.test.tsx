/**
 * Admin → Reminders and My plan → Reminders as the server renders them from their real loaders
 * (issue 9 §1). Server rendering only; the browser and axe belong to Playwright
 * (tests/e2e/reminders.spec.ts).
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runReminders } from "~/db/queries/reminder-job.server";
import * as adminPage from "~/routes/admin/reminders";
import * as planPage from "~/routes/plan/reminders";
import { startMailFake, type MailFake } from "../../tools/mail-fake/mail-fake";
import { TEST_TODAY, useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";

let fake: MailFake;
beforeAll(async () => {
  await useSeededDatabase();
  fake = await startMailFake({ port: 0, dataDir: mkdtempSync(path.join(tmpdir(), "tidemark-reminder-pages-")) });
  const mail = { settings: { mailTransport: "resend" as const, resendApiKey: "re_test_key", resendBaseUrl: fake.url, smtpUrl: "smtp://127.0.0.1:1", mailFrom: "Tidemark <no-reply@tidemark.test>" } };
  await runReminders({ now: new Date(`${TEST_TODAY}T15:00:00Z`), trigger: "test", mail, publicUrl: "http://localhost:3000" });
});
afterAll(async () => {
  await fake.close();
});

async function render(module: { loader: (a: never) => Promise<unknown>; default: unknown }, pathname: string, email: string): Promise<string> {
  const data = await module.loader(args<never>(getRequest(pathname), await viewerFor(email)));
  const Page = module.default as () => React.ReactElement;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component: Page }]);
  const context = await handler.query(new Request(`http://localhost${pathname}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

describe("Admin → Reminders", () => {
  it("shows the seeded policy in labelled fields, the job's last run and the reminders it sent", async () => {
    const html = await render(adminPage as never, "/admin/reminders", "admin@kestrelvalley.test");
    expect(html).toMatch(/<label for="[^"]+"[^>]*>Days before the date<\/label>/);
    expect(html).toContain('value="90, 60, 30, 14, 7"');
    expect(html).toContain('value="12, 6"');
    for (const name of ["onTheDay", "weeklyWhileLapsed", "managerDigest"]) {
      expect(html).toMatch(new RegExp(`<input type="checkbox" id="reminder-policy-${name}"[^>]* name="${name}" checked=""/>`));
      expect(html).toMatch(new RegExp(`<label for="reminder-policy-${name}">`));
    }
    expect(html).toContain("Last runs of the reminder job");
    expect(html).toContain("2 Dec 2026");
    expect(html).toContain("weekly while lapsed (week 49 of 2026)");
    expect(html).toContain("Harriet Valdivia, week 2026-W49");
  });
});

describe("My plan → Reminders", () => {
  it("shows the therapist their choice as a labelled radio group and the reminders sent to them", async () => {
    const html = await render(planPage as never, "/plan/reminders", "therapist@kestrelvalley.test");
    expect(html).toContain("<legend");
    const radios = html.match(/<input type="radio"[^>]*>/g) ?? [];
    expect(radios).toHaveLength(2);
    expect(radios.find((r) => r.includes('value="each"'))).toContain('checked=""');
    expect(radios.find((r) => r.includes('value="digest"'))).not.toContain("checked");
    expect(html).toContain("One daily digest");
    expect(html).toContain("therapist@kestrelvalley.test");
    expect(html).toContain("Reminders sent to you");
    expect(html).not.toContain("None yet.");
  });
});
