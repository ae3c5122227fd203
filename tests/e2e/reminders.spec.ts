/**
 * Issue 9 §1, in Debian's chromium: an admin changes a reminder threshold on Admin → Reminders
 * and sees it saved (and put back, so the shared e2e database keeps the seeded policy; the largest
 * number — the Due-soon window other specs rely on — never changes); a refused entry shows its
 * message beside the field; axe scans of Admin → Reminders (admin) and My plan → Reminders
 * (therapist), WCAG 2.0/2.1/2.2 A and AA.
 */
import { expectNoAxeViolations } from "../fixtures/axe";
import { statusNote } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

test.describe.configure({ mode: "serial" });

const SEEDED = "90, 60, 30, 14, 7";

test("an admin adds a 3-day reminder, sees it saved, and a wrong entry is refused with a message", async ({ page, signInAs, consoleGuard }) => {
  consoleGuard.allow(statusNote(400));
  await signInAs("admin");
  await page.goto("/admin/reminders");
  const days = page.getByLabel("Days before the date");
  await expect(days).toHaveValue(SEEDED);

  await days.fill(`${SEEDED}, 3`);
  await page.getByRole("button", { name: "Save reminder policy" }).click();
  await expect(page.getByRole("status")).toHaveText("Reminder policy saved.");
  await page.reload();
  await expect(page.getByLabel("Days before the date")).toHaveValue(`${SEEDED}, 3`);

  await page.getByLabel("Days before the date").fill("90, soon");
  await page.getByRole("button", { name: "Save reminder policy" }).click();
  await expect(page.getByText("“soon” is not a whole number of days. Separate numbers with commas.")).toBeVisible();
  await expect(page.getByLabel("Days before the date")).toHaveAttribute("aria-invalid", "true");

  await page.getByLabel("Days before the date").fill(SEEDED);
  await page.getByRole("button", { name: "Save reminder policy" }).click();
  await expect(page.getByRole("status")).toHaveText("Reminder policy saved.");
  await page.reload();
  await expect(page.getByLabel("Days before the date")).toHaveValue(SEEDED);
});

const SCANS = [
  { name: "Admin: reminder policy", who: "admin", path: "/admin/reminders" },
  { name: "My plan: reminders (therapist)", who: "therapist", path: "/plan/reminders" },
] as const;

for (const scan of SCANS) {
  test(`axe: ${scan.name}`, async ({ newGuardedPage, signInAs }) => {
    const page = await newGuardedPage();
    await signInAs(scan.who, page.context());
    const response = await page.goto(scan.path);
    expect(response?.status()).toBe(200);
    await page.waitForLoadState("networkidle");
    await expectNoAxeViolations(page, scan.name);
  });
}
