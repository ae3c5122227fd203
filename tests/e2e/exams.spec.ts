/**
 * Timed exams in Debian's chromium (issue 5, acceptance): a therapist starts a short timed exam,
 * answers, reloads mid-way and finds every answer, closes the page and resumes in another
 * browser context, lets the time run out and sees the graded result — graded by the server at
 * its deadline. A therapist with an accommodation gets the longer time (WCAG 2.2 SC 2.2.1,
 * W3C 2023). The exam pages pass axe with no WCAG A/AA violations.
 */
import { expectNoAxeViolations } from "../fixtures/axe";
import { all, e2eDb, one, personByEmail } from "../fixtures/e2e-db";
import { DEMO } from "../fixtures/e2e-env";
import { expect, test } from "../fixtures/test";

const TITLE = "E2E short timed exam";

/** A one-minute exam of three single-best-answer items sharing a topic, published directly. */
async function publishShortExam(): Promise<string> {
  const db = e2eDb();
  const educator = await personByEmail(DEMO.educator);
  const existing = await one<{ id: string }>("select id from exams where title = ? and org_id = ?", [TITLE, educator.org_id]);
  if (existing) return existing.id;
  const topic = await one<{ topic_id: string; slug: string }>(
    `select t.id as topic_id, t.slug as slug from topics t
       join item_version_topics ivt on ivt.topic_id = t.id
       join item_versions v on v.id = ivt.item_version_id
       join items i on i.current_version_id = v.id
      where t.org_id = ? and i.status = 'published' and v.type = 'single' and v.scenario is null
      group by t.id having count(*) >= 3 order by t.slug limit 1`,
    [educator.org_id],
  );
  const picked = await all<{ id: string }>(
    `select i.id from items i join item_versions v on v.id = i.current_version_id
       join item_version_topics ivt on ivt.item_version_id = v.id
      where i.org_id = ? and i.status = 'published' and v.type = 'single' and v.scenario is null and ivt.topic_id = ?
      order by i.id limit 3`,
    [educator.org_id, topic!.topic_id],
  );
  const examId = crypto.randomUUID();
  const versionId = crypto.randomUUID();
  const now = Date.now();
  await db.execute({
    sql: "insert into exams (id, org_id, title, status, current_version_id, created_by, created_at, updated_at) values (?, ?, ?, 'published', ?, ?, ?, ?)",
    args: [examId, educator.org_id, TITLE, versionId, educator.id, now, now],
  });
  await db.execute({
    sql: `insert into exam_versions (id, org_id, exam_id, version, description, blueprint, time_limit_minutes, pass_mark_percent, attempts_allowed,
            shuffle_items, shuffle_options, review_policy, multiple_response_scoring, ordering_scoring, published_at, created_at)
          values (?, ?, ?, 1, 'Three questions in one minute, for the browser tests.', ?, 1, 60, 5, 1, 1, 'full-rationale', 'all-or-nothing', 'exact', ?, ?)`,
    args: [versionId, educator.org_id, examId, JSON.stringify({ topics: { [topic!.slug]: 3 }, fixed: picked.map((p) => p.id) }), now, now],
  });
  return examId;
}

