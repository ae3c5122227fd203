/**
 * Tidemark with the keyboard alone (issue 11, item 5; PRODUCT.md "every page works with the
 * keyboard"): WCAG 2.1.1 Keyboard asks that all functionality be operable through a keyboard
 * interface (W3C, WCAG 2.2, 2023). Every step below reaches its control with Tab (never a click,
 * never a programmatic focus) and acts with Enter, Space, arrow keys or typing:
 * - sign in (the code read from the e-mail fake's outbox, as the sign-in tests do), open an exam
 *   of every question kind, answer each, hand it in;
 * - a preceptor at the bedside: set a signing PIN, start a requested check-off, mark every step,
 *   choose the outcome and sign with the PIN.
 * And the exam's timing accommodations (WCAG 2.2.1 Timing Adjustable: a limit can be turned off,
 * adjusted to at least ten times the default, or the person is warned at least 20 seconds before
 * it ends): a tenfold extra time shows the longer time and warns before the end; an untimed
 * sitting has no deadline. exams.spec.ts covers a 2× sitting's deadline on the server.
 */
import type { Locator, Page } from "@playwright/test";
import { signInByEmail } from "../fixtures/bank";
import { all, e2eDb, one, personByEmail, resetClientRateLimits } from "../fixtures/e2e-db";
import { DEMO } from "../fixtures/e2e-env";
import { outboxMark, readLatestCode } from "../fixtures/outbox";
import { publishPracticeExam } from "../fixtures/practice-exam";
import { spareAddress } from "../fixtures/sign-in-flow";
import { expect, test } from "../fixtures/test";

/** Presses Tab until the target has the focus: fails if the keyboard cannot reach it. */
async function tabTo(page: Page, target: Locator, max = 120): Promise<void> {
  for (let i = 0; i <= max; i++) {
    if (await target.evaluate((el) => el === document.activeElement).catch(() => false)) return;
    await page.keyboard.press("Tab");
  }
  throw new Error(`Tab never reached ${target}`);
}

/**
 * Opens a page and waits until it has hydrated (no requests in flight), as a person reads a page
 * before acting: the keys below then act on the running app, like the other browser tests' clicks.
 */
async function open(page: Page, path: string): Promise<void> {
  await page.goto(path);
  await page.waitForLoadState("networkidle");
}

/** Seeded Kestrel Valley therapists (therapist role only), from the end of the list: the sign-in tests take theirs from the start. */
async function plainTherapists(count: number): Promise<{ id: string; email: string }[]> {
  const rows = await all<{ id: string; email: string }>(
    `SELECT p.id, p.email FROM people p JOIN organisations o ON o.id = p.org_id
      WHERE o.slug = 'kestrel-valley' AND p.active = 1 AND p.email NOT IN (?, ?, ?, ?, ?)
        AND (SELECT group_concat(role) FROM person_roles r WHERE r.person_id = p.id) = 'therapist'
      ORDER BY p.email DESC LIMIT ?`,
    [DEMO.therapist, DEMO.preceptor, DEMO.educator, DEMO.manager, DEMO.admin, count],
  );
  if (rows.length < count) throw new Error(`Only ${rows.length} seeded therapists without other roles`);
  return rows;
}

