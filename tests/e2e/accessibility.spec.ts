/**
 * Every page passes axe-core with the WCAG 2.0, 2.1 and 2.2 A and AA rule tags and no violations
 * (shared/TESTING.md; issue 11, item 5), as each role that may open it.
 *
 * The list of pages is not written by hand: it is every route pattern of app/routes.ts whose
 * module draws a page (a default export, per the production build's manifest; PDF, CSV, JSON,
 * iCalendar, file and action-only routes are resource routes and draw none), crossed with the
 * five Kestrel Valley demo roles that the authorisation table (app/auth/route-access.ts) lets
 * open it, plus an anonymous visitor for the public pages. Parameters come from seeded ids
 * (tests/fixtures/route-params.ts, shared with the authorisation spec), the viewer's own record
 * where a route is scoped to its owner. A page route the plan leaves out fails the first test.
 *
 * Each role is one test: one signed-in browser context, every page scanned in turn. Then the
 * states a person meets that no address alone shows: field errors, a pending code, a wrong
 * code, our 403 and 404 pages.
 */
import type { BrowserContext, Page } from "@playwright/test";
import { ROUTE_ACCESS, type Access } from "../../app/auth/route-access";
import { can, isRole, type Role } from "../../app/auth/roles";
import { axeFindings, expectNoAxeViolations, type AxeFinding } from "../fixtures/axe";
import { personByEmail, rolesOf } from "../fixtures/e2e-db";
import { DEMO, type DemoKey } from "../fixtures/e2e-env";
import { readLatestCode } from "../fixtures/outbox";
import { publishPracticeExam } from "../fixtures/practice-exam";
import { builtRouteManifest } from "../fixtures/route-manifest";
import { concretePath, pageRoutes } from "../fixtures/route-params";
import { routePatterns, type RoutePattern } from "../fixtures/route-patterns";
import { askForCode, spareAddress, statusNote, typeCode, wrongCodeFor } from "../fixtures/sign-in-flow";
import { expect, test, type ConsoleGuard } from "../fixtures/test";

type Who = DemoKey | "anonymous";
const ROLE_ACCOUNTS = ["therapist", "preceptor", "educator", "manager", "admin"] as const satisfies DemoKey[];

/**
 * Pages whose record exists only for some people of the demo: the table opens the route to the
 * role, but the route is scoped to the record's owner (or their manager) and the demo gives this
 * role no such record, so it answers 404 — checked below, and the page is scanned as the roles
 * that have one. A stale entry (the role has a record after all) fails.
 */
const NO_RECORD_OF_THEIR_OWN: Record<string, { roles: DemoKey[]; reason: string }> = {
  "/credentials/certificates/:certificateId": {
    roles: ["preceptor", "educator"],
    reason: "only the demo therapist holds a certificate; its holder and their unit's manager open it",
  },
};

/** Addresses that come from a link on another page (the record depends on the viewer's units). */
const FROM_A_LINK: Record<string, { page: string; link: string }> = {
  "/team/people/:personId/requirements/:requirementId": { page: "/team/matrix", link: 'a[href^="/team/people/"]' },
};

/** Our own 404 page is the catch-all's answer. */
const expectedStatus = (pattern: string) => (pattern === "*" ? 404 : 200);

/** Whom a page is scanned as: anonymous for public pages; each role the table lets in otherwise. */
function opensFor(access: Access, who: Who, roles: Role[] | null): boolean {
  switch (access.who) {
    case "public":
    case "demo":
      // The same page for everyone (signed-in people are sent from /login to /today): scanned once, signed out.
      return who === "anonymous";
    case "signed-in":
      return roles !== null;
    case "token":
      return false;
    case "permission":
      return roles !== null && can(roles, access.permission);
  }
}

async function rolesOfAccount(who: Who): Promise<Role[] | null> {
  if (who === "anonymous") return null;
  return (await rolesOf((await personByEmail(DEMO[who])).id)).filter(isRole);
}

