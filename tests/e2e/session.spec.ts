/**
 * Sessions and the edges around them, in chromium against the production build: sign-out
 * ends the session on the server, a tampered cookie signs out cleanly, roles gate sections,
 * cross-site writes are refused, bad e-mail input is explained beside the field, the health
 * check answers, and the demo outbox shows the mail. OWASP ASVS 4.0.3 V3.3.1 (logout
 * invalidates the session), V3.4 (cookie attributes), V4.2.2 (cross-site request defence).
 */
import { request as playwrightRequest } from "@playwright/test";
import { insertSession, one, sessionRow } from "../fixtures/e2e-db";
import { APP_URL } from "../fixtures/e2e-env";
import { latestMessageTo, readLatestCode } from "../fixtures/outbox";
import { SESSION_COOKIE, sessionCookieFor, signedSessionValue } from "../fixtures/session-cookie";
import { askForCode, spareAddress, statusNote } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

test.describe("sign-out", () => {
  test("is a POST from the shell; afterwards the old cookie no longer opens Today", async ({ page, signInAs, newGuardedPage }) => {
    const { sessionId, cookieValue, person } = await signInAs("therapist");
    await page.goto("/today");
    await expect(page.getByRole("banner")).toContainText(person.name);

    // A GET (a link, a prefetch, an image) must never end a session.
    await page.goto("/logout");
    await expect(page).toHaveURL(/\/today$/);
    expect((await sessionRow(sessionId))?.ended_at).toBeNull();

    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/login");
    await expect(page.getByRole("status")).toHaveText("You are signed out.");
    expect((await page.context().cookies()).filter((c) => c.name === SESSION_COOKIE)).toEqual([]);
    expect((await sessionRow(sessionId))?.ended_at, "the session is ended on the server").not.toBeNull();

    // The copied cookie, replayed in another browser, is worth nothing now.
    const other = await newGuardedPage();
    await other.context().addCookies([sessionCookieFor(cookieValue)]);
    await other.goto("/today");
    await expect(other).toHaveURL(/\/login\?next=%2Ftoday$/);
    await expect(other.getByRole("heading", { name: "Sign in to Tidemark" })).toBeVisible();
  });
});

test("a tampered session cookie sends the person to sign-in cleanly and clears the cookie", async ({ page, signInAs }) => {
  const { cookieValue } = await signInAs("manager");
  // Change the first character of the signature (all six of its bits count; the last one of
  // an unpadded base64 string may carry only unused bits): the id parses, the signature fails.
  const dot = cookieValue.lastIndexOf(".");
  const first = cookieValue[dot + 1] === "A" ? "Q" : "A";
  const tampered = `${cookieValue.slice(0, dot + 1)}${first}${cookieValue.slice(dot + 2)}`;
  expect(tampered).not.toBe(cookieValue);
  await page.context().clearCookies();
  await page.context().addCookies([sessionCookieFor(tampered)]);

  const response = await page.goto("/team");
  await expect(page).toHaveURL(/\/login\?next=%2Fteam$/);
  expect(response?.status()).toBe(200);
  await expect(page.getByRole("heading", { name: "Sign in to Tidemark" })).toBeVisible();
  expect((await page.context().cookies()).filter((c) => c.name === SESSION_COOKIE), "the bad cookie is removed").toEqual([]);
});

test.describe("role gating", () => {
  for (const path of ["/admin", "/team", "/admin/people"]) {
    test(`a therapist opening ${path} gets our 403 page`, async ({ page, signInAs, consoleGuard }) => {
      consoleGuard.allow(statusNote(403));
      await signInAs("therapist");
      const response = await page.goto(path);
      expect(response?.status()).toBe(403);
      await expect(page.getByRole("heading", { level: 1 })).toHaveText("This page is not part of your roles");
      await expect(page.getByText("Error 403")).toBeVisible();
      await expect(page.getByRole("link", { name: "Go to Today" })).toBeVisible();
      // Sign-out works from every page, our error pages included.
      await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
    });
  }
});