test.describe.serial("taking a timed exam", () => {
  let examId = "";
  test.beforeAll(async () => {
    examId = await publishShortExam();
  });

  test("answers survive a reload and a new browser; at the deadline the server grades what was saved", async ({ page, browser, signInAs, consoleGuard }) => {
    test.setTimeout(150_000);
    await signInAs("therapist");
    await page.goto("/exams");
    await expect(page.getByRole("heading", { level: 1, name: "Exams" })).toBeVisible();
    await expectNoAxeViolations(page, "exams page");
    await page.getByRole("link", { name: `Start ${TITLE}` }).click();

    await expect(page.getByTestId("time-allowed")).toContainText("You have 1 min");
    await expectNoAxeViolations(page, "start page");
    await page.getByRole("button", { name: "Start the exam" }).click();
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
    const attemptPath = new URL(page.url()).pathname;

    // One question at a time: answer the first, flag it, answer the second.
    await expect(page.getByRole("heading", { name: "Question 1 of 3" })).toBeVisible();
    const first = page.getByTestId("question");
    const firstChoice = await first.getByRole("radio").nth(1).evaluate((el) => (el.parentElement?.textContent ?? "").trim());
    await first.getByRole("radio").nth(1).check();
    await first.getByLabel("Flag to come back to").check();
    await expect(page.getByTestId("saved-indicator")).toHaveText("All answers saved");
    await page.getByRole("button", { name: "Next question" }).click();
    await expect(page.getByRole("heading", { name: "Question 2 of 3" })).toBeVisible();
    const secondChoice = await page.getByTestId("question").getByRole("radio").first().evaluate((el) => (el.parentElement?.textContent ?? "").trim());
    await page.getByTestId("question").getByRole("radio").first().check();
    await expect(page.getByTestId("saved-indicator")).toHaveText("All answers saved");
    // The time warning (at most 1 minute left) is announced.
    await expect(page.getByTestId("time-warning")).toContainText("left");
    await expectNoAxeViolations(page, "attempt page (one at a time, warning shown)");

    // A reload finds every answer, the flag, and the question the therapist was on.
    await page.reload();
    await expect(page.getByRole("heading", { name: "Question 2 of 3" })).toBeVisible();
    await expect(page.getByTestId("question").getByRole("radio", { name: secondChoice })).toBeChecked();
    await page.getByRole("button", { name: "All on one page" }).click();
    await expect(page.getByTestId("question")).toHaveCount(3);
    await expect(page.getByTestId("question").first().getByRole("radio", { name: firstChoice })).toBeChecked();
    await expect(page.getByTestId("question").first().getByLabel("Flag to come back to")).toBeChecked();

    // Closed here, resumed in another browser context (another device) with the same session.
    await page.close();
    const other = await browser.newContext();
    consoleGuard.allow(/Failed to load resource/);
    await signInAs("therapist", other);
    const again = await other.newPage();
    consoleGuard.watch(again);
    await again.goto("/exams");
    await again.getByTestId("exam-card").filter({ hasText: TITLE }).getByRole("link", { name: `Resume ${TITLE}` }).click();
    await expect(again).toHaveURL(new RegExp(`${attemptPath}$`));
    await expect(again.getByTestId("question")).toHaveCount(3);
    await expect(again.getByTestId("question").nth(1).getByRole("radio", { name: secondChoice })).toBeChecked();
    await again.getByTestId("question").nth(2).getByRole("radio").first().check();
    await expect(again.getByTestId("saved-indicator")).toHaveText("All answers saved");

    // The time runs out with the page open: the page goes to the result the server graded.
    await expect(again).toHaveURL(new RegExp(`${attemptPath}/result$`), { timeout: 90_000 });
    await expect(again.getByTestId("result-summary")).toContainText(/Passed|Not passed/);
    await expect(again.getByTestId("result-summary")).toContainText("when the time ran out");
    await expect(again.getByRole("heading", { name: /^Question 1: / })).toBeVisible();
    await expectNoAxeViolations(again, "result page (time ran out)");
    const row = await one<{ closed_reason: string; raw_score: number }>("select closed_reason, raw_score from attempts where id = ?", [attemptPath.split("/").pop()!]);
    expect(row?.closed_reason).toBe("deadline");
    await other.close();
  });

  test("a therapist with an extra-time accommodation gets the longer time", async ({ page, signInAs }) => {
    const preceptor = await personByEmail(DEMO.preceptor);
    const manager = await personByEmail(DEMO.manager);
    await e2eDb().execute({
      sql: "insert into accommodations (id, org_id, person_id, kind, multiplier, reason, granted_by, created_at) values (?, ?, ?, 'multiplier', 2, 'E2E: extra time for reading', ?, ?)",
      args: [crypto.randomUUID(), preceptor.org_id, preceptor.id, manager.id, Date.now()],
    });
    await signInAs("preceptor");
    await page.goto(`/exams/${examId}/start`);
    await expect(page.getByTestId("time-allowed")).toContainText("You have 2 min — 2× the standard 1 min, your accommodation");
    await page.getByRole("button", { name: "Start the exam" }).click();
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
    const attemptId = new URL(page.url()).pathname.split("/").pop()!;
    const row = await one<{ allowed_seconds: number; started_at: number; deadline_at: number }>("select allowed_seconds, started_at, deadline_at from attempts where id = ?", [attemptId]);
    expect(row?.allowed_seconds).toBe(120);
    expect(row!.deadline_at - row!.started_at).toBe(120_000);
    const shown = await page.getByTestId("countdown").textContent();
    expect(shown).toMatch(/0[12]:\d\d/);
    // Hand it in early: the result page shows the score at once.
    await page.getByRole("button", { name: "Hand in the exam" }).click();
    await page.getByRole("button", { name: "Yes, hand it in" }).click();
    await expect(page).toHaveURL(new RegExp(`/exams/attempts/${attemptId}/result$`));
    await expect(page.getByTestId("result-summary")).toContainText("Not passed — 0 %");
    await expectNoAxeViolations(page, "result page (handed in)");
  });

  test("the exam works with the keyboard alone: choose, flag, move on, hand in", async ({ page, signInAs }) => {
    await signInAs("educator");
    await page.goto(`/exams/${examId}/start`);
    await page.getByRole("button", { name: "Start the exam" }).focus();
    await page.keyboard.press("Enter");
    await expect(page).toHaveURL(/\/exams\/attempts\/[0-9a-f-]{36}$/);
    const question = page.getByTestId("question");
    // Arrow keys move through a radio group and choose as they go (WAI-ARIA radio group pattern).
    await question.getByRole("radio").first().focus();
    await page.keyboard.press("Space");
    await expect(question.getByRole("radio").first()).toBeChecked();
    await page.keyboard.press("ArrowDown");
    await expect(question.getByRole("radio").nth(1)).toBeChecked();
    await question.getByLabel("Flag to come back to").focus();
    await page.keyboard.press("Space");
    await expect(page.getByTestId("saved-indicator")).toHaveText("All answers saved");
    await page.getByRole("button", { name: "Next question" }).focus();
    await page.keyboard.press("Enter");
    // Moving on puts the keyboard focus on the new question's heading, so a screen reader reads it.
    await expect(page.getByRole("heading", { name: "Question 2 of 3" })).toBeFocused();
    await expect(page.getByTestId("nav-1")).toContainText("flagged for review");
    await page.getByRole("button", { name: "Hand in the exam" }).focus();
    await page.keyboard.press("Enter");
    await expect(page.getByText("2 questions are not answered. 1 is flagged to come back to.")).toBeVisible();
    await page.getByRole("button", { name: "Yes, hand it in" }).focus();
    await page.keyboard.press("Enter");
    await expect(page).toHaveURL(/\/result$/);
    await expect(page.getByTestId("result-summary")).toContainText("handed in");
  });
});
