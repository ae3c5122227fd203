/**
 * The question bank in Debian's chromium (issue 4, acceptance): an educator writes a numeric
 * item and a waveform-point item and sends them to review; a second educator publishes them;
 * the therapist-view preview shows them (and grades an answer); editing the published item
 * makes version 2 while version 1 stays readable; an import with bad rows shows every error
 * and saves nothing until the educator chooses. A therapist cannot reach /bank or an
 * unpublished item by address. Each bank page passes axe with no WCAG A/AA violations.
 */
import type { Page } from "@playwright/test";
import { expectNoAxeViolations } from "../fixtures/axe";
import { kestrelItemCount, secondEducatorEmail, signInByEmail, unpublishedItemId } from "../fixtures/bank";
import { expect, test } from "../fixtures/test";

const REFERENCE = "Hess DR, Kacmarek RM. Essentials of Mechanical Ventilation. 4th ed. 2019.";
const NUMERIC_STEM = "E2E: Tidal volume 450 mL, plateau 25 cmH2O, PEEP 10 cmH2O. What is the static compliance?";
const WAVEFORM_STEM = "E2E: Click the moment on the second breath where you would read the plateau pressure.";

async function newItem(page: Page, type: string) {
  await page.goto("/bank/items/new");
  await expect(page.getByRole("heading", { level: 2, name: "Write an item" })).toBeVisible();
  await page.getByLabel("Type", { exact: true }).selectOption({ label: type });
}

async function pickMoment(page: Page, seconds: number) {
  await page.getByLabel(/^Moment on the time axis/).fill(String(seconds));
  await page.getByRole("button", { name: `Choose ${seconds.toFixed(2)} s` }).click();
}

async function saveAndOpen(page: Page): Promise<string> {
  await page.getByRole("button", { name: "Save draft" }).click();
  await expect(page).toHaveURL(/\/bank\/items\/[0-9a-f-]{36}$/);
  await expect(page.getByText("Draft saved as version 1")).toBeVisible();
  return new URL(page.url()).pathname;
}

test.describe.serial("writing, reviewing, publishing and versioning", () => {
  let numericPath = "";
  let waveformPath = "";

  test("an educator writes a numeric item and sends it to review", async ({ page, signInAs }) => {
    await signInAs("educator");
    await newItem(page, "Numeric");
    await page.getByLabel("Stem").fill(NUMERIC_STEM);
    await page.getByLabel("Topics").selectOption([{ label: "Lung mechanics" }]);
    await page.getByLabel("Correct answer").fill("30");
    await page.getByLabel("Unit").fill("mL/cmH2O");
    await page.getByLabel("Tolerance (±)").fill("0.5");
    await page.getByLabel("Decimals expected").fill("0");
    await page.getByLabel("Rationale").fill("Cstat = Vt / (Pplat − PEEP) = 450 / 15 = 30 mL/cmH2O.");
    await page.getByLabel("Reference").fill(REFERENCE);
    numericPath = await saveAndOpen(page);
    await expectNoAxeViolations(page, "item page (draft)");
    // The writer cannot publish their own item: only "Send to review" is offered.
    await expect(page.getByRole("button", { name: "Approve and publish" })).toHaveCount(0);
    await page.getByRole("button", { name: "Send to review" }).click();
    await expect(page.getByText("Sent to review.")).toBeVisible();
    await expect(page.getByText("A second educator must approve: you wrote this version.")).toBeVisible();
  });

  test("an educator writes a waveform-point item, drawing the window on the waveform", async ({ page, signInAs }) => {
    await signInAs("educator");
    await newItem(page, "Waveform point");
    await expectNoAxeViolations(page, "new item form (waveform point)");
    await page.getByLabel("Stem").fill(WAVEFORM_STEM);
    await page.getByLabel("Topics").selectOption([{ label: "Waveform reading" }, { label: "Lung mechanics" }]);
    await page.getByLabel("Bench run").selectOption({ label: "Volume control, constant flow, end-inspiratory pause (passive patient)" });
    // Two clicks on the waveform (through its keyboard alternative): the start, then the end.
    await pickMoment(page, 4.6);
    await pickMoment(page, 5);
    await expect(page.getByLabel("Correct window from (s)")).toHaveValue("4.60");
    await expect(page.getByLabel("Correct window to (s)")).toHaveValue("5.00");
    await page.getByLabel("Rationale").fill("The plateau is read at the end of the pause, when flow is zero and pressure has settled.");
    await page.getByLabel("Reference").fill(REFERENCE);
    waveformPath = await saveAndOpen(page);
    await page.getByRole("button", { name: "Send to review" }).click();
    await expect(page.getByText("Sent to review.")).toBeVisible();
  });

  test("a second educator publishes both; the therapist view shows and grades them", async ({ page, context }) => {
    await signInByEmail(context, await secondEducatorEmail());
    for (const path of [numericPath, waveformPath]) {
      await page.goto(path);
      await page.getByRole("button", { name: "Approve and publish" }).click();
      await expect(page.getByText("Approved and published")).toBeVisible();
      await expect(page.locator("[data-status=published]").first()).toBeVisible();
    }

    await page.goto(numericPath);
    const view = page.getByTestId("therapist-view");
    await expect(view.getByTestId("preview-stem")).toHaveText(NUMERIC_STEM);
    await view.getByLabel(/Your answer/).fill("30");
    await view.getByRole("button", { name: "Check answer" }).click();
    await expect(view.getByText("Correct.")).toBeVisible();
    await expect(view.getByText(REFERENCE)).toBeVisible();
    // On a phone: the same question in a narrow frame.
    await page.getByRole("button", { name: "Phone width" }).click();
    await expect(view).toHaveAttribute("data-phone", "true");
    expect((await view.boundingBox())!.width).toBeLessThanOrEqual(360);

    await page.goto(waveformPath);
    await expect(view.getByTestId("preview-stem")).toHaveText(WAVEFORM_STEM);
    await pickMoment(page, 6);
    await view.getByRole("button", { name: "Check answer" }).click();
    await expect(view.getByText(/Not correct\. The answer: between 4\.6 s and 5 s/)).toBeVisible();
    await pickMoment(page, 4.8);
    await view.getByRole("button", { name: "Check answer" }).click();
    await expect(view.getByText("Correct.")).toBeVisible();
    await expectNoAxeViolations(page, "item page (published, answer checked)");
  });

  test("editing the published item makes version 2; version 1 stays readable as it was", async ({ page, signInAs }) => {
    await signInAs("educator");
    await page.goto(numericPath);
    await page.getByRole("link", { name: "Edit (makes a new version)" }).click();
    await expect(page.getByText(/Saving makes version 2, a draft; version 1 stays exactly as it is/)).toBeVisible();
    await expectNoAxeViolations(page, "edit page");
    await page.getByLabel("Stem").fill(`${NUMERIC_STEM} (revised)`);
    await page.getByRole("button", { name: "Save as a new version" }).click();
    await expect(page.getByText(/Saved as version 2, a draft/)).toBeVisible();
    await expect(page.getByRole("heading", { level: 2, name: "Item, version 2" })).toBeVisible();
    await expect(page.getByText("version 1 is published")).toBeVisible();
    await page.getByRole("link", { name: "Version 1", exact: true }).click();
    await expect(page.getByRole("heading", { level: 2, name: "Version 1" })).toBeVisible();
    await expect(page.getByText("This version was published; it never changes.")).toBeVisible();
    await expect(page.getByTestId("preview-stem")).toHaveText(NUMERIC_STEM);
    await expectNoAxeViolations(page, "version page");
  });
});

