/**
 * Item analysis and cut scores in Debian's chromium (issue 6, acceptance): an educator opens the
 * analysis of the demo's annual exam (the seed grades enough attempts to make it meaningful),
 * sees a flagged item and follows it to the editor; two educators rate every item in a modified
 * Angoff panel (Livingston & Zieky, "Passing Scores", ETS 1982) and one adopts the panel's cut as
 * the pass mark. The pages pass axe with no WCAG A/AA violations.
 */
import type { Page } from "@playwright/test";
import { expectNoAxeViolations } from "../fixtures/axe";
import { secondEducatorEmail, signInByEmail } from "../fixtures/bank";
import { one } from "../fixtures/e2e-db";
import { expect, test } from "../fixtures/test";

const ANNUAL = "Annual ventilation modes exam";

async function annualExamId(): Promise<string> {
  const row = await one<{ id: string }>("SELECT e.id FROM exams e JOIN organisations o ON o.id = e.org_id WHERE o.slug = 'kestrel-valley' AND e.title = ?", [ANNUAL]);
  return row!.id;
}

/** Rates every item of round 1 at `percent` and saves. Returns how many items were rated. */
async function rateAll(page: Page, examId: string, percent: number): Promise<number> {
  await page.goto(`/bank/exams/${examId}/cut-score?round=1`);
  const fields = page.getByRole("textbox", { name: /^Item \d+ \(%\)/ });
  const n = await fields.count();
  expect(n).toBeGreaterThan(0);
  for (let i = 0; i < n; i++) await fields.nth(i).fill(String(percent));
  await page.getByRole("button", { name: "Save my round-1 ratings" }).click();
  await expect(page.getByText(`Saved ${n} ratings for round 1.`)).toBeVisible();
  return n;
}

test.describe.serial("item analysis and the cut score of the annual exam", () => {
  // Two educators fill one field per item of the blueprint's pool (dozens) on a shared 2-core machine.
  test.describe.configure({ timeout: 120_000 });
  test("an educator sees a flagged item with its explanation and follows it to the editor", async ({ page, signInAs }) => {
    await signInAs("educator");
    await page.goto("/bank/exams");
    await page.getByRole("link", { name: ANNUAL }).first().click();
    await page.getByRole("link", { name: "Item analysis" }).click();
    await expect(page).toHaveURL(/\/bank\/exams\/[0-9a-f-]{36}\/analysis$/);
    await expect(page.getByText(/KR-20/).first()).toBeVisible();
    await expectNoAxeViolations(page, "item analysis");

    // Flagged items come first: the first row carries a flag and its plain-words explanation.
    const table = page.getByRole("table", { name: /Item statistics/ });
    const first = table.getByRole("row").nth(1);
    await expect(first.locator("strong.text-coral").first()).toHaveText(/Too easy|Too hard|Weak discrimination|Negative discrimination|Option nobody chose/);
    await first.getByRole("link", { name: "Edit this item" }).click();
    await expect(page).toHaveURL(/\/bank\/items\/[0-9a-f-]{36}\/edit$/);
  });

  test("two educators rate every item; one adopts the panel's cut as the pass mark", async ({ page, browser, signInAs }) => {
    const examId = await annualExamId();
    await signInAs("educator");
    const items = await rateAll(page, examId, 70);

    const other = await browser.newContext();
    await signInByEmail(other, await secondEducatorEmail());
    const second = await other.newPage();
    expect(await rateAll(second, examId, 60)).toBe(items);
    await other.close();

    // Each judge's cut is the sum of their estimates; the panel's cut is their mean: 65 % here.
    await page.goto(`/bank/exams/${examId}/cut-score`);
    await expectNoAxeViolations(page, "cut-score panel");
    await page.getByRole("button", { name: "Adopt 65 % as the pass mark" }).click();
    await page.getByRole("button", { name: "Yes, adopt 65 %" }).click();
    await expect(page.getByText(/Pass mark set to 65 %: version \d+ is live\./)).toBeVisible();
    const live = await one<{ pass_mark_percent: number }>(
      "SELECT v.pass_mark_percent FROM exam_versions v WHERE v.exam_id = ? AND v.published_at IS NOT NULL ORDER BY v.version DESC LIMIT 1",
      [examId],
    );
    expect(live?.pass_mark_percent).toBe(65);
  });
});