async function plan(who: Who, pages: RoutePattern[]): Promise<RoutePattern[]> {
  const roles = await rolesOfAccount(who);
  return pages.filter((p) => {
    const access = ROUTE_ACCESS[p.pattern];
    return access !== undefined && opensFor(access, who, roles);
  });
}

const EXAM_TITLE = "E2E accessibility: one question of each kind";

/**
 * The attempt pages open only for their examinee, and the demo accounts sit no seeded exam: each
 * role that takes exams starts one sitting of a practice exam with every kind of question and
 * hands it in (the result page), then starts another and leaves it open (the taking page).
 */
async function prepareOwnAttempts(page: Page, examId: string): Promise<void> {
  const start = async () => {
    await page.goto(`/exams/${examId}/start`);
    await page.getByRole("button", { name: /^(Start|Resume) the exam$/ }).click();
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
  };
  await start();
  await page.getByRole("button", { name: "Hand in the exam" }).click();
  await page.getByRole("button", { name: "Yes, hand it in" }).click();
  await expect(page).toHaveURL(/\/result$/);
  await start();
}

const pagesBuilt = pageRoutes();
test.use({ trace: "off" });

test("every page route of the build is in the scan plan, as someone who may open it", async () => {
  // The page routes are those the production build serves with a component.
  const manifest = builtRouteManifest();
  const flattened = new Set(routePatterns().map((p) => p.id));
  const servedPages = Object.values(manifest).filter((r) => r.hasDefaultExport && (r.path !== undefined || r.index) && r.id !== "root");
  expect(servedPages.filter((r) => !flattened.has(r.id)).map((r) => r.id), "pages the build serves that app/routes.ts flattening missed").toEqual([]);
  expect(pagesBuilt.length).toBeGreaterThan(40);

  const scanned = new Set<string>();
  for (const who of ["anonymous", ...ROLE_ACCOUNTS] as Who[]) for (const p of await plan(who, pagesBuilt)) scanned.add(p.pattern);
  const missing = pagesBuilt.map((p) => p.pattern).filter((p) => !scanned.has(p));
  expect(missing, "page routes no identity scans (no row in ROUTE_ACCESS, or no demo role may open them)").toEqual([]);
  for (const pattern of [...Object.keys(NO_RECORD_OF_THEIR_OWN), ...Object.keys(FROM_A_LINK)]) {
    expect(pagesBuilt.map((p) => p.pattern), `${pattern} is still a page route`).toContain(pattern);
  }
});

type Problem = { page: string; problem: string | AxeFinding[] };

async function scanEveryPage(who: Who, context: BrowserContext, consoleGuard: ConsoleGuard): Promise<{ scanned: number; problems: Problem[]; slowest: string }> {
  const page = await context.newPage();
  consoleGuard.watch(page);
  const problems: Problem[] = [];
  let scanned = 0;
  const took: [string, number][] = [];
  const viewer = who === "anonymous" ? undefined : who;
  for (const route of await plan(who, pagesBuilt)) {
    const began = Date.now();
    const exception = viewer ? NO_RECORD_OF_THEIR_OWN[route.pattern] : undefined;
    const link = FROM_A_LINK[route.pattern];
    let path: string;
    if (link) {
      await page.goto(link.page);
      const href = await page.locator(link.link).first().getAttribute("href");
      if (!href) {
        problems.push({ page: route.pattern, problem: `no link to it on ${link.page}` });
        continue;
      }
      path = href;
    } else {
      path = await concretePath(route.pattern, "kestrel-valley", viewer);
    }
    const status = exception?.roles.includes(viewer!) ? 404 : expectedStatus(route.pattern);
    if (status === 404) consoleGuard.allow(statusNote(404));
    const response = await page.goto(path);
    if (response?.status() !== status) {
      problems.push({ page: `${route.pattern} (${path})`, problem: `answered ${response?.status()}, expected ${status}${exception ? ` (${exception.reason})` : ""}` });
      continue;
    }
    if (exception?.roles.includes(viewer!)) continue;
    await page.waitForLoadState("networkidle");
    const findings = await axeFindings(page);
    scanned++;
    took.push([route.pattern, Date.now() - began]);
    if (findings.length > 0) problems.push({ page: `${route.pattern} (${path})`, problem: findings });
  }
  await page.close();
  const slowest = took
    .sort((a, b) => b[1] - a[1])
    .slice(0, 3)
    .map(([p, ms]) => `${p} ${(ms / 1000).toFixed(1)} s`)
    .join(", ");
  return { scanned, problems, slowest };
}