test("an import with bad rows shows every error and saves nothing until the educator chooses", async ({ page, signInAs }) => {
  await signInAs("educator");
  await page.goto("/bank/import");
  await expectNoAxeViolations(page, "import page");
  const body = JSON.stringify({ kind: "numeric", answer: 4.2, unit: "L/min", tolerance: 0.05, decimals: 1 });
  const q = (s: string) => `"${s.replace(/"/g, '""')}"`;
  const csv = [
    "type,topics,stem,body,scenario,rationale,reference",
    `numeric,lung-mechanics,E2E import: alveolar ventilation?,${q(body)},,(0.5 − 0.15) × 12 = 4.2 L/min.,${q(REFERENCE)}`,
    `numeric,lung-mechanics,,${q(body)},,No stem here.,${q(REFERENCE)}`,
    `sideways,not-a-topic,A stem,{broken,,Rationale.,`,
  ].join("\n");
  const before = await kestrelItemCount();
  await page.getByLabel("File of items").setInputFiles({ name: "items.csv", mimeType: "text/csv", buffer: Buffer.from(csv) });
  await page.getByRole("button", { name: "Check the file" }).click();
  await expect(page.getByRole("heading", { name: "items.csv: 1 of 3 rows are ready" })).toBeVisible();
  const errors = page.getByRole("table", { name: "Errors by row and field" });
  await expect(errors.getByRole("row", { name: /^3 stem/ })).toBeVisible();
  await expect(errors.getByRole("row", { name: /^4 body This cell is not valid JSON/ })).toBeVisible();
  await expect(errors.getByRole("row", { name: /^4 type/ })).toBeVisible();
  await expect(errors.getByRole("row", { name: /^4 topics/ })).toBeVisible();
  await expect(errors.getByRole("row", { name: /^4 reference/ })).toBeVisible();
  await expect(page.getByText("2 rows have errors. Nothing has been saved.")).toBeVisible();
  await expectNoAxeViolations(page, "import page with row errors");
  expect(await kestrelItemCount()).toBe(before);

  await page.getByRole("button", { name: "Import only the 1 valid rows" }).click();
  await expect(page.getByText("1 item imported from items.csv as drafts.")).toBeVisible();
  expect(await kestrelItemCount()).toBe(before + 1);
  await expect(page.getByRole("link", { name: "E2E import: alveolar ventilation?" })).toBeVisible();
});

