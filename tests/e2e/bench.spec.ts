/**
 * The Bench page in Debian's chromium (issue 3, acceptance): switching mode and pressing
 * "Stiffen the lung" changes the readings as the model says, a refused setting names its field
 * and range and changes nothing, an exercise loads with one click, no console errors (the
 * fixture's guard), and axe finds no WCAG 2.0/2.1/2.2 A or AA violations.
 *
 * Expected values come from the equation of motion, Paw = PEEP + V/C + R·V̇ (Chatburn RL,
 * El-Khatib M, Mireles-Cabodevila E, "A taxonomy for mechanical ventilation: 10 fundamental
 * maxims", Respir Care 2014;59(11):1747–63) and pressure-controlled filling,
 * Vt = C·ΔP·(1 − e^(−Ti/τ)) (Yartsev A, Deranged Physiology, "Time constants"; TESTING.md V17),
 * computed with the calculation functions — not with the simulator that drew the page.
 *
 * The page's free-play patient (app/routes/bench/exercises.ts): C 50 mL/cmH2O, R 10 cmH2O/(L/s),
 * PEEP 5; volume control 500 mL at 60 L/min constant; pressure control 15 cmH2O for 1 s.
 */
import type { Page } from "@playwright/test";
import { pressureControlTidalVolumeMl, volumeControlPressures } from "../../app/domain/bench/calculations";
import { expectNoAxeViolations } from "../fixtures/axe";
import { expect, test } from "../fixtures/test";

const PEEP = 5;
const C = 50;
const R = 10;

async function openBench(page: Page, path = "/bench") {
  const response = await page.goto(path);
  expect(response?.status()).toBe(200);
  await expect(page.getByRole("heading", { level: 1, name: "Bench" })).toBeVisible();
  // Hydrated: the buttons now act.
  await expect(page.locator("section[data-interactive=true]")).toBeVisible();
}

const latestTable = (page: Page) => page.getByRole("table", { name: /^Latest breath/ });

async function reading(page: Page, row: RegExp): Promise<number> {
  const text = await latestTable(page).getByRole("row", { name: row }).getByRole("cell").first().textContent();
  const value = Number((text ?? "").trim().replace("\u2212", "-"));
  expect(Number.isFinite(value), `reading ${row} was "${text}"`).toBe(true);
  return value;
}

async function expectLatestBreath(page: Page, breath: number) {
  await expect(latestTable(page)).toHaveAccessibleName(new RegExp(`^Latest breath: breath ${breath}\\b`));
}

async function switchMode(page: Page, mode: string) {
  await page.getByLabel("Mode", { exact: true }).selectOption({ label: mode });
  await page.getByRole("button", { name: "Apply settings" }).click();
  await expect(page.getByRole("heading", { level: 2, name: new RegExp(`^${mode}`) })).toBeVisible();
}

async function stiffenAndStep(page: Page, nextBreath: number) {
  await page.getByRole("button", { name: /Stiffen the lung/ }).click();
  await expect(page.getByText(new RegExp(`Stiffen the lung: .*from breath ${nextBreath}\\.`))).toBeVisible();
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expectLatestBreath(page, nextBreath);
}

test("switching mode and stiffening the lung change the readings as the equation of motion says", async ({ page, signInAs }) => {
  await signInAs("therapist");
  await openBench(page);
  // The server-rendered first frame already has three breaths of readings.
  await expectLatestBreath(page, 3);
  await page.getByRole("button", { name: "Pause" }).click();
  await expect(page.getByRole("button", { name: "Resume" })).toBeVisible();

  // Pressure control: volume follows the lung. Vt = 50 × 15 × (1 − e^(−1/0.5)) = 648.5 mL.
  await switchMode(page, "Pressure control");
  await expectLatestBreath(page, 3);
  expect(await reading(page, /Inspiratory pressure aimed for/)).toBe(15);
  expect(await reading(page, /Peak inspiratory pressure/)).toBeCloseTo(PEEP + 15, 1);
  const pcNormal = await reading(page, /Inspired tidal volume/);
  const pcExpected = pressureControlTidalVolumeMl(C, 15, 1, R);
  expect(Math.abs(pcNormal - pcExpected) / pcExpected).toBeLessThan(0.01);

  // Half the compliance: 25 × 15 × (1 − e^(−1/0.25)) = 368.1 mL, at the same airway pressure.
  await stiffenAndStep(page, 4);
  const pcStiff = await reading(page, /Inspired tidal volume/);
  const pcStiffExpected = pressureControlTidalVolumeMl(C / 2, 15, 1, R);
  expect(pcStiff).toBeLessThan(pcNormal);
  expect(Math.abs(pcStiff - pcStiffExpected) / pcStiffExpected).toBeLessThan(0.01);
  expect(await reading(page, /Peak inspiratory pressure/)).toBeCloseTo(PEEP + 15, 1);

  // Volume control (a new run with the set lung): PIP = 5 + 500/50 + 10 × 1 = 25 cmH2O.
  await switchMode(page, "Volume control");
  await expectLatestBreath(page, 3);
  const normal = volumeControlPressures(PEEP, 500, C, R, 60).pipCmH2O;
  const pipBefore = await reading(page, /Peak inspiratory pressure/);
  expect(pipBefore).toBeCloseTo(normal, 1);
  expect(await reading(page, /Inspired tidal volume/)).toBe(500);

  // Stiffen: the very next breath has PIP = 5 + 500/25 + 10 = 35 — up by exactly Vt/C_new − Vt/C.
  await stiffenAndStep(page, 4);
  const stiff = volumeControlPressures(PEEP, 500, C / 2, R, 60).pipCmH2O;
  const pipAfter = await reading(page, /Peak inspiratory pressure/);
  expect(pipAfter).toBeGreaterThan(pipBefore);
  expect(pipAfter).toBeCloseTo(stiff, 1);
  expect(pipAfter - pipBefore).toBeCloseTo(500 / (C / 2) - 500 / C, 1);
  expect(await reading(page, /Inspired tidal volume/)).toBe(500);

  // Restore: back to 25 on the next breath.
  await page.getByRole("button", { name: /Restore the lung/ }).click();
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expectLatestBreath(page, 5);
  expect(await reading(page, /Peak inspiratory pressure/)).toBeCloseTo(normal, 1);
});

