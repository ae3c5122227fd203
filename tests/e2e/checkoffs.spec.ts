/**
 * Issue 7, Acceptance, in Debian's chromium at a tablet viewport (820 × 1180, a common 10.9-inch
 * tablet in portrait): a preceptor opens a requested check-off, marks steps, reloads mid-way and
 * finds every mark, signs with the PIN; the therapist acknowledges on the same tablet; the
 * record shows both signatures (name, date and time with the time zone, meaning — 21 CFR Part 11
 * §11.50); editing afterwards is impossible and an addendum is shown beside it. Every new page
 * passes axe (WCAG 2.0/2.1/2.2 A and AA) at this viewport.
 */
import type { Browser, Page } from "@playwright/test";
import { expectNoAxeViolations } from "../fixtures/axe";
import { seededChecklistId, seededCheckoffId } from "../fixtures/checkoffs";
import { APP_URL, DEMO, type DemoKey } from "../fixtures/e2e-env";
import { expect, test } from "../fixtures/test";

const TABLET = { width: 820, height: 1180 };
test.use({ viewport: TABLET, hasTouch: true });

const PINS: Partial<Record<DemoKey, string>> = { therapist: "482913", preceptor: "730415", educator: "915062" };

async function tabletPage(browser: Browser, signInAs: (who: DemoKey, context?: import("@playwright/test").BrowserContext) => Promise<unknown>, who: DemoKey, watch: (p: Page) => void): Promise<Page> {
  const context = await browser.newContext({ viewport: TABLET, hasTouch: true });
  await signInAs(who, context);
  const page = await context.newPage();
  watch(page);
  return page;
}

/** Sets the person's signing PIN on the Signing PIN page, unless an earlier test already did. */
async function ensurePin(page: Page, who: DemoKey) {
  await page.goto("/checkoffs/signing-pin");
  if (await page.getByTestId("pin-set").isVisible()) return;
  await page.getByLabel("New signing PIN").fill(PINS[who]!);
  await page.getByLabel("The same PIN again").fill(PINS[who]!);
  await page.getByRole("button", { name: "Set my signing PIN" }).click();
  await expect(page.getByTestId("pin-set")).toBeVisible();
}

const stepButton = (page: Page, step: number, result: "Met" | "Not met" | "Not applicable") =>
  page.getByRole("group", { name: `Step ${step}: result` }).getByRole("button", { name: new RegExp(`^(✓ )?${result} — Step ${step}$`) });