test("a file of the wrong type is refused with a clear message", async ({ page, signInAs, consoleGuard }) => {
  // The browser notes the refusal's status (415) in its console: expected here.
  consoleGuard.allow(/status of 415/);
  await signInAs("educator");
  await page.goto("/bank/import");
  await page.getByLabel("File of items").setInputFiles({ name: "scan.pdf", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.7\n") });
  await page.getByRole("button", { name: "Check the file" }).click();
  await expect(page.getByRole("alert")).toContainText("scan.pdf is not a CSV or JSON file of items.");
});

test("the bank list filters and its scenario items preview several seeds side by side", async ({ page, signInAs }) => {
  await signInAs("educator");
  await page.goto("/bank?type=numeric&topic=lung-mechanics");
  await expect(page.getByRole("table", { name: "Items of the question bank" })).toBeVisible();
  await expectNoAxeViolations(page, "bank list");
  await page.goto("/bank/items/new");
  await expectNoAxeViolations(page, "new item form");
  await page.goto("/bank");
  await page.getByRole("link", { name: /^On your morning check you set an inspiratory hold/ }).click();
  const cards = page.getByTestId("seed-card");
  await expect(cards).toHaveCount(3);
  const texts = await cards.allTextContents();
  expect(new Set(texts).size).toBe(3);
  for (const t of texts) expect(t).toMatch(/Bench answer: [\d.]+ mL\/cmH2O/);
  await expectNoAxeViolations(page, "scenario item page");
});

test("a scenario item: the educator picks a template, narrows a range, writes the stem with placeholders and previews several seeds", async ({ page, signInAs }) => {
  await signInAs("educator");
  await newItem(page, "Scenario (numbers drawn by the bench)");
  await page.getByLabel("Bench template").selectOption({ label: "Volume control with a pause: static compliance from PIP and Pplat" });
  await expectNoAxeViolations(page, "new item form (scenario)");
  await page.getByLabel("Stem").fill("E2E scenario: Vt {tidalVolumeMl} mL, Pplat {pplatCmH2O} cmH2O, PEEP {peepCmH2O} cmH2O. Static compliance?");
  await page.getByLabel("Topics").selectOption([{ label: "Lung mechanics" }]);
  await page.getByLabel("tidalVolumeMl from").fill("450");
  await page.getByLabel("tidalVolumeMl to").fill("500");
  await page.getByLabel("Preview seeds").fill("1, 2, 3, 4");
  await page.getByLabel("Rationale").fill("Static compliance = Vt / (Pplat − PEEP), from the numbers the bench drew.");
  await page.getByLabel("Reference").fill(REFERENCE);
  await saveAndOpen(page);
  const cards = page.getByTestId("seed-card");
  await expect(cards).toHaveCount(4);
  for (const text of await cards.allTextContents()) {
    // Every seed's tidal volume is inside the narrowed range, and the answer comes from the bench.
    expect(text).toMatch(/Vt (450|500) mL, Pplat [\d.]+ cmH2O, PEEP \d+ cmH2O\. Static compliance\?/);
    expect(text).toMatch(/Bench answer: [\d.]+ mL\/cmH2O/);
  }
});

test("retiring asks twice in place, and a retired item can return to published", async ({ page, signInAs }) => {
  await signInAs("educator");
  await page.goto("/bank?status=published&q=static%20compliance");
  await page.getByRole("table", { name: "Items of the question bank" }).getByRole("link").first().click();
  await page.getByRole("button", { name: "Retire" }).click();
  await expect(page.getByText(/^Retire this item\?/)).toBeFocused();
  await expectNoAxeViolations(page, "item page asking to retire");
  await page.getByRole("button", { name: "Yes, retire it" }).click();
  await expect(page.getByText("Retired: new exams no longer draw it")).toBeVisible();
  await expect(page.locator("[data-status=retired]")).toBeVisible();
  await page.getByRole("button", { name: "Return to published" }).click();
  await expect(page.getByText("Published again.")).toBeVisible();
});

test("a therapist cannot reach the bank or an unpublished item by address", async ({ page, signInAs, consoleGuard }) => {
  consoleGuard.allow(/status of 403/);
  // After an error document the browser may also ask for /favicon.ico (the app links an SVG icon).
  consoleGuard.allow(/favicon\.ico/);
  await signInAs("therapist");
  expect((await page.goto("/bank"))?.status()).toBe(403);
  expect((await page.goto(`/bank/items/${await unpublishedItemId()}`))?.status()).toBe(403);
  expect((await page.goto("/bank/export?format=json"))?.status()).toBe(403);
  await page.goto("/today");
  await expect(page.getByRole("navigation").getByRole("link", { name: "Bank" })).toHaveCount(0);
});
