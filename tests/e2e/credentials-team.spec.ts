/**
 * Issue 8, Acceptance, in Debian's chromium: a therapist uploads a card scan and sees My plan
 * change; a renamed executable, an oversize and an empty file are each refused with a message;
 * a manager filters the Team matrix to Lapsed in Adult ICU (fetched without a page reload), opens
 * a cell, grants a waiver and sees the cell change, and verifies the therapist's new card from its
 * cell. Every new page passes axe (WCAG 2.0/2.1/2.2 A and AA).
 */
import type { Page } from "@playwright/test";
import { expectNoAxeViolations } from "../fixtures/axe";
import { personByEmail } from "../fixtures/e2e-db";
import { DEMO, todayInChicago, type DemoKey } from "../fixtures/e2e-env";
import { statusNote } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

// A minimal PDF (ISO 32000 "%PDF-" header and trailer): enough for the content check.
const PDF = Buffer.from("%PDF-1.4\n1 0 obj\n<<>>\nendobj\ntrailer\n<<>>\n%%EOF\n");
// "MZ": the header of a Windows executable, renamed to look like a PDF.
const EXE = Buffer.concat([Buffer.from([0x4d, 0x5a, 0x90, 0x00, 0x03]), Buffer.alloc(2000)]);

test.describe.configure({ mode: "serial" });

async function blsRow(page: Page) {
  await page.goto("/plan");
  return page.getByTestId("plan-row").filter({ has: page.getByText("Basic life support", { exact: true }) });
}

async function fillCard(page: Page, issuedOn: string) {
  await page.getByLabel("Type").selectOption({ label: "Basic life support" });
  await page.getByLabel("Number").fill("E2E-BLS-1");
  await page.getByLabel("Issuer").fill("Community training centre");
  await page.getByLabel("Issue date").fill(issuedOn);
}

test("a therapist's wrong files are refused, then a scanned card changes My plan", async ({ page, signInAs, consoleGuard }) => {
  test.setTimeout(60_000);
  consoleGuard.allow(statusNote(400));
  consoleGuard.allow(statusNote(413));
  await signInAs("therapist");
  const before = await (await blsRow(page)).getAttribute("data-status");

  await page.goto("/credentials");
  const today = todayInChicago();
  await fillCard(page, today);
  // The valid-through date is proposed from the type's rule (AHA: through the end of the month, two years on).
  const [y, m] = today.split("-").map(Number);
  const endOfMonth = new Date(Date.UTC(y + 2, m, 0)).toISOString().slice(0, 10);
  await expect(page.getByLabel("Valid through")).toHaveValue(endOfMonth);

  const scan = page.getByLabel("Scan of the card (optional)");
  const save = page.getByRole("button", { name: "Save credential" });

  await scan.setInputFiles({ name: "card.pdf", mimeType: "application/pdf", buffer: EXE });
  await save.click();
  await expect(page.getByText(/not a PNG, JPEG or PDF/)).toBeVisible();
  // What was typed is kept.
  await expect(page.getByLabel("Number")).toHaveValue("E2E-BLS-1");

  await scan.setInputFiles({ name: "card.png", mimeType: "image/png", buffer: Buffer.alloc(0) });
  await save.click();
  await expect(page.getByText(/is empty/)).toBeVisible();

  await scan.setInputFiles({ name: "card.pdf", mimeType: "application/pdf", buffer: Buffer.concat([PDF, Buffer.alloc(11 * 1024 * 1024)]) });
  await save.click();
  await expect(page.getByText(/larger than 10 MB/)).toBeVisible();

  await page.goto("/credentials");
  await fillCard(page, today);
  await scan.setInputFiles({ name: "card.pdf", mimeType: "application/pdf", buffer: PDF });
  await save.click();
  await expect(page.getByText(/Basic life support recorded with its scan/)).toBeVisible();
  await expect(page.getByRole("link", { name: /Download scan of Basic life support/ }).first()).toBeVisible();

  const after = await blsRow(page);
  await expect(after).toHaveAttribute("data-status", "current");
  await expect(after.getByText("Awaiting verification by your manager")).toBeVisible();
  expect(before).not.toBe("current");
});