test("sign in, take an exam of every question kind and hand it in, with the keyboard alone", async ({ page }) => {
  test.setTimeout(120_000);
  const title = "E2E keyboard: one question of each kind";
  const examId = await publishPracticeExam(title, { minutes: 30, types: ["single", "multiple", "numeric", "ordering", "waveform-point"] });
  const email = await spareAddress("keyboard-exam");

  // Sign-in: the e-mail field, Enter; the code from the e-mail, Enter.
  await resetClientRateLimits();
  const mark = await outboxMark();
  await open(page, "/login");
  await tabTo(page, page.getByLabel("Work e-mail"));
  await page.keyboard.type(email);
  await page.keyboard.press("Enter");
  await page.waitForURL((url) => url.pathname === "/login/code");
  await page.waitForLoadState("networkidle");
  const code = await readLatestCode(email, mark);
  await tabTo(page, page.getByLabel("6-digit code"));
  await page.keyboard.type(code);
  await page.keyboard.press("Enter");
  await page.waitForURL((url) => url.pathname === "/today");

  // To the exam: the section strip, the exam's link, the start button.
  await tabTo(page, page.getByRole("navigation", { name: "Sections" }).getByRole("link", { name: "Exams" }));
  await page.keyboard.press("Enter");
  await expect(page.getByRole("heading", { level: 1, name: "Exams" })).toBeVisible();
  await tabTo(page, page.getByRole("link", { name: `Start ${title}` }));
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(new RegExp(`/exams/${examId}/start$`));
  await tabTo(page, page.getByRole("button", { name: "Start the exam" }));
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
  const attemptId = new URL(page.url()).pathname.split("/").pop()!;

  const question = page.getByTestId("question");
  const saved = () => expect(page.getByTestId("saved-indicator")).toHaveText("All answers saved");
  const next = async (n: number) => {
    await tabTo(page, page.getByRole("button", { name: "Next question" }));
    await page.keyboard.press("Enter");
    // Moving on puts the focus on the new question's heading, so Tab continues from there.
    await expect(page.getByRole("heading", { name: `Question ${n} of 5` })).toBeFocused();
  };

  // 1. Single best answer: Tab into the radio group, an arrow key chooses (WAI-ARIA radio group pattern).
  await expect(page.getByRole("heading", { name: "Question 1 of 5" })).toBeVisible();
  await tabTo(page, question.getByRole("radio").first());
  await page.keyboard.press("Space");
  await page.keyboard.press("ArrowDown");
  await expect(question.getByRole("radio").nth(1)).toBeChecked();
  await saved();

  // 2. Multiple response: Space ticks a box, Tab moves to the next.
  await next(2);
  await tabTo(page, question.getByRole("checkbox").nth(1));
  await page.keyboard.press("Space");
  await page.keyboard.press("Tab");
  await page.keyboard.press("Space");
  await expect(question.getByRole("checkbox").nth(1)).toBeChecked();
  await expect(question.getByRole("checkbox").nth(2)).toBeChecked();
  await saved();

  // 3. Numeric: typed, saved when the focus leaves the field.
  await next(3);
  await tabTo(page, question.getByRole("textbox", { name: /^Your answer/ }));
  await page.keyboard.type("12");
  await page.keyboard.press("Tab");
  await saved();

  // 4. Ordering: the move buttons.
  await next(4);
  await tabTo(page, question.getByRole("button", { name: /^Move ".*" down$/ }).first());
  await page.keyboard.press("Enter");
  await expect(question.getByText(/is now step 2 of/)).toBeAttached();
  await saved();

  // 5. Waveform point: the slider under the plot and its button (the plot's keyboard alternative).
  await next(5);
  await tabTo(page, question.getByRole("slider"));
  for (let i = 0; i < 5; i++) await page.keyboard.press("ArrowRight");
  await page.keyboard.press("Tab");
  await expect(page.locator(":focus")).toHaveText(/^Choose [\d.]+ s$/);
  await page.keyboard.press("Enter");
  await expect(question.getByText(/^You marked [\d.]+ s\.$/)).toBeVisible();
  await saved();

  // Hand in, confirm.
  await tabTo(page, page.getByRole("button", { name: "Hand in the exam" }));
  await page.keyboard.press("Enter");
  await expect(page.getByText("You have answered every question.")).toBeVisible();
  await tabTo(page, page.getByRole("button", { name: "Yes, hand it in" }));
  await page.keyboard.press("Enter");
  await expect(page).toHaveURL(new RegExp(`/exams/attempts/${attemptId}/result$`));
  await expect(page.getByTestId("result-summary")).toContainText("handed in");

  // The server holds all five answers, as given.
  const rows = await all<{ position: number; answer: string | null }>("SELECT position, answer FROM responses WHERE attempt_id = ? ORDER BY position", [attemptId]);
  expect(rows.map((r) => r.position)).toEqual([0, 1, 2, 3, 4]);
  const kinds = rows.map((r) => (JSON.parse(r.answer ?? "null") as { kind?: string } | null)?.kind);
  expect(kinds).toEqual(["single", "multiple", "numeric", "ordering", "waveform-point"]);
  expect(JSON.parse(rows[1].answer!).choices).toHaveLength(2);
  expect(JSON.parse(rows[2].answer!).text).toBe("12");
  const closed = await one<{ closed_reason: string }>("SELECT closed_reason FROM attempts WHERE id = ?", [attemptId]);
  expect(closed?.closed_reason).toBe("submitted");
});