test.describe("cross-site writes", () => {
  const FOREIGN = "http://evil.test";

  test("a POST to /logout or /admin from another site, or without Origin, is refused with 403", async () => {
    const therapist = await insertSession("therapist@kestrelvalley.test");
    const admin = await insertSession("admin@kestrelvalley.test");
    const cookieOf = async (id: string) => `${SESSION_COOKIE}=${await signedSessionValue(id)}`;
    const orgName = async () => (await one<{ name: string }>("SELECT name FROM organisations WHERE slug = 'kestrel-valley'"))?.name;
    const nameBefore = await orgName();
    const api = await playwrightRequest.newContext({ baseURL: APP_URL });
    try {
      // [path, session, headers, accepted refusals]. Our own check (app/auth/gate.server.ts)
      // answers 403. For a page's action with a foreign Origin, React Router 7.18's own check
      // (throwIfPotentialCSRFAttack, before any middleware) answers first with 400 "Bad
      // Request"; either way the write is refused, which the checks after the loop prove.
      const attempts: [string, string, Record<string, string>, number[]][] = [
        ["/logout", therapist.sessionId, { Origin: FOREIGN }, [403]],
        ["/logout", therapist.sessionId, {}, [403]],
        ["/logout", therapist.sessionId, { "Sec-Fetch-Site": "cross-site" }, [403]],
        ["/admin", admin.sessionId, { Origin: FOREIGN }, [403, 400]],
        ["/admin", admin.sessionId, {}, [403]],
        ["/admin", admin.sessionId, { "Sec-Fetch-Site": "cross-site" }, [403]],
      ];
      for (const [path, sessionId, headers, refusals] of attempts) {
        const response = await api.post(path, {
          maxRedirects: 0,
          headers: { Cookie: await cookieOf(sessionId), ...headers },
          form: { name: "Renamed from another site", timeZone: "UTC" },
        });
        expect(refusals, `POST ${path} with ${JSON.stringify(headers)}: status`).toContain(response.status());
      }
      expect((await sessionRow(therapist.sessionId))?.ended_at, "the refused sign-out ended nothing").toBeNull();
      expect(await orgName(), "the refused settings change changed nothing").toBe(nameBefore);

      // The same requests from Tidemark's own pages go through.
      const own = await api.post("/logout", { maxRedirects: 0, headers: { Cookie: await cookieOf(therapist.sessionId), Origin: APP_URL } });
      expect(own.status()).toBe(302);
      expect(own.headers()["location"]).toBe("/login?signed-out");
      expect((await sessionRow(therapist.sessionId))?.ended_at).not.toBeNull();

      const ownAdmin = await api.post("/admin", {
        maxRedirects: 0,
        headers: { Cookie: await cookieOf(admin.sessionId), "Sec-Fetch-Site": "same-origin" },
        form: {},
      });
      // It reaches the action, which explains the empty form (not the cross-site refusal).
      expect(ownAdmin.status()).toBe(400);
    } finally {
      await api.dispose();
    }
  });
});

test.describe("bad e-mail input gets a message beside the field", () => {
  const cases = [
    ["empty", "", "Enter your work e-mail address."],
    ["malformed", "not-an-address", "Enter a full e-mail address, like name@hospital.org."],
  ] as const;

  for (const [label, value, message] of cases) {
    test(`${label}, in the browser`, async ({ page }) => {
      await page.goto("/login");
      await page.getByLabel("Work e-mail").fill(value);
      await page.getByRole("button", { name: "Send me a code" }).click();
      const field = page.getByLabel("Work e-mail");
      await expect(field).toHaveAttribute("aria-invalid", "true");
      await expect(field).toHaveAccessibleDescription(message);
      await expect(page).toHaveURL(/\/login$/);
    });

    test(`${label}, answered by the server when scripts are off`, async ({ browser, consoleGuard }) => {
      consoleGuard.allow(statusNote(400));
      const context = await browser.newContext({ javaScriptEnabled: false });
      try {
        const page = await context.newPage();
        consoleGuard.watch(page);
        await page.goto("/login");
        await page.getByLabel("Work e-mail").fill(value);
        await page.getByRole("button", { name: "Send me a code" }).click();
        await page.waitForLoadState();
        const field = page.getByLabel("Work e-mail");
        await expect(field).toHaveAttribute("aria-invalid", "true");
        await expect(field).toHaveAccessibleDescription(message);
      } finally {
        await context.close();
      }
    });
  }
});

test("GET /healthz answers 200 with the database status", async ({ request }) => {
  const response = await request.get("/healthz");
  expect(response.status()).toBe(200);
  expect(response.headers()["content-type"]).toContain("application/json");
  expect(await response.json()).toEqual({ status: "ok", db: "ok" });
});

test("the demo outbox page lists the sign-in message with its code", async ({ page }) => {
  const email = await spareAddress("outbox-page");
  const mark = await askForCode(page, email);
  const code = await readLatestCode(email, mark);
  const message = await latestMessageTo(email, mark);

  await page.goto("/dev/outbox");
  await expect(page.getByRole("heading", { name: "Demo outbox", level: 1 })).toBeVisible();
  const item = page.getByRole("listitem").filter({ hasText: `To ${email}` }).first();
  await expect(item.getByRole("heading")).toHaveText(message.subject);
  await expect(item).toContainText(code);
});
