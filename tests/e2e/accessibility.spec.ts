/**
 * Every page built so far passes axe-core with the WCAG 2.0, 2.1 and 2.2 A and AA rule tags
 * and no violations (shared/TESTING.md), scanned in a page of a fresh browser context as
 * signed in by the role that uses it — including the states a person meets: field errors,
 * a pending code, our 403 and 404 pages.
 */
import type { Page } from "@playwright/test";
import { expectNoAxeViolations } from "../fixtures/axe";
import { firstPersonId } from "../fixtures/e2e-db";
import { seededExamId } from "../fixtures/exams";
import type { DemoKey } from "../fixtures/e2e-env";
import { readLatestCode } from "../fixtures/outbox";
import { askForCode, spareAddress, statusNote, typeCode, wrongCodeFor } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

type Scan = {
  name: string;
  who?: DemoKey;
  path: () => Promise<string> | string;
  status?: number;
  /** Brings the page into the state to scan, after it has loaded. */
  prepare?: (page: Page) => Promise<void>;
};

const SCANS: Scan[] = [
  { name: "sign-in", path: () => "/login" },
  {
    name: "sign-in with a field error",
    path: () => "/login",
    prepare: async (page) => {
      await page.getByLabel("Work e-mail").fill("not-an-address");
      await page.getByRole("button", { name: "Send me a code" }).click();
      await expect(page.getByLabel("Work e-mail")).toHaveAttribute("aria-invalid", "true");
    },
  },
  { name: "code entry without a pending code", path: () => "/login/code" },
  { name: "sign-in link that is not valid", path: () => "/login/magic?t=not-a-token" },
  { name: "demo outbox", path: () => "/dev/outbox" },
  { name: "404 page, signed out", path: () => "/no-such-page-e2e", status: 404 },
  { name: "Today (therapist)", who: "therapist", path: () => "/today" },
  { name: "Today (preceptor)", who: "preceptor", path: () => "/today" },
  { name: "Today (educator)", who: "educator", path: () => "/today" },
  { name: "Today (manager)", who: "manager", path: () => "/today" },
  { name: "Today (admin)", who: "admin", path: () => "/today" },
  { name: "My plan (therapist)", who: "therapist", path: () => "/plan" },
  { name: "Bench (therapist)", who: "therapist", path: () => "/bench" },
  { name: "Team (manager)", who: "manager", path: () => "/team" },
  { name: "Team (educator)", who: "educator", path: () => "/team" },
  { name: "Team: exam time accommodations (manager)", who: "manager", path: () => "/team/accommodations" },
  { name: "Team: exam time accommodations (educator)", who: "educator", path: () => "/team/accommodations" },
  { name: "Exams (therapist)", who: "therapist", path: () => "/exams" },
  { name: "Exam start page (therapist)", who: "therapist", path: async () => `/exams/${await seededExamId("kestrel-valley")}/start` },
  { name: "Bank: exams (educator)", who: "educator", path: () => "/bank/exams" },
  { name: "Bank: write an exam (educator)", who: "educator", path: () => "/bank/exams/new" },
  { name: "Bank: an exam (educator)", who: "educator", path: async () => `/bank/exams/${await seededExamId("kestrel-valley")}` },
  { name: "Bank: edit an exam (educator)", who: "educator", path: async () => `/bank/exams/${await seededExamId("kestrel-valley")}/edit` },
  { name: "Admin: organisation", who: "admin", path: () => "/admin" },
  { name: "Admin: API tokens and reference", who: "admin", path: () => "/admin/api" },
  { name: "Admin: roster import", who: "admin", path: () => "/admin/roster" },
  { name: "My plan: calendar addresses (manager)", who: "manager", path: () => "/plan/calendar" },
  { name: "Admin: units", who: "admin", path: () => "/admin/units" },
  { name: "Admin: people", who: "admin", path: () => "/admin/people" },
  { name: "Admin: add a person", who: "admin", path: () => "/admin/people/new" },
  { name: "Admin: a person", who: "admin", path: async () => `/admin/people/${await firstPersonId("kestrel-valley")}` },
  { name: "403 page (therapist opening Admin)", who: "therapist", path: () => "/admin", status: 403 },
  { name: "404 page, signed in", who: "therapist", path: () => "/no-such-page-e2e", status: 404 },
];

for (const scan of SCANS) {
  test(`axe: ${scan.name}`, async ({ newGuardedPage, signInAs, consoleGuard }) => {
    const page = await newGuardedPage();
    if (scan.status) consoleGuard.allow(statusNote(scan.status));
    if (scan.who) await signInAs(scan.who, page.context());
    const response = await page.goto(await scan.path());
    expect(response?.status()).toBe(scan.status ?? 200);
    await page.waitForLoadState("networkidle");
    await scan.prepare?.(page);
    await expectNoAxeViolations(page, scan.name);
  });
}

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
