/**
 * The modified Angoff panel (issue 6, item 3) on a seeded copy of the demo database: two
 * educators rate every item an exam can draw, the panel's cut is the mean of their sums, round 2
 * replaces round 1 item by item, a judge who rated only some items is left out, bad ratings are
 * refused with a message on the field and nothing saved, who may rate, organisation scoping,
 * a drawn form's own cut, and adopting the cut as a new published version with an audit event.
 *
 * Check values are worked by hand below from the definition in Livingston SA, Zieky MJ,
 * "Passing Scores: A Manual for Setting Standards of Performance on Educational and
 * Occupational Tests", Educational Testing Service, 1982: a judge's cut is the sum of their
 * item estimates, the panel's cut the mean of the judges' cuts. The per-form cut follows
 * Coscarelli et al., 2006 (each form drawn at random has its own Angoff cut).
 */
import { and, asc, desc, eq } from "drizzle-orm";
import * as ss from "simple-statistics";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import type { Database } from "~/db/client.server";
import { startAttempt } from "~/db/queries/exam-attempts.server";
import { createExam, publishExam } from "~/db/queries/exams-authoring.server";
import { angoffRatings, attempts, auditEvents, exams, examVersions, people, personRoles } from "~/db/schema";
import { NEW_EXAM_DEFAULTS } from "~/routes/bank/exam-form";
import * as cutRoute from "~/routes/bank/exam-cut-score";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, outcome } from "./admin-harness";

let db: Database;
let judgeA: Viewer;
let judgeB: Viewer;
let partialJudge: Viewer;
let therapist: Viewer;
let otherOrg: Viewer;
let examId = "";
/** The items the exam can draw, in the page's order. */
let itemIds: string[] = [];

const page = (viewer: Viewer, round = 1) =>
  outcome(cutRoute.loader(args<ArgsOf<typeof cutRoute.loader>>(getRequest(`/bank/exams/${examId}/cut-score?round=${round}`), viewer, { examId })));
type PageData = Awaited<ReturnType<typeof cutRoute.loader>>;
const post = (viewer: Viewer, fields: Record<string, string>, id = examId) =>
  outcome(cutRoute.action(args<ArgsOf<typeof cutRoute.action>>(postForm(`/bank/exams/${id}/cut-score`, fields), viewer, { examId: id })));
const rate = (viewer: Viewer, round: 1 | 2, percents: (string | undefined)[]) =>
  post(viewer, {
    intent: "rate",
    round: String(round),
    ...Object.fromEntries(percents.flatMap((p, i) => (p === undefined ? [] : [[`rating.${itemIds[i]}`, p]]))),
  });
const ratingCount = async () => (await db.db.select().from(angoffRatings).where(eq(angoffRatings.examId, examId))).length;
/** Positions, in the rating set, of the items on an attempt's drawn form. */
const drawnPositions = async (attemptId: string) => {
  const [row] = await db.db.select({ form: attempts.form }).from(attempts).where(eq(attempts.id, attemptId));
  return (row.form as { itemId: string }[]).map((e) => itemIds.indexOf(e.itemId));
};
const lastEvent = async () => (await db.db.select().from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1))[0];

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  // Two educators of Kestrel Valley (the seed has more than one).
  const educators = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "educator"), eq(people.orgId, therapist.org.id)))
    .orderBy(asc(people.email));
  expect(educators.length).toBeGreaterThanOrEqual(2);
  judgeA = await viewerFor(educators[0].email);
  judgeB = await viewerFor(educators[1].email);
  // A third judge made up in memory from the manager, who will rate only some items.
  partialJudge = { ...(await viewerFor("manager@kestrelvalley.test")), roles: ["educator"] };
  otherOrg = { ...(await viewerFor("admin@alderbay.test")), roles: ["educator"] };

  // A small exam: two limit-variables items per attempt, drawn from every published
  // limit-variables item of the bank — those are the items the panel rates.
  const settings = {
    title: "Limit variables check",
    description: null,
    blueprint: { topics: { "limit-variables": 2 } },
    timeLimitMinutes: null,
    passMarkPercent: 80,
    attemptsAllowed: 2,
    shuffleItems: true,
    shuffleOptions: true,
    reviewPolicy: "score-and-topics" as const,
    multipleResponseScoring: "all-or-nothing" as const,
    orderingScoring: "exact" as const,
    availableFrom: null,
    availableUntil: null,
  };
  expect(NEW_EXAM_DEFAULTS.passMarkPercent).toBe("80");
  examId = await createExam(judgeA.org.id, judgeA.person.id, settings);
  expect((await publishExam(judgeA.org.id, judgeA.person.id, examId)).ok).toBe(true);
  const first = await page(judgeA);
  itemIds = (first.body as PageData).items.map((i) => i.itemId);
});