test("an implausible setting is refused next to its field, with its range, and nothing changes", async ({ page, signInAs }) => {
  await signInAs("therapist");
  await openBench(page);
  await page.getByRole("button", { name: "Pause" }).click();
  await page.getByLabel("Mode", { exact: true }).selectOption({ label: "Pressure control" });
  const volume = page.getByLabel("Tidal volume (mL)");
  await expect(volume).toHaveCount(0); // pressure control does not use a tidal volume
  await page.getByLabel("Mode", { exact: true }).selectOption({ label: "Volume control" });
  await page.getByLabel("Tidal volume (mL)").fill("5000");
  await page.getByLabel("Tidal volume (mL)").press("Enter");
  await expect(page.getByLabel("Tidal volume (mL)")).toHaveAttribute("aria-invalid", "true");
  await expect(page.getByText("Tidal volume must be a number between 20 and 2000 mL (got 5000)")).toBeVisible();
  await expect(page.getByLabel("Tidal volume (mL)")).toBeFocused();
  // Still the first run's 500 mL breaths.
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expectLatestBreath(page, 4);
  expect(await reading(page, /Inspired tidal volume/)).toBe(500);

  await page.getByLabel("Tidal volume (mL)").fill("400");
  await page.getByRole("button", { name: "Apply settings" }).click();
  await expect(page.getByLabel("Tidal volume (mL)")).not.toHaveAttribute("aria-invalid", "true");
  await expect(page.getByText("Applied from breath 5.")).toBeVisible();
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expectLatestBreath(page, 5);
  expect(await reading(page, /Inspired tidal volume/)).toBe(400);
});

test("an exercise loads with one click: the high-pressure limit cuts the breath and the alarm shows", async ({ page, signInAs }) => {
  await signInAs("therapist");
  await openBench(page);
  await page.getByRole("link", { name: "Load exercise: Volume control: the high-pressure limit ends the breath" }).click();
  await expect(page).toHaveURL(/\/bench\?exercise=vc-high-pressure-limit$/);
  await expect(page.getByRole("heading", { level: 2, name: "Volume control: the high-pressure limit ends the breath" })).toBeFocused();
  await expect(page.locator("section[data-interactive=true]")).toBeVisible();
  await page.getByRole("button", { name: "Pause" }).click();
  await expectLatestBreath(page, 3);
  await expect(page.getByRole("alert").filter({ hasText: "Alarm" })).toHaveCount(0);
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expectLatestBreath(page, 4);
  // Compliance 20 from breath 4: pressure meets the 30 cmH2O limit when 5 + V/20 + 10 × 1 = 30,
  // so V = 300 mL of the 500 set.
  const delivered = await reading(page, /Inspired tidal volume/);
  expect(Math.abs(delivered - 300)).toBeLessThanOrEqual(1);
  expect(await reading(page, /Peak inspiratory pressure/)).toBeCloseTo(30, 1);
  const alarm = page.getByRole("alert").filter({ hasText: "Alarm" });
  await expect(alarm).toContainText("High pressure.");
  await expect(alarm).toContainText("300 of 500 mL delivered");
  await page.getByText("Show the answer").click();
  await expect(page.getByText(/Answer\. About 300 mL\./)).toBeVisible();
});

test("axe: the Bench page, running, with a refused field, and with an exercise and an alarm", async ({ newGuardedPage, signInAs }) => {
  // Four full-page scans of the largest page, each several seconds on a busy 2-core machine.
  test.setTimeout(90_000);
  const page = await newGuardedPage();
  await signInAs("therapist", page.context());
  await openBench(page);
  await page.getByRole("button", { name: "Pause" }).click();
  await expectNoAxeViolations(page, "Bench, free play");

  await page.getByLabel("Compliance (mL/cmH2O)").fill("-20");
  await page.getByRole("button", { name: "Apply settings" }).click();
  await expect(page.getByText("Compliance must be a number between 1 and 200 mL/cmH2O (got -20)")).toBeVisible();
  await page.getByText("Readings, breath by breath").click();
  await expectNoAxeViolations(page, "Bench, a refused field and the readings table open");

  await openBench(page, "/bench?exercise=vc-high-pressure-limit");
  await page.getByRole("button", { name: "Pause" }).click();
  await page.getByRole("button", { name: "Step one breath" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "High pressure." })).toBeVisible();
  await page.getByText("Show the answer").click();
  await expectNoAxeViolations(page, "Bench, an exercise with its answer and an alarm");
});