const PRECEPTOR_PIN = "604182";

test("a preceptor observes and signs a check-off at the bedside with the keyboard alone", async ({ page }) => {
  test.setTimeout(120_000);
  const preceptor = await one<{ id: string; email: string; org_id: string }>(
    `SELECT p.id, p.email, p.org_id FROM people p JOIN person_roles r ON r.person_id = p.id
      WHERE r.role = 'preceptor' AND p.active = 1 AND p.email <> ? AND p.org_id = (SELECT org_id FROM people WHERE email = ?)
      ORDER BY p.email LIMIT 1`,
    [DEMO.preceptor, DEMO.preceptor],
  );
  if (!preceptor) throw new Error("No second preceptor seeded in Kestrel Valley");
  const [therapist] = await plainTherapists(1);
  const checklist = await one<{ version_id: string; title: string }>(
    "SELECT current_version_id AS version_id, title FROM checklists WHERE org_id = ? AND status = 'published' ORDER BY title DESC LIMIT 1",
    [preceptor.org_id],
  );
  const checkoffId = crypto.randomUUID();
  const now = Date.now();
  // The therapist's request, as the Check-offs page's "Ask for a check-off" records it.
  await e2eDb().execute({
    sql: "INSERT INTO checkoffs (id, org_id, person_id, checklist_version_id, status, created_at, updated_at) VALUES (?, ?, ?, ?, 'requested', ?, ?)",
    args: [checkoffId, preceptor.org_id, therapist.id, checklist!.version_id, now, now],
  });
  await signInByEmail(page.context(), preceptor.email);

  // A signing PIN, typed twice.
  await open(page, "/checkoffs/signing-pin");
  if (!(await page.getByTestId("pin-set").isVisible())) {
    await tabTo(page, page.getByLabel("New signing PIN"));
    await page.keyboard.type(PRECEPTOR_PIN);
    await tabTo(page, page.getByLabel("The same PIN again"));
    await page.keyboard.type(PRECEPTOR_PIN);
    await tabTo(page, page.getByRole("button", { name: "Set my signing PIN" }));
    await page.keyboard.press("Enter");
    await expect(page.getByTestId("pin-set")).toBeVisible();
  }

  await open(page, `/checkoffs/${checkoffId}`);
  await tabTo(page, page.getByRole("button", { name: "Start the check-off" }));
  await page.keyboard.press("Enter");
  await expect(page.getByTestId("checkoff-status")).toContainText("In progress");
  const steps = await page.locator("[data-testid^=step-]").count();
  expect(steps).toBeGreaterThan(2);

  // Each step: Tab to its "Met" button, Enter; a comment typed on step 1 goes with its mark.
  await tabTo(page, page.getByLabel("Comment on step 1"));
  await page.keyboard.type("Explained each step to the patient first.");
  for (let i = 1; i <= steps; i++) {
    const met = page.getByRole("group", { name: `Step ${i}: result` }).getByRole("button", { name: new RegExp(`^(✓ )?Met — Step ${i}$`) });
    await tabTo(page, met);
    await page.keyboard.press(i % 2 ? "Enter" : "Space");
    await expect(page.getByTestId(`step-${i}`)).toHaveAttribute("data-result", "met");
    await expect(met).toHaveAttribute("aria-pressed", "true");
  }
  await expect(page.getByTestId("progress")).toContainText(`${steps} of ${steps} steps marked`);

  // The outcome: a native select, chosen with the arrow keys, saved with Enter on its button.
  const outcome = page.getByRole("combobox", { name: "Outcome" });
  await tabTo(page, outcome);
  await page.keyboard.press("ArrowDown");
  await expect(outcome).toHaveValue("competent");
  await tabTo(page, page.getByRole("button", { name: "Save outcome" }));
  await page.keyboard.press("Enter");
  const sign = page.getByRole("region", { name: "Sign as the observer" });
  await expect(sign.getByRole("button", { name: "Sign the check-off" })).toBeEnabled();

  // Sign with the PIN: typed, then Enter on the sign button.
  await tabTo(page, sign.getByLabel("Signing PIN"));
  await page.keyboard.type(PRECEPTOR_PIN);
  await tabTo(page, sign.getByRole("button", { name: "Sign the check-off" }));
  await page.keyboard.press("Enter");
  await expect(page.getByText("This check-off is signed and cannot be edited.")).toBeVisible();

  const row = await one<{ status: string; outcome: string; preceptor_id: string }>("SELECT status, outcome, preceptor_id FROM checkoffs WHERE id = ?", [checkoffId]);
  expect(row).toMatchObject({ status: "signed", outcome: "competent", preceptor_id: preceptor.id });
  const comment = await one<{ comment: string }>("SELECT comment FROM checkoff_step_results WHERE checkoff_id = ? AND step_index = 0", [checkoffId]);
  expect(comment?.comment).toBe("Explained each step to the patient first.");
});

