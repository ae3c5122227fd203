/**
 * Sign-in through the real pages in chromium, with the code read from the local e-mail fake:
 * every demo role, and each way a code must be refused (issue 2, item 3; OWASP ASVS 4.0.3
 * V2.7 out-of-band verifiers: short-lived, single use, limited tries, checked on the server).
 */
import { isRole, SECTIONS, sectionsFor } from "../../app/auth/roles";
import { latestCodeRecord, personByEmail, rolesOf, sessionsOf } from "../fixtures/e2e-db";
import { DEMO, SHORT_TTL_URL, type DemoKey } from "../fixtures/e2e-env";
import { messagesTo, readLatestCode, readLatestMagicLink } from "../fixtures/outbox";
import { SESSION_COOKIE } from "../fixtures/session-cookie";
import { askForCode, signInThroughPages, spareAddress, statusNote, typeCode, wrongCodeFor } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";
import type { Page } from "@playwright/test";

/** The roles PRODUCT.md gives each demo address (seeds/kestrel-valley.ts). */
const DEMO_ROLES: Record<Exclude<DemoKey, "alderBayAdmin">, string[]> = {
  therapist: ["therapist"],
  preceptor: ["preceptor", "therapist"],
  educator: ["educator", "therapist"],
  manager: ["manager"],
  admin: ["admin"],
};

async function expectCodeRefused(page: Page, message: string | RegExp) {
  const field = page.getByLabel("6-digit code");
  await expect(field).toHaveAttribute("aria-invalid", "true");
  // "Beside the field": the message is the field's accessible description.
  await expect(field).toHaveAccessibleDescription(message);
  await expect(page).toHaveURL(/\/login\/code$/);
}

async function expectSignedOut(page: Page) {
  expect((await page.context().cookies()).filter((c) => c.name === SESSION_COOKIE && c.value)).toEqual([]);
  await page.goto("/today");
  await expect(page).toHaveURL(/\/login\?next=%2Ftoday$/);
}

test.describe("each demo role signs in with the e-mailed code", () => {
  for (const who of Object.keys(DEMO_ROLES) as (keyof typeof DEMO_ROLES)[]) {
    test(`${who} lands on Today and sees only its sections`, async ({ page }) => {
      const email = DEMO[who];
      const person = await personByEmail(email);
      const roles = (await rolesOf(person.id)).filter(isRole);
      expect(roles.sort()).toEqual([...DEMO_ROLES[who]].sort());

      await signInThroughPages(page, email);
      await expect(page.getByRole("banner")).toContainText(person.name);

      const expected = sectionsFor(roles)
        .filter((s) => s.built)
        .map((s) => s.label);
      const nav = page.getByRole("navigation", { name: "Sections" });
      await expect(nav.getByRole("link")).toHaveText(expected);

      // Issue 2, item 3: the session cookie is HttpOnly, SameSite=Lax, Path=/ and Secure in production.
      const [cookie] = (await page.context().cookies()).filter((c) => c.name === SESSION_COOKIE);
      expect(cookie).toMatchObject({ httpOnly: true, secure: true, sameSite: "Lax", path: "/" });
    });
  }

  test("the comparison above can tell roles apart: no demo role sees every built section", () => {
    // Guards the per-role check against a section list that shows everything to everyone.
    const built = SECTIONS.filter((s) => s.built).map((s) => s.id);
    const seen = new Set<string>();
    for (const [who, roles] of Object.entries(DEMO_ROLES)) {
      const ids = sectionsFor(roles.filter(isRole))
        .filter((s) => s.built)
        .map((s) => s.id);
      ids.forEach((id) => seen.add(id));
      expect(ids.length, `${who} sees fewer than all built sections`).toBeLessThan(built.length);
    }
    expect([...seen].sort(), "between them the demo roles see every built section").toEqual([...built].sort());
  });
});