for (const who of ["anonymous", ...ROLE_ACCOUNTS] as Who[]) {
  test(`axe: every page ${who === "anonymous" ? "a signed-out visitor" : `the ${who}`} may open`, async ({ browser, signInAs, consoleGuard }) => {
    // Dozens of pages in one test: generous on a loaded 2-core machine; no trace of every page
    // (a failure lists each page's rules and nodes instead).
    test.setTimeout(360_000);
    const context = await browser.newContext();
    try {
      if (who !== "anonymous") {
        await signInAs(who, context);
        if (can((await rolesOfAccount(who)) ?? [], "section:exams")) {
          const page = await context.newPage();
          consoleGuard.watch(page);
          await prepareOwnAttempts(page, await publishPracticeExam(EXAM_TITLE, { minutes: 60, types: ["single", "multiple", "numeric", "ordering", "waveform-point"] }));
          await page.close();
        }
      }
      const planned = (await plan(who, pagesBuilt)).length;
      const { scanned, problems, slowest } = await scanEveryPage(who, context, consoleGuard);
      test.info().annotations.push({ type: "pages scanned", description: `${scanned} of ${planned} planned as ${who}; slowest: ${slowest}` });
      console.log(`axe as ${who}: ${scanned} of ${planned} pages scanned; slowest: ${slowest}`);
      expect(problems, `pages with axe violations or the wrong answer, as ${who}`).toEqual([]);
      expect(scanned).toBeGreaterThan(0);
    } finally {
      await context.close();
    }
  });
}

// States no address alone shows.

test("axe: sign-in with a field error", async ({ newGuardedPage }) => {
  const page = await newGuardedPage();
  await page.goto("/login");
  await page.getByLabel("Work e-mail").fill("not-an-address");
  await page.getByRole("button", { name: "Send me a code" }).click();
  await expect(page.getByLabel("Work e-mail")).toHaveAttribute("aria-invalid", "true");
  await expectNoAxeViolations(page, "sign-in with a field error");
});

test("axe: sign-in link that is not valid", async ({ newGuardedPage }) => {
  const page = await newGuardedPage();
  await page.goto("/login/magic?t=not-a-token");
  await expect(page.getByRole("alert")).toContainText("not valid");
  await expectNoAxeViolations(page, "sign-in link that is not valid");
});

test("axe: code entry with a pending code, then with a wrong-code message", async ({ newGuardedPage, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  const page = await newGuardedPage();
  const email = await spareAddress("axe-code-page");
  const mark = await askForCode(page, email);
  await expectNoAxeViolations(page, "code entry with a pending code");
  await typeCode(page, wrongCodeFor(await readLatestCode(email, mark)));
  await expect(page.getByLabel("6-digit code")).toHaveAttribute("aria-invalid", "true");
  await expectNoAxeViolations(page, "code entry with a wrong-code message");
});

for (const state of [
  { name: "403 page (therapist opening Admin)", path: "/admin", status: 403 },
  { name: "404 page, signed in", path: "/no-such-page-e2e", status: 404 },
]) {
  test(`axe: ${state.name}`, async ({ newGuardedPage, signInAs, consoleGuard }) => {
    consoleGuard.allow(statusNote(state.status));
    const page = await newGuardedPage();
    await signInAs("therapist", page.context());
    const response = await page.goto(state.path);
    expect(response?.status()).toBe(state.status);
    await expectNoAxeViolations(page, state.name);
  });
}