test("a preceptor observes, signs with the PIN; the therapist acknowledges; the signed record takes only addenda", async ({ browser, signInAs, consoleGuard }) => {
  test.setTimeout(90_000);
  const therapist = await tabletPage(browser, signInAs, "therapist", consoleGuard.watch);
  await ensurePin(therapist, "therapist");

  // The therapist asks for a check-off.
  await therapist.goto("/checkoffs");
  await therapist.getByLabel("Checklist").selectOption({ label: "In-line suctioning" });
  await therapist.getByRole("button", { name: "Ask for a check-off" }).click();
  await expect(therapist).toHaveURL(/\/checkoffs\/[0-9a-f-]{36}$/);
  const url = new URL(therapist.url()).pathname;
  await expect(therapist.getByTestId("checkoff-status")).toContainText("Requested");

  // The preceptor, on a tablet, finds it in "To observe" and starts.
  const tablet = await tabletPage(browser, signInAs, "preceptor", consoleGuard.watch);
  await ensurePin(tablet, "preceptor");
  await tablet.goto("/checkoffs");
  await tablet.getByRole("region", { name: /asked for/ }).getByRole("link", { name: /In-line suctioning/ }).first().click();
  await expect(tablet).toHaveURL(new RegExp(`${url}$`));
  await tablet.goto(url);
  await tablet.getByRole("button", { name: "Start the check-off" }).click();
  await expect(tablet.getByTestId("checkoff-status")).toContainText("In progress");
  const steps = await tablet.locator("[data-testid^=step-]").count();
  expect(steps).toBeGreaterThan(4);

  // Large touch targets: every result button is at least 44 px tall (PRODUCT.md).
  for (const box of await Promise.all((await tablet.getByRole("group", { name: /Step \d+: result/ }).getByRole("button").all()).map((b) => b.boundingBox()))) {
    expect(box!.height).toBeGreaterThanOrEqual(44);
  }

  // Marks steps 1–3 (one not applicable, a comment on one), each saved on the tap.
  await stepButton(tablet, 1, "Met").tap();
  await expect(tablet.getByTestId("step-1")).toHaveAttribute("data-result", "met");
  await tablet.getByLabel("Comment on step 2").fill("Closed suction catheter size checked against the tube.");
  await stepButton(tablet, 2, "Met").tap();
  await expect(tablet.getByTestId("step-2")).toHaveAttribute("data-result", "met");
  await stepButton(tablet, 3, "Not applicable").tap();
  await expect(tablet.getByTestId("step-3")).toHaveAttribute("data-result", "not-applicable");

  // An interruption: reload mid-way, and every mark is still there.
  await tablet.reload();
  await expect(tablet.getByTestId("step-1")).toHaveAttribute("data-result", "met");
  await expect(tablet.getByTestId("step-2")).toHaveAttribute("data-result", "met");
  await expect(tablet.getByTestId("step-3")).toHaveAttribute("data-result", "not-applicable");
  await expect(tablet.getByLabel("Comment on step 2")).toHaveValue("Closed suction catheter size checked against the tube.");
  await expect(stepButton(tablet, 1, "Met")).toHaveAttribute("aria-pressed", "true");
  await expect(tablet.getByTestId("progress")).toContainText(`3 of ${steps} steps marked`);
  await expectNoAxeViolations(tablet, "check-off in progress (tablet)");

  for (let i = 4; i <= steps; i++) {
    await stepButton(tablet, i, "Met").tap();
    await expect(tablet.getByTestId(`step-${i}`)).toHaveAttribute("data-result", "met");
  }
  await expect(tablet.getByTestId("progress")).toContainText(`${steps} of ${steps} steps marked`);

  await tablet.getByRole("combobox", { name: "Outcome" }).selectOption("competent");
  await tablet.getByRole("button", { name: "Save outcome" }).click();
  await tablet.reload();
  await expect(tablet.getByTestId("signing-problems")).toHaveCount(0);

  // A wrong PIN is refused with the tries left (the browser notes the 400); the right one signs.
  consoleGuard.allow(/status of 400/);
  const signSection = tablet.getByRole("region", { name: "Sign as the observer" });
  await signSection.getByLabel("Signing PIN").fill("000001");
  await signSection.getByRole("button", { name: "Sign the check-off" }).click();
  await expect(tablet.getByRole("alert")).toContainText("4 tries left");
  await tablet.getByRole("region", { name: "Sign as the observer" }).getByLabel("Signing PIN").fill(PINS.preceptor!);
  await tablet.getByRole("region", { name: "Sign as the observer" }).getByRole("button", { name: "Sign the check-off" }).click();
  await expect(tablet.getByText("This check-off is signed and cannot be edited.")).toBeVisible();

  // The therapist acknowledges on the preceptor's tablet with their own e-mail and PIN.
  const ack = tablet.getByRole("region", { name: "Therapist's acknowledgement" });
  await ack.getByLabel("Signer's work e-mail").fill(DEMO.therapist);
  await ack.getByLabel("Signing PIN").fill(PINS.therapist!);
  await ack.getByRole("button", { name: "Acknowledge" }).click();
  await expect(tablet.getByTestId("checkoff-status")).toContainText("Signed and acknowledged");

  // The record shows both signatures, each with name, time zone and meaning.
  const signatures = tablet.getByRole("region", { name: "Signatures" }).getByTestId("signature");
  await expect(signatures).toHaveCount(2);
  await expect(signatures.nth(0)).toContainText("Desmond Achterberg, RRT");
  await expect(signatures.nth(0)).toContainText("Meaning: Observed and judged competent");
  await expect(signatures.nth(0)).toContainText(/\d{1,2} \w{3} \d{4}, \d{2}:\d{2} \(America\/\w+\)/);
  await expect(signatures.nth(1)).toContainText("Meaning: Acknowledged by the therapist observed");
  await expect(signatures.nth(1)).toContainText("matches the record");

  // Editing afterwards is impossible: no step buttons, and a crafted request is refused.
  await expect(tablet.getByRole("group", { name: /Step \d+: result/ })).toHaveCount(0);
  consoleGuard.allow(/409/);
  const crafted = await tablet.request.post(`${APP_URL}${url}`, { form: { intent: "mark-step", stepIndex: "0", result: "not-met" }, headers: { Origin: APP_URL } });
  expect(crafted.status()).toBe(409);
  await expectNoAxeViolations(tablet, "signed check-off (tablet)");

  // A correction is a signed addendum shown beside the record.
  const addendum = tablet.getByRole("form", { name: "Add a signed addendum" });
  await addendum.getByLabel("Correction or note").fill("Step 3 was not applicable: the patient was on a heat and moisture exchanger.");
  await addendum.getByLabel("Signing PIN").fill(PINS.preceptor!);
  await tablet.getByRole("button", { name: "Sign and add the addendum" }).click();
  const added = tablet.getByTestId("addendum");
  await expect(added).toContainText("heat and moisture exchanger");
  await expect(added.getByTestId("signature")).toContainText("Meaning: Author of this addendum");
  await expect(tablet.getByTestId("step-3")).toContainText("Not applicable");

  // The therapist's own view and the print view show the same record.
  await therapist.goto(url);
  await expect(therapist.getByRole("region", { name: "Signatures" }).getByTestId("signature")).toHaveCount(2);
  await therapist.goto(`${url}/print`);
  await expect(therapist.getByText("Meaning: Author of this addendum")).toBeVisible();
  await expect(therapist.getByText("does not replace the device's instructions for use")).toBeVisible();
  await expectNoAxeViolations(therapist, "print view (tablet)");

  // The admin's audit page shows the chain whole and this check-off's history.
  const admin = await tabletPage(browser, signInAs, "admin", consoleGuard.watch);
  await admin.goto(`/admin/audit?checkoff=${url.split("/").pop()}`);
  await expect(admin.getByTestId("chain-state")).toContainText("The audit chain is whole");
  await expect(admin.getByRole("region", { name: /Audit history/ })).toContainText("checkoff.signed");
  await expect(admin.getByRole("region", { name: /Audit history/ })).toContainText("checkoff.acknowledged");
  await expect(admin.getByRole("region", { name: /Audit history/ })).toContainText("checkoff.addendum");
  await expectNoAxeViolations(admin, "Admin: audit trail with a check-off's history (tablet)");
  for (const p of [therapist, tablet, admin]) await p.context().close();
});

