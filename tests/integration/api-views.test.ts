/**
 * Issue 10, item 4: the pages that fetch in place and the API answer from the same server
 * functions — the Team matrix (matrixView) and an exam attempt's progress (attemptProgress) — so
 * the two never disagree. Each check puts a page's answer beside the API's for the same records.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { ErrorSchema, ExamAttemptSchema, TeamMatrixPage } from "~/api/schemas";
import { examAttemptForApi } from "~/api/views.server";
import { createToken } from "~/api/token.server";
import type { Database } from "~/db/client.server";
import { startAttempt } from "~/db/queries/exam-attempts.server";
import { exams, units } from "~/db/schema";
import * as examAttemptRoute from "~/routes/api/v1/exam-attempt";
import * as teamMatrixRoute from "~/routes/api/v1/team-matrix";
import * as answersRoute from "~/routes/exams/answers";
import * as matrixPage from "~/routes/team/matrix";
import { decodeCells, MATRIX_PAGE_SIZE } from "~/routes/team/matrix-params";
import { type ArgsOf, outcome } from "./admin-harness";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";

type Handler = (a: never) => Promise<Response>;

let db: Database;
let educator: Viewer;
let therapist: Viewer;
let kvToken: string;
let abToken: string;

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  therapist = await viewerFor("therapist@kestrelvalley.test");
  const kvAdmin = await viewerFor("admin@kestrelvalley.test");
  const abAdmin = await viewerFor("admin@alderbay.test");
  kvToken = (await createToken(kvAdmin.org.id, kvAdmin.person.id, { name: "views kv", scopes: ["read"], expiresOn: null })).token;
  abToken = (await createToken(abAdmin.org.id, abAdmin.person.id, { name: "views ab", scopes: ["read"], expiresOn: null })).token;
});

async function api(handler: Handler, path: string, token: string, params: Record<string, string> = {}) {
  const request = new Request(new URL(path, TEST_ORIGIN), { headers: { Authorization: `Bearer ${token}` } });
  const response = await handler(args<never>(request, null, params));
  return { status: response.status, body: JSON.parse(await response.text()) as unknown };
}

/** Every page of the API's matrix for a query, following nextCursor. */
async function allApiRows(query: string) {
  const rows: { personId: string; cells: { requirementId: string; status: string; date: string | null; dateMeaning: string; waivedThrough: string | null }[] }[] = [];
  let cursor: string | null = null;
  let matching = -1;
  do {
    const path: string = `/api/v1/team-matrix?${query}&limit=7${cursor ? `&cursor=${cursor}` : ""}`;
    const answer = await api(teamMatrixRoute.loader as Handler, path, kvToken);
    expect(answer.status).toBe(200);
    const page = TeamMatrixPage.parse(answer.body);
    matching = page.matching;
    rows.push(...page.data.map((d) => ({ personId: d.person.id, cells: d.cells })));
    cursor = page.nextCursor;
  } while (cursor);
  return { rows, matching };
}

/** Every page of the Team matrix page's data (what its fetcher loads), as an educator sees it (the whole organisation). */
async function allPageRows(query: string) {
  const rows: { personId: string; cells: { requirementId: string; status: string; date: string | null; dateMeaning: string; waivedThrough: string | null }[] }[] = [];
  let page = 1;
  let pageCount = 1;
  let matching = -1;
  do {
    const data = (await matrixPage.loader(args<ArgsOf<typeof matrixPage.loader>>(getRequest(`/team/matrix?${query}&page=${page}`), educator))) as Awaited<ReturnType<typeof matrixPage.loader>>;
    pageCount = data.pageCount;
    matching = data.matching;
    expect(data.rows.length).toBeLessThanOrEqual(MATRIX_PAGE_SIZE);
    for (const r of data.rows) {
      const cells = decodeCells(r.cells).flatMap((c, i) => (c ? [{ requirementId: data.columns[i].id, status: c[0], date: c[1], dateMeaning: c[2] === "d" ? "due" : "valid-through", waivedThrough: c[3] }] : []));
      rows.push({ personId: r.id, cells });
    }
    page += 1;
  } while (page <= pageCount);
  return { rows, matching };
}