test("a manager filters to Lapsed in Adult ICU, grants a waiver from a cell, and verifies a card", async ({ page, signInAs }) => {
  test.setTimeout(60_000);
  await signInAs("manager");
  await page.goto("/team/matrix");
  await page.evaluate(() => ((window as unknown as { notReloaded: boolean }).notReloaded = true));
  await page.getByLabel("Unit", { exact: true }).selectOption({ label: "Adult ICU" });
  await page.getByLabel("Has a cell that is").selectOption("lapsed");
  await page.getByRole("button", { name: "Filter" }).click();
  await expect(page).toHaveURL(/status=lapsed/);
  await expect(page.getByTestId("matrix-count")).toContainText("Showing");
  // Fetched in the page: the window object survived.
  expect(await page.evaluate(() => (window as unknown as { notReloaded?: boolean }).notReloaded)).toBe(true);
  const rows = page.getByTestId("matrix-row");
  expect(await rows.count()).toBeGreaterThan(0);

  const firstLapsed = page.locator('td[data-status="lapsed"] a').first();
  const cellPath = (await firstLapsed.getAttribute("href"))!;
  const who = (await firstLapsed.locator("xpath=ancestor::tr/th").textContent())!.trim();
  await firstLapsed.click();
  // Opened in place, with the filtered view as the way back.
  await expect(page).toHaveURL(/\/team\/people\/.+\?back=%2Fteam%2Fmatrix%3F.*status%3Dlapsed/);
  await expect(page.getByRole("heading", { level: 1 })).toContainText(who);
  await expect(page.getByTestId("cell-status")).toContainText("Lapsed");
  await expectNoAxeViolations(page, "Team cell (manager)");

  await page.getByRole("textbox", { name: "Reason" }).first().fill("Long-term leave, returns in spring");
  await page.getByLabel("Waived through").fill(`${Number(todayInChicago().slice(0, 4)) + 1}-03-31`);
  await page.getByRole("button", { name: "Grant waiver" }).click();
  await expect(page).toHaveURL(/\/team\/matrix\?/);
  await expect(page.getByText(/Waiver granted to/)).toBeVisible();
  // The same cell, now Waived (the person may have left the Lapsed filter, so look them up by name).
  await page.goto(`/team/matrix?q=${encodeURIComponent(who)}`);
  await expect(page.locator(`td:has(a[href="${cellPath}"])`).first()).toHaveAttribute("data-status", "waived");

  // The therapist's new card, from its cell.
  const therapist = await personByEmail(DEMO.therapist);
  await page.goto("/team/matrix?q=" + encodeURIComponent(therapist.name));
  // The Basic life support column: its place among the headers is its place in each row.
  const headers = (await page.getByTestId("matrix").locator("thead th").allTextContents()).map((t) => t.trim());
  const bls = headers.indexOf("Basic life support");
  expect(bls).toBeGreaterThan(1);
  await page.getByTestId("matrix-row").first().locator(`> :nth-child(${bls + 1}) a`).click();
  await expect(page.getByText("not yet verified")).toBeVisible();
  await page.getByLabel("How you checked it").selectOption("Online lookup with the issuing body");
  await page.getByRole("button", { name: "Mark verified" }).click();
  await expect(page.getByText(/Credential verified/)).toBeVisible();
  await expect(page.getByText("not yet verified")).toHaveCount(0);
});

const SCANS: { name: string; who: DemoKey; path: () => Promise<string> | string }[] = [
  { name: "Credentials (therapist)", who: "therapist", path: () => "/credentials" },
  { name: "Credentials (manager)", who: "manager", path: () => "/credentials" },
  { name: "Team compliance matrix (manager)", who: "manager", path: () => "/team/matrix" },
  { name: "Team compliance matrix (educator)", who: "educator", path: () => "/team/matrix" },
  { name: "Requirements (educator)", who: "educator", path: () => "/team/requirements" },
  { name: "Admin: regulatory references", who: "admin", path: () => "/admin/references" },
  { name: "Credentials of a person on the manager's units", who: "manager", path: async () => `/credentials?person=${(await personByEmail(DEMO.therapist)).id}` },
];

for (const scan of SCANS) {
  test(`axe: ${scan.name}`, async ({ newGuardedPage, signInAs, consoleGuard }) => {
    // A matrix page is 25 people × every requirement: axe checks each of its cells.
    test.setTimeout(60_000);
    const page = await newGuardedPage();
    await signInAs(scan.who, page.context());
    const response = await page.goto(await scan.path());
    expect(response?.status()).toBe(200);
    await page.waitForLoadState("networkidle");
    await expectNoAxeViolations(page, scan.name);
  });
}
