/**
 * Issue 9 §2, Acceptance, in Debian's chromium: the demo therapist opens Credentials, downloads a
 * certificate (a PDF file), opens its details, follows its verification address and sees it
 * Valid. The certificate page and the public /verify page pass axe (WCAG 2.0/2.1/2.2 A and AA);
 * an unknown code answers a bare 404.
 */
import { expectNoAxeViolations } from "../fixtures/axe";
import { UNKNOWN_CODE } from "../fixtures/certificates";
import { expect, test } from "../fixtures/test";

test("a therapist downloads a certificate and opens its verification address", async ({ page, signInAs }) => {
  await signInAs("therapist");
  await page.goto("/credentials");
  const section = page.getByRole("region", { name: "Your certificates" });
  await expect(section).toBeVisible();
  const row = section.getByRole("row").filter({ hasText: "Responding to a high-pressure alarm — competent" });
  await expect(row).toHaveCount(1);

  const downloading = page.waitForEvent("download");
  await row.getByRole("link", { name: /Download/ }).click();
  const download = await downloading;
  expect(download.suggestedFilename()).toMatch(/\.pdf$/);
  // The file is a PDF by its content (ISO 32000: it starts with "%PDF-").
  const stream = await download.createReadStream();
  const head = await new Promise<string>((resolve, reject) => {
    stream.once("data", (chunk: Buffer | string) => resolve(Buffer.from(chunk).subarray(0, 5).toString("latin1")));
    stream.once("error", reject);
  });
  expect(head).toBe("%PDF-");

  await row.getByRole("link", { name: "Responding to a high-pressure alarm — competent", exact: true }).click();
  await expect(page.getByRole("heading", { level: 1, name: "Certificate" })).toBeVisible();
  await expect(page.getByText("Valid", { exact: true })).toBeVisible();
  await expectNoAxeViolations(page, "Credentials: a certificate's details (holder)");

  await page.getByRole("link", { name: /\/verify\// }).click();
  await expect(page).toHaveURL(/\/verify\/[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}$/);
  await expect(page.getByRole("heading", { level: 1, name: "Certificate check" })).toBeVisible();
  await expect(page.getByTestId("certificate-state")).toHaveText("Valid");
  await expect(page.getByText("Marisol Ellingsen")).toBeVisible();
  await expectNoAxeViolations(page, "Verify: a valid certificate (public)");
});

test("an unknown verification code answers a bare 404", async ({ request }) => {
  const response = await request.get(`/verify/${UNKNOWN_CODE}`);
  expect(response.status()).toBe(404);
  expect(await response.text()).toBe("Not Found");
});