describe("the Team matrix: the page and /api/v1/team-matrix", () => {
  it("give the same people, in the same order, with the same cells, for the same filters", async () => {
    const [icu] = await db.db.select({ id: units.id }).from(units).where(and(eq(units.orgId, educator.org.id), eq(units.name, "Adult ICU")));
    for (const [pageQuery, apiQuery] of [
      [`unit=${icu.id}&status=lapsed`, `unitId=${icu.id}&status=lapsed`],
      ["role=therapist&sort=lapsed&dir=desc", "role=therapist&sort=lapsed&dir=desc"],
      ["q=a&sort=unit", "q=a&sort=unit"],
    ]) {
      const fromPage = await allPageRows(pageQuery);
      const fromApi = await allApiRows(apiQuery);
      expect(fromPage.matching, pageQuery).toBeGreaterThan(0);
      expect(fromApi.matching, apiQuery).toBe(fromPage.matching);
      expect(fromApi.rows, apiQuery).toEqual(fromPage.rows);
    }
  });

  it("follows its cursors through every matching person exactly once", async () => {
    const { rows, matching } = await allApiRows("sort=name");
    expect(rows).toHaveLength(matching);
    expect(new Set(rows.map((r) => r.personId)).size).toBe(matching);
  });

  it("refuses a bad filter or cursor naming the field, as the API does everywhere", async () => {
    const badStatus = await api(teamMatrixRoute.loader as Handler, "/api/v1/team-matrix?status=expired", kvToken);
    expect(badStatus.status).toBe(400);
    expect(ErrorSchema.parse(badStatus.body).error).toMatchObject({ code: "validation_failed", field: "status" });
    const badCursor = await api(teamMatrixRoute.loader as Handler, "/api/v1/team-matrix?cursor=bm90LWEtY3Vyc29y", kvToken);
    expect(badCursor.status).toBe(400);
    expect(ErrorSchema.parse(badCursor.body).error).toMatchObject({ code: "validation_failed", field: "cursor" });
  });

  it("shows another organisation's token none of this organisation's people", async () => {
    const kv = await allApiRows("sort=name");
    const ab = await api(teamMatrixRoute.loader as Handler, "/api/v1/team-matrix?limit=200", abToken);
    const abIds = new Set(TeamMatrixPage.parse(ab.body).data.map((d) => d.person.id));
    expect(abIds.size).toBeGreaterThan(0);
    expect(kv.rows.filter((r) => abIds.has(r.personId))).toEqual([]);
  });
});

describe("an exam attempt: the page's save reply and /api/v1/exam-attempts/:id", () => {
  it("agree after every save, and neither carries an answer or a key", async () => {
    const [exam] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, therapist.org.id), eq(exams.title, "Alarm reasoning and waveform exam")));
    const started = await startAttempt({ orgId: therapist.org.id, personId: therapist.person.id, timeZone: therapist.org.timeZone }, exam.id, "one");
    if (!started.ok) throw new Error(started.message);
    const attemptId = started.attemptId;
    const fromApi = async () => {
      const answer = await api(examAttemptRoute.loader as Handler, `/api/v1/exam-attempts/${attemptId}`, kvToken, { attemptId });
      expect(answer.status).toBe(200);
      return ExamAttemptSchema.strict().parse(answer.body);
    };
    const before = await fromApi();
    expect(before).toMatchObject({ state: "open", answered: 0, flagged: 0, personId: therapist.person.id, examId: exam.id });

    const saves: Record<string, string>[] = [{ position: "0", flagged: "true" }, { position: "0", answer: "null" }, { position: "1", flagged: "true" }];
    for (const fields of saves) {
      const reply = await outcome(answersRoute.action(args<ArgsOf<typeof answersRoute.action>>(postForm(`/exams/attempts/${attemptId}/answers`, fields), therapist, { attemptId })));
      expect(reply.status).toBe(200);
      const progress = (reply.body as { progress: unknown }).progress;
      expect(await fromApi()).toEqual(ExamAttemptSchema.strict().parse(progress));
    }
    const after = await fromApi();
    expect(after).toMatchObject({ answered: 0, flagged: 2, total: before.total });
    expect(after.lastSavedAt).not.toBeNull();
  });

  it("closes and grades an attempt past its deadline before answering, as every read does", async () => {
    const [exam] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, educator.org.id), eq(exams.title, "Annual ventilation modes exam")));
    const someone = await viewerFor("educator@kestrelvalley.test");
    const started = await startAttempt({ orgId: someone.org.id, personId: someone.person.id, timeZone: someone.org.timeZone }, exam.id, "one");
    if (!started.ok) throw new Error(started.message);
    const open = await examAttemptForApi(someone.org.id, started.attemptId);
    expect(open?.state).toBe("open");
    const late = new Date(Date.parse(open!.deadlineAt!) + 60 * 60_000);
    const closed = await examAttemptForApi(someone.org.id, started.attemptId, late);
    expect(closed).toMatchObject({ state: "closed", closedReason: "deadline", answered: 0, scorePercent: 0, passed: false });
  });

  it("answers 404 to another organisation's token", async () => {
    const [exam] = await db.db.select({ id: exams.id }).from(exams).where(and(eq(exams.orgId, therapist.org.id), eq(exams.title, "Alarm reasoning and waveform exam")));
    const started = await startAttempt({ orgId: therapist.org.id, personId: therapist.person.id, timeZone: therapist.org.timeZone }, exam.id, "one");
    if (!started.ok) throw new Error(started.message);
    const answer = await api(examAttemptRoute.loader as Handler, `/api/v1/exam-attempts/${started.attemptId}`, abToken, { attemptId: started.attemptId });
    expect(answer.status).toBe(404);
    expect(ErrorSchema.parse(answer.body).error.code).toBe("not_found");
  });
});
