/**
 * Issue 9 §4–5, Acceptance, in Debian's chromium: a manager opens Reports, sees the 12-month
 * trend with its table, picks a past date for compliance by unit, downloads its CSV (header
 * checked, parsed by papaparse), and downloads the survey evidence packet of one therapist (a PDF
 * by its content). Every report page passes axe (WCAG 2.0/2.1/2.2 A and AA).
 */
import type { Download } from "@playwright/test";
import Papa from "papaparse";
import { expectNoAxeViolations } from "../fixtures/axe";
import { DEMO } from "../fixtures/e2e-env";
import { one } from "../fixtures/e2e-db";
import { expect, test } from "../fixtures/test";

async function bytesOf(download: Download): Promise<Buffer> {
  const stream = await download.createReadStream();
  const chunks: Buffer[] = [];
  for await (const chunk of stream) chunks.push(Buffer.from(chunk as Buffer));
  return Buffer.concat(chunks);
}

/** A past day: the first of the previous month, on the test machine's calendar (UTC). */
function pastDay(): string {
  const now = new Date();
  return new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth() - 1, 1)).toISOString().slice(0, 10);
}

test("a manager picks a past date, downloads the compliance CSV and one therapist's survey packet", async ({ page, signInAs }) => {
  test.setTimeout(90_000);
  await signInAs("manager");
  await page.goto("/reports");
  await expect(page.getByRole("heading", { level: 1, name: "Reports" })).toBeVisible();
  // The trend's text alternative: a caption on the chart and a table of every value.
  await expect(page.getByRole("img", { name: /% Current per unit at each month end/ })).toBeVisible();
  await expect(page.getByRole("table", { name: "% Current per unit at each month end" }).getByRole("row")).toHaveCount(13);

  await page.getByRole("link", { name: "Compliance by unit on a chosen day", exact: true }).click();
  await expect(page).toHaveURL(/\/reports\/compliance$/);
  const day = pastDay();
  await page.getByRole("textbox", { name: "As recorded by the end of" }).fill(day);
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page).toHaveURL(new RegExp(`/reports/compliance\\?on=${day}$`));
  await expect(page.getByRole("table", { name: `Compliance by unit as recorded by the end of ${day}` })).toBeVisible();

  const csvDownload = page.waitForEvent("download");
  await page.getByRole("link", { name: "Download CSV" }).click();
  const csv = await csvDownload;
  expect(csv.suggestedFilename()).toBe(`tidemark-compliance-as-of-${day}.csv`);
  const rows = Papa.parse<string[]>((await bytesOf(csv)).toString("utf8"), { skipEmptyLines: true }).data;
  expect(rows[0]).toEqual(["Unit", "People", "Requirement records", "% Current", "Current", "Due soon", "Lapsed", "Not started", "Waived"]);
  expect(rows.length).toBeGreaterThan(2);

  // The survey packet of the demo therapist.
  const therapist = (await one<{ name: string }>("SELECT name FROM people WHERE email = ?", [DEMO.therapist]))!;
  await page.getByRole("navigation", { name: "Reports" }).getByRole("link", { name: "Survey packet" }).click();
  await page.getByLabel("Search by name or employee id").fill(therapist.name);
  await page.getByRole("button", { name: "Search" }).click();
  const packetDownload = page.waitForEvent("download");
  await page.getByRole("link", { name: `PDF packet for ${therapist.name}` }).click();
  const packet = await packetDownload;
  expect(packet.suggestedFilename()).toMatch(/^survey-packet-.+\.pdf$/);
  const bytes = await bytesOf(packet);
  expect(bytes.length).toBeGreaterThan(1000);
  // A PDF by its content (ISO 32000: it starts with "%PDF-").
  expect(bytes.subarray(0, 5).toString("latin1")).toBe("%PDF-");
});

test("a manager's report pages pass axe", async ({ page, signInAs }) => {
  test.setTimeout(90_000);
  await signInAs("manager");
  for (const [address, heading] of [
    ["/reports", "Reports"],
    ["/reports/compliance", "Compliance by unit"],
    ["/reports/compliance?on=2999-01-01", "Compliance by unit"],
    ["/reports/expiries", "Expiries and due dates"],
    ["/reports/completions", "Completions"],
    ["/reports/packet", "Survey evidence packet"],
  ] as const) {
    await page.goto(address);
    await expect(page.getByRole("heading", { level: 1, name: heading })).toBeVisible();
    await expectNoAxeViolations(page, `Reports: ${address}`);
  }
  // The future date is refused beside its field.
  await page.goto("/reports/compliance?on=2999-01-01");
  await expect(page.getByText(/Choose today .* or an earlier day/)).toBeVisible();
});

test("Team shows the compliance trend with its table", async ({ page, signInAs }) => {
  await signInAs("manager");
  await page.goto("/team");
  await expect(page.getByRole("heading", { level: 2, name: "Compliance by unit over the past 12 months" })).toBeVisible();
  await expect(page.getByRole("table", { name: "% Current per unit at each month end" })).toBeVisible();
  await expectNoAxeViolations(page, "Team with the compliance trend");
});