test.describe("timing accommodations (WCAG 2.2.1 Timing Adjustable)", () => {
  const title = "E2E timing: a one-minute exam";

  async function grant(personId: string, kind: "multiplier" | "untimed", multiplier: number | null) {
    const manager = await personByEmail(DEMO.manager);
    await e2eDb().execute({
      sql: "INSERT INTO accommodations (id, org_id, person_id, kind, multiplier, reason, granted_by, created_at) VALUES (?, ?, ?, ?, ?, 'E2E: timing accommodation', ?, ?)",
      args: [crypto.randomUUID(), manager.org_id, personId, kind, multiplier, manager.id, Date.now()],
    });
  }

  test("ten times the time: the start page and the countdown show it, and the page warns at 5 minutes and at 1 minute left", async ({ page }) => {
    const examId = await publishPracticeExam(title, { minutes: 1, types: ["single"] });
    const [, person] = await plainTherapists(2);
    await grant(person.id, "multiplier", 10);
    await signInByEmail(page.context(), person.email);
    // The browser's clock is ours to move (the server's deadline is not): the warnings are the page's.
    await page.clock.install();
    await page.goto(`/exams/${examId}/start`);
    await expect(page.getByTestId("time-allowed")).toContainText("You have 10 min — 10× the standard 1 min, your accommodation");
    await page.getByRole("button", { name: "Start the exam" }).click();
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
    const attemptId = new URL(page.url()).pathname.split("/").pop()!;
    const row = await one<{ allowed_seconds: number; started_at: number; deadline_at: number }>("SELECT allowed_seconds, started_at, deadline_at FROM attempts WHERE id = ?", [attemptId]);
    expect(row?.allowed_seconds).toBe(600);
    expect(row!.deadline_at - row!.started_at).toBe(600_000);
    await expect(page.getByTestId("countdown")).toContainText(/(10:00|09:5\d)/);
    const warning = page.getByTestId("time-warning");
    await expect(warning).toHaveText("");

    // 5 minutes before the end: announced (aria-live="assertive"), with time to act.
    await page.clock.fastForward("05:02");
    await expect(warning).toHaveText(/^(5 min|4 min 5\d s) left\. Answers saved by the end are graded\.$/);
    await expect(warning).toHaveAttribute("aria-live", "assertive");
    // 1 minute before the end: announced again, well over WCAG's 20 seconds ahead.
    await page.clock.fastForward("04:00");
    await expect(warning).toHaveText(/^(1 min|5\d s) left\. Answers saved by the end are graded\.$/);
    await expect(page.getByTestId("countdown")).toContainText(/00:5\d|01:00/);
  });

  test("an untimed sitting: no time limit on the start page or the exam, and no deadline on the server", async ({ page }) => {
    const examId = await publishPracticeExam(title, { minutes: 1, types: ["single"] });
    const [, , person] = await plainTherapists(3);
    await grant(person.id, "untimed", null);
    await signInByEmail(page.context(), person.email);
    await page.goto(`/exams/${examId}/start`);
    await expect(page.getByTestId("time-allowed")).toContainText("No time limit (your accommodation: an untimed sitting).");
    await page.getByRole("button", { name: "Start the exam" }).click();
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
    await expect(page.getByText("No time limit")).toBeVisible();
    await expect(page.getByTestId("countdown")).toHaveCount(0);
    const attemptId = new URL(page.url()).pathname.split("/").pop()!;
    const row = await one<{ allowed_seconds: number | null; deadline_at: number | null }>("SELECT allowed_seconds, deadline_at FROM attempts WHERE id = ?", [attemptId]);
    expect(row).toEqual({ allowed_seconds: null, deadline_at: null });
  });
});