type Scan = { name: string; who: DemoKey; path: () => Promise<string> | string };
const SCANS: Scan[] = [
  { name: "Check-offs (therapist)", who: "therapist", path: () => "/checkoffs" },
  { name: "Check-offs (preceptor)", who: "preceptor", path: () => "/checkoffs" },
  { name: "Check-offs (manager)", who: "manager", path: () => "/checkoffs" },
  { name: "Signing PIN (educator, not set)", who: "educator", path: () => "/checkoffs/signing-pin" },
  { name: "Orientation (preceptor)", who: "preceptor", path: () => "/checkoffs/orientation" },
  { name: "Orientation (manager)", who: "manager", path: () => "/checkoffs/orientation" },
  { name: "Checklists (educator)", who: "educator", path: () => "/checkoffs/checklists" },
  { name: "A checklist (educator)", who: "educator", path: async () => `/checkoffs/checklists/${await seededChecklistId("kestrel-valley")}` },
  { name: "A checklist (therapist)", who: "therapist", path: async () => `/checkoffs/checklists/${await seededChecklistId("kestrel-valley")}` },
  { name: "Admin: audit trail", who: "admin", path: () => "/admin/audit" },
  { name: "A requested check-off (preceptor)", who: "preceptor", path: async () => `/checkoffs/${await seededCheckoffId("kestrel-valley")}` },
  { name: "A requested check-off with evidence (therapist)", who: "therapist", path: async () => `/checkoffs/${await seededCheckoffId("kestrel-valley")}` },
  { name: "Print view of a check-off (manager)", who: "manager", path: async () => `/checkoffs/${await seededCheckoffId("kestrel-valley")}/print` },
];

const DESKTOP = { width: 1280, height: 800 };

for (const [size, viewport] of [
  ["tablet", TABLET],
  ["desktop", DESKTOP],
] as const) {
  for (const scan of SCANS) {
    test(`axe at ${size} size: ${scan.name}`, async ({ browser, signInAs, consoleGuard }) => {
      const context = await browser.newContext({ viewport, hasTouch: size === "tablet" });
      await signInAs(scan.who, context);
      const page = await context.newPage();
      consoleGuard.watch(page);
      const response = await page.goto(await scan.path());
      expect(response?.status()).toBe(200);
      await page.waitForLoadState("networkidle");
      await expectNoAxeViolations(page, `${scan.name} at ${size} size`);
      await context.close();
    });
  }
}