describe("a modified Angoff panel", () => {
  it("rates the items the live blueprint can draw, with each stem's start and topic", async () => {
    const data = (await page(judgeA)).body as PageData;
    // The worked example below is for four items: the seed's published limit-variables items.
    expect(data.items).toHaveLength(4);
    for (const item of data.items) {
      expect(item.topics).toContain("Limit variables");
      expect(item.stem.length).toBeGreaterThan(0);
    }
    expect(data.final.panel).toBeNull();
    expect(data.final.reason).toBe("Nobody has rated these items yet.");
  });

  it("refuses 120 % and 'abc' with a message on the field, and saves nothing", async () => {
    const result = await rate(judgeA, 1, ["60", "120", "abc", "90"]);
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, `rating.${itemIds[1]}`)).toEqual(["120 % is outside 0 to 100 %: a chance is at most 100 % and at least 0 %."]);
    expect(fieldErrors(result.body, `rating.${itemIds[2]}`)).toEqual(['"abc" is not a number. Enter a percent from 0 to 100, or leave it blank.']);
    expect(fieldErrors(result.body, `rating.${itemIds[0]}`)).toEqual([]);
    expect(await ratingCount()).toBe(0);
  });

  it("refuses a round with nothing entered", async () => {
    const result = await rate(judgeA, 1, ["", "", "", ""]);
    expect(result.status).toBe(409);
    expect(fieldErrors(result.body, "")).toEqual(["Enter at least one rating: a percent from 0 to 100."]);
  });

  it("saves each judge's round, audited once per save with the counts", async () => {
    const a = await rate(judgeA, 1, ["60", "70", "80", "90"]);
    expect(a.status).toBe(302);
    expect(a.location).toBe(`/bank/exams/${examId}/cut-score?round=1`);
    expect(await lastEvent()).toMatchObject({ action: "angoff.rated", entityId: examId, actorId: judgeA.person.id });
    expect(JSON.parse((await lastEvent()).detail)).toEqual({ round: 1, rated: 4, cleared: 0, items: 4 });
    expect((await rate(judgeB, 1, ["50", "65 %", "75", "85"])).status).toBe(302);
    const stored = await db.db.select().from(angoffRatings).where(and(eq(angoffRatings.examId, examId), eq(angoffRatings.judgeId, judgeB.person.id), eq(angoffRatings.itemId, itemIds[1])));
    // Stored as a chance from 0 to 1.
    expect(stored).toMatchObject([{ round: 1, rating: 0.65, orgId: judgeB.org.id }]);
    // Saving again updates in place (one row per exam, judge, item and round).
    expect((await rate(judgeB, 1, ["50", "65", "75", "85"])).status).toBe(302);
    expect(await ratingCount()).toBe(8);
  });

  it("the panel's cut is the mean of the judges' sums (worked by hand)", async () => {
    // Livingston & Zieky 1982, worked by hand:
    //   judge A: 0.60 + 0.70 + 0.80 + 0.90 = 3.00 items (75 %)
    //   judge B: 0.50 + 0.65 + 0.75 + 0.85 = 2.75 items (68.75 %)
    //   panel:   (3.00 + 2.75) / 2 = 2.875 items of 4 = 71.875 %
    //   spread:  lowest 2.75, highest 3.00, SD dividing by N = |3.00 − 2.875| = 0.125
    const data = (await page(judgeA)).body as PageData;
    const byId = new Map(data.final.judges.map((j) => [j.judgeId, j]));
    expect(byId.get(judgeA.person.id)).toMatchObject({ rated: 4, included: true });
    expect(byId.get(judgeA.person.id)!.cut).toBeCloseTo(3.0, 12);
    expect(byId.get(judgeA.person.id)!.cutPercent).toBeCloseTo(75, 10);
    expect(byId.get(judgeB.person.id)!.cut).toBeCloseTo(2.75, 12);
    expect(byId.get(judgeB.person.id)!.cutPercent).toBeCloseTo(68.75, 10);
    const panel = data.final.panel!;
    expect(panel.judges).toBe(2);
    expect(panel.cut).toBeCloseTo(2.875, 12);
    expect(panel.cutPercent).toBeCloseTo(71.875, 10);
    expect(panel.min).toBeCloseTo(2.75, 12);
    expect(panel.max).toBeCloseTo(3.0, 12);
    expect(panel.sd).toBeCloseTo(0.125, 12);
    // Independently: simple-statistics (npm) mean and standardDeviation, which divides by N.
    expect(panel.cut).toBeCloseTo(ss.mean([ss.sum([0.6, 0.7, 0.8, 0.9]), ss.sum([0.5, 0.65, 0.75, 0.85])]), 12);
    expect(panel.sd).toBeCloseTo(ss.standardDeviation([3.0, 2.75]), 12);
    expect(data.hasRound2).toBe(false);
    // The viewer's own ratings come back in percent to fill the form.
    expect(data.mine[1]).toEqual({ [itemIds[0]]: 60, [itemIds[1]]: 70, [itemIds[2]]: 80, [itemIds[3]]: 90 });
  });

  it("round 2 replaces a judge's round-1 rating item by item", async () => {
    // Judge B re-rates item 1 only, 50 % → 70 %: B = 0.70 + 0.65 + 0.75 + 0.85 = 2.95 items;
    // panel after round 2 = (3.00 + 2.95) / 2 = 2.975 items = 74.375 %. Round 1 alone stays 71.875 %.
    expect((await rate(judgeB, 2, ["70", "", "", ""])).status).toBe(302);
    const data = (await page(judgeB, 2)).body as PageData;
    expect(data.hasRound2).toBe(true);
    expect(data.round).toBe(2);
    expect(data.final.panel!.cut).toBeCloseTo(2.975, 12);
    expect(data.final.panel!.cutPercent).toBeCloseTo(74.375, 10);
    expect(data.round1.panel!.cutPercent).toBeCloseTo(71.875, 10);
    expect(data.mine[2]).toEqual({ [itemIds[0]]: 70 });
  });

  it("leaves out a judge who did not rate every item, and says why", async () => {
    expect((await rate(partialJudge, 1, ["40", "40", undefined, undefined])).status).toBe(302);
    const data = (await page(judgeA)).body as PageData;
    const partial = data.final.judges.find((j) => j.judgeId === partialJudge.person.id)!;
    expect(partial).toMatchObject({ rated: 2, included: false, cut: null });
    expect(partial.note).toBe("Left out: rated 2 of 4 items. A judge's cut is the sum over every item, so it needs a rating of each.");
    // The panel is unchanged: still judges A and B.
    expect(data.final.panel!.judges).toBe(2);
    expect(data.final.panel!.cutPercent).toBeCloseTo(74.375, 10);
  });

  it("a therapist may read nothing here and post nothing (403)", async () => {
    const before = await ratingCount();
    const result = await rate(therapist, 1, ["50", "50", "50", "50"]);
    expect(result.status).toBe(403);
    expect((await page(therapist)).status).toBe(403);
    expect(await ratingCount()).toBe(before);
  });

  it("another organisation's exam is not found (404)", async () => {
    expect((await page(otherOrg)).status).toBe(404);
    const before = await ratingCount();
    expect((await post(otherOrg, { intent: "rate", round: "1", [`rating.${itemIds[0]}`]: "50" })).status).toBe(404);
    expect((await post(otherOrg, { intent: "adopt", confirm: "yes", percent: "74.4" })).status).toBe(404);
    expect(await ratingCount()).toBe(before);
  });

  it("a drawn form has its own cut: the panel's estimates of the items actually drawn", async () => {
    const who = { orgId: therapist.org.id, personId: therapist.person.id, timeZone: therapist.org.timeZone };
    const started = await startAttempt(who, examId, "one", new Date(), 4242);
    expect(started.ok).toBe(true);
    const data = (await page(judgeA)).body as PageData;
    const row = data.forms.find((f) => started.ok && f.attemptId === started.attemptId)!;
    expect(row.items).toBe(2);
    // Hand table of the estimates after round 2, by item position in the rating set.
    const a = [0.6, 0.7, 0.8, 0.9];
    const b = [0.7, 0.65, 0.75, 0.85];
    const partial = [0.4, 0.4, null, null];
    const drawn = await drawnPositions(started.ok ? started.attemptId : "");
    expect(drawn).toHaveLength(2);
    expect(drawn.every((p) => p >= 0)).toBe(true);
    const [i, j] = drawn;
    // Judges who rated both drawn items form this form's panel; each judge's cut is their sum.
    const sums = [a, b, partial].filter((r) => r[i] !== null && r[j] !== null).map((r) => (r[i] as number) + (r[j] as number));
    const expected = (sums.reduce((s, x) => s + x, 0) / sums.length / 2) * 100;
    expect(row.judges).toBe(sums.length);
    expect(row.cutPercent).toBeCloseTo(expected, 10);
    expect(row.passMarkPercent).toBe(80);
    expect(row.reason).toBeNull();
  });

  it("refuses to adopt when the panel moved since the page was shown", async () => {
    const result = await post(judgeA, { intent: "adopt", confirm: "yes", percent: "71.9" });
    expect(result.status).toBe(409);
    expect(fieldErrors(result.body, "")[0]).toMatch(/The panel's cut is now 74\.4 % \(you confirmed 71\.9 %\)/);
  });

  it("a therapist cannot adopt a cut (403)", async () => {
    expect((await post(therapist, { intent: "adopt", confirm: "yes", percent: "74.4" })).status).toBe(403);
  });

  it("adopting publishes a new version with the panel's cut, rounded to one decimal, audited", async () => {
    const [before] = await db.db.select().from(exams).where(eq(exams.id, examId));
    const result = await post(judgeA, { intent: "adopt", confirm: "yes", percent: "74.4" });
    expect(result.status).toBe(302);
    const versions = await db.db.select().from(examVersions).where(eq(examVersions.examId, examId)).orderBy(asc(examVersions.version));
    expect(versions.map((v) => v.version)).toEqual([1, 2]);
    const [v1, v2] = versions;
    // 74.375 % rounded to one decimal.
    expect(v2.passMarkPercent).toBe(74.4);
    expect(v2.publishedAt).not.toBeNull();
    expect(v1.passMarkPercent).toBe(80);
    // Identical to the live version except the pass mark.
    expect(v2.blueprint).toEqual(v1.blueprint);
    expect({ ...v2, id: "", version: 0, passMarkPercent: 0, publishedAt: null, createdAt: null }).toEqual({ ...v1, id: "", version: 0, passMarkPercent: 0, publishedAt: null, createdAt: null });
    const [after] = await db.db.select().from(exams).where(eq(exams.id, examId));
    expect(before.currentVersionId).toBe(v1.id);
    expect(after).toMatchObject({ status: "published", currentVersionId: v2.id });
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "exam.cut-adopted", entityId: examId, actorId: judgeA.person.id });
    const detail = JSON.parse(event.detail);
    expect(detail).toMatchObject({ version: 2, previousVersion: 1, previousPassMarkPercent: 80, passMarkPercent: 74.4, items: 4, sdDivisor: "N" });
    expect(detail.cutPercent).toBeCloseTo(74.375, 10);
    expect(detail.judges).toHaveLength(2);
    expect(detail.leftOut).toEqual([{ id: partialJudge.person.id, rated: 2 }]);
    expect((await verifyAuditChain(db.db)).whole).toBe(true);
    const data = (await page(judgeA)).body as PageData;
    expect(data.live).toEqual({ version: 2, passMarkPercent: 74.4 });
  });

  it("adopting again when the pass mark already is the cut changes nothing", async () => {
    const result = await post(judgeA, { intent: "adopt", confirm: "yes", percent: "74.4" });
    expect(result.status).toBe(409);
    expect(fieldErrors(result.body, "")).toEqual(["The pass mark is already 74.4 %."]);
  });
});
