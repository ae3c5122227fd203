/**
 * Issue 9 §3, the Clearance board, in Debian's chromium: a therapist opens /clearance and sees
 * their own unit's board (and no other unit's); a manager filters by a skill; the page offers
 * "Print for the shift" and the caution; every cell gives a level word with its reason. Each view
 * passes axe (WCAG 2.0/2.1/2.2 A and AA).
 */
import { expectNoAxeViolations } from "../fixtures/axe";
import { personByEmail } from "../fixtures/e2e-db";
import { DEMO, type DemoKey } from "../fixtures/e2e-env";
import { expect, test } from "../fixtures/test";

const LEVEL_WORDS = /^(Independent|Supervised|Not cleared)/;

test("a therapist opens the Clearance board and sees their own unit's board", async ({ page, signInAs }) => {
  await signInAs("therapist");
  const me = await personByEmail(DEMO.therapist);
  await page.goto("/clearance");
  await expect(page.getByRole("heading", { level: 1, name: "Clearance board" })).toBeVisible();
  await expect(page.getByTestId("board-time")).toContainText(/board as of \d{1,2} \w{3} \d{4}, \d{2}:\d{2}/);

  // The demo therapist works on the Adult ICU only: that board, with them on it, and no other.
  const boards = page.getByTestId("unit-board");
  await expect(boards).toHaveCount(1);
  await expect(boards.first().getByRole("heading", { level: 2 })).toHaveText("Adult ICU");
  const myRow = page.getByTestId("board-row").filter({ has: page.getByRole("rowheader", { name: new RegExp(me.name) }) });
  await expect(myRow).toHaveCount(1);

  // Every cell names its level in words (never colour alone) and says why.
  const cells = myRow.getByTestId("board-cell");
  const count = await cells.count();
  expect(count).toBeGreaterThan(1);
  for (let i = 0; i < count; i++) {
    const cell = cells.nth(i);
    await expect(cell).toHaveText(LEVEL_WORDS);
    expect((await cell.innerText()).length).toBeGreaterThan(20);
  }

  await expect(page.getByRole("button", { name: "Print for the shift" })).toBeVisible();
  await expect(page.getByRole("complementary", { name: "Caution" })).toBeVisible();

  // Another unit is not offered in the filter.
  const unitOptions = await page.getByLabel("Unit").locator("option").allTextContents();
  expect(unitOptions).not.toContain("Neonatal ICU");
});

test("a manager filters the board by a skill", async ({ page, signInAs }) => {
  await signInAs("manager");
  await page.goto("/clearance");
  // Managers see every unit of the organisation.
  await expect(page.getByTestId("unit-board")).toHaveCount(4);

  await page.getByLabel("Skill").selectOption({ label: "In-line suctioning" });
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page).toHaveURL(/[?&]skill=/);
  await expect(page.getByLabel("Skill")).toHaveValue(/.+/);

  // One skill column per board, and every cell is of that skill.
  for (const board of await page.getByTestId("unit-board").all()) {
    await expect(board.getByRole("columnheader")).toHaveText(["Person", "In-line suctioning"]);
  }
  const skills = await page.getByTestId("board-cell").evaluateAll((cells) => [...new Set(cells.map((c) => c.getAttribute("data-skill")))]);
  expect(skills).toEqual(["In-line suctioning"]);

  // And by unit as well: one board left.
  await page.getByLabel("Unit").selectOption({ label: "Emergency" });
  await page.getByRole("button", { name: "Show" }).click();
  await expect(page.getByTestId("unit-board")).toHaveCount(1);
  await expect(page.getByTestId("unit-board").getByRole("heading", { level: 2 })).toHaveText("Emergency");

  await page.getByRole("link", { name: "Clear", exact: true }).click();
  await expect(page.getByTestId("unit-board")).toHaveCount(4);
});

const SCANS: { name: string; who: DemoKey; path: string }[] = [
  { name: "Clearance board (therapist)", who: "therapist", path: "/clearance" },
  { name: "Clearance board (manager)", who: "manager", path: "/clearance" },
  { name: "Clearance board with a refused filter (manager)", who: "manager", path: "/clearance?unit=does-not-exist" },
];

for (const scan of SCANS) {
  test(`axe: ${scan.name}`, async ({ newGuardedPage, signInAs }) => {
    // The manager's board is every therapist × every skill on four units: axe checks each cell.
    test.setTimeout(60_000);
    const page = await newGuardedPage();
    await signInAs(scan.who, page.context());
    const response = await page.goto(scan.path);
    expect(response?.status()).toBe(200);
    await page.waitForLoadState("networkidle");
    await expectNoAxeViolations(page, scan.name);
  });
}