test("a wrong code gets a message beside the field with the tries left; the right code still works", async ({ page, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  const email = await spareAddress("wrong-code");
  const mark = await askForCode(page, email);
  const code = await readLatestCode(email, mark);

  await typeCode(page, wrongCodeFor(code));
  await expectCodeRefused(page, "That code is not right. 2 tries left.");

  await typeCode(page, code);
  await page.waitForURL((url) => url.pathname === "/today");
});

test("an expired code is refused", async ({ page, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  // The second server (port 3102, same database) issues codes that live SHORT_TTL_SECONDS.
  const email = await spareAddress("expired");
  const mark = await askForCode(page, email, SHORT_TTL_URL);
  const code = await readLatestCode(email, mark);
  const record = await latestCodeRecord(email);
  await page.waitForTimeout(Math.max(0, record!.expires_at - Date.now()) + 1_000);

  await typeCode(page, code);
  await expectCodeRefused(page, "This code has expired. Ask for a new code.");
  expect((await latestCodeRecord(email))?.consumed_at).toBeNull();
  expect(await sessionsOf((await personByEmail(email)).id)).toEqual([]);
  await expectSignedOut(page);
});

test.describe("too many tries", () => {
  test("after 3 wrong codes even the right code is refused", async ({ page, consoleGuard }) => {
    consoleGuard.allow(statusNote(400));
    const email = await spareAddress("too-many");
    const mark = await askForCode(page, email);
    const code = await readLatestCode(email, mark);

    await typeCode(page, wrongCodeFor(code, 1));
    await expectCodeRefused(page, "That code is not right. 2 tries left.");
    await typeCode(page, wrongCodeFor(code, 2));
    await expectCodeRefused(page, "That code is not right. 1 try left.");
    await typeCode(page, wrongCodeFor(code, 3));
    await expectCodeRefused(page, "Too many wrong tries for this code. Ask for a new code.");

    await typeCode(page, code);
    await expectCodeRefused(page, "Too many wrong tries for this code. Ask for a new code.");
    expect((await latestCodeRecord(email))?.attempts).toBe(3);
    await expectSignedOut(page);
  });

  test("replaying the strategy's _totp cookie does not reset the count", async ({ page, consoleGuard }) => {
    consoleGuard.allow(statusNote(400));
    const email = await spareAddress("too-many-replay");
    const mark = await askForCode(page, email);
    const code = await readLatestCode(email, mark);
    // The strategy's cookie as it was before any wrong try (its attempt counter is in clear).
    const saved = (await page.context().cookies()).filter((c) => c.name === "_totp" || c.name === "tm_signin");
    expect(saved.map((c) => c.name).sort()).toEqual(["_totp", "tm_signin"]);

    for (const shift of [1, 2, 3]) await typeCode(page, wrongCodeFor(code, shift));
    await expectCodeRefused(page, "Too many wrong tries for this code. Ask for a new code.");

    await page.context().addCookies(saved);
    await page.reload();
    await typeCode(page, code);
    await expectCodeRefused(page, "Too many wrong tries for this code. Ask for a new code.");
    await expectSignedOut(page);
  });
});

test("a used code cannot sign in again, even with the browser's sign-in cookies replayed", async ({ page, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  const email = await spareAddress("used-code");
  const mark = await askForCode(page, email);
  const code = await readLatestCode(email, mark);
  const saved = (await page.context().cookies()).filter((c) => c.name === "_totp" || c.name === "tm_signin");

  await typeCode(page, code);
  await page.waitForURL((url) => url.pathname === "/today");
  await page.getByRole("button", { name: "Sign out" }).click();
  await page.waitForURL((url) => url.pathname === "/login");

  await page.context().addCookies(saved);
  await page.goto("/login/code");
  await typeCode(page, code);
  await expectCodeRefused(page, "This code has already been used. Ask for a new code.");
  await expectSignedOut(page);
  // One session only: the one the code opened (and sign-out ended).
  const sessions = await sessionsOf((await personByEmail(email)).id);
  expect(sessions).toHaveLength(1);
  expect(sessions[0].ended_at).not.toBeNull();
});

test("an unknown address gets the same screen, no mail and no session", async ({ page, browser, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  const unknown = `nobody-${Date.now()}@kestrelvalley.test`;
  await askForCode(page, unknown);
  const unknownScreen = await page.getByRole("main").innerText();
  expect(unknownScreen).toContain("If the address belongs to a Tidemark account");

  // The screen a known address gets, for comparison: word for word the same.
  const other = await browser.newContext();
  try {
    const known = await other.newPage();
    await askForCode(known, await spareAddress("known-address-screen"));
    expect(await known.getByRole("main").innerText()).toBe(unknownScreen);
  } finally {
    await other.close();
  }

  expect(await messagesTo(unknown)).toEqual([]);
  const record = await latestCodeRecord(unknown);
  expect(record, "the request is recorded like any other").toBeDefined();
  expect(record!.person_id).toBeNull();

  await typeCode(page, "123456");
  await expectCodeRefused(page, "That code is not right. 2 tries left.");
  await expectSignedOut(page);
});

test("the magic link signs in only in the browser that asked for it", async ({ page, newGuardedPage }) => {
  const email = await spareAddress("magic-link");
  const mark = await askForCode(page, email);
  const link = await readLatestMagicLink(email, mark);
  expect(new URL(link).pathname).toBe("/login/magic");

  const elsewhere = await newGuardedPage();
  await elsewhere.goto(link);
  await expect(elsewhere.getByRole("alert")).toHaveText(
    "Sign-in links work only in the browser where you asked for the code. Open it there, or type the code instead.",
  );
  await elsewhere.goto("/today");
  await expect(elsewhere).toHaveURL(/\/login\?next=%2Ftoday$/);

  await page.goto(link);
  await expect(page).toHaveURL(/\/today$/);
  await expect(page.getByRole("navigation", { name: "Sections" })).toBeVisible();
});
