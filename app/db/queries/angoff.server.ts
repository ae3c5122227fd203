/**
 * A modified Angoff panel per exam (issue 6, item 3; Livingston SA, Zieky MJ, "Passing Scores",
 * ETS 1982): each educator (judge) estimates, for each item, the chance that a minimally
 * competent therapist answers it correctly; a judge's cut is the sum of their estimates; the
 * panel's cut is the mean of the judges' cuts (app/domain/psychometrics/angoff.ts).
 *
 * Which items. The items rated are those the exam's live version can draw: every published
 * item of a topic its blueprint asks for, plus its fixed items (`loadPool`). Before the first
 * publish the newest draft's blueprint is used, so a panel can sit before the exam goes live.
 * Ratings of items the blueprint no longer draws are kept but not counted in the panel.
 *
 * Rounds. Round 1 is rated blind; round 2 after seeing the item statistics. For a judge who
 * gave round-2 ratings, each round-2 rating replaces that judge's round-1 rating of the same
 * item; an item they did not re-rate keeps its round-1 rating. The panel is shown for round 1
 * alone and "after round 2" (the one that can be adopted).
 *
 * Who counts. A judge's cut is a sum over every item (Livingston & Zieky 1982), so only judges
 * who rated every item of the set are in the panel; the others are listed with how many they
 * rated. No estimate is ever filled in for a missing one.
 *
 * Random forms. Each attempt's form is drawn at random from the blueprint, and each drawn form
 * has its own Angoff cut (Coscarelli et al., 2006): the panel's estimates of the items actually
 * drawn, summed per judge and averaged (`angoffCutForForm`). Tidemark grades every form against
 * the adopted pass mark (a percent), and shows each recent form's own cut beside it for the
 * committee's judgement; it does not grade forms against their own cuts.
 *
 * Adopting the panel's cut as the pass mark: angoff-adopt.server.ts.
 *
 * Every query takes the viewer's organisation id first; another organisation's exam is "not found".
 */
import { and, desc, eq, inArray } from "drizzle-orm";
import { angoffCut, angoffCutForForm, type AngoffCut } from "~/domain/psychometrics";
import type { AngoffRound, RatingSubmission } from "~/routes/bank/angoff-form";
import { recordAudit } from "../audit.server";
import { database, type DbOrTx } from "../client.server";
import { angoffRatings, attempts, examVersions, itemVersions, people, topics } from "../schema";
import { loadPool } from "./exam-pool.server";
import { blueprintOf, firstWords, getExam, type ExamDetail } from "./exams-authoring.server";
import { examItemAnalysis } from "./item-analysis.server";

export type RatedItem = { itemId: string; stem: string; topics: string[]; fixed: boolean };

/** The exam (or null) and the items its live version — or, before any publish, its newest draft — can draw. */
export async function ratingSet(orgId: string, examId: string, db?: DbOrTx): Promise<{ exam: ExamDetail; items: RatedItem[] } | null> {
  const d = db ?? (await database()).db;
  const exam = await getExam(orgId, examId, d);
  if (!exam) return null;
  const blueprint = blueprintOf(exam.live ?? exam.latest);
  const asked = new Set(Object.entries(blueprint.topics).filter(([, n]) => (n ?? 0) > 0).map(([t]) => t));
  const fixed = new Set(blueprint.fixed ?? []);
  const [pool, topicRows] = await Promise.all([loadPool(d, orgId), d.select({ slug: topics.slug, name: topics.name }).from(topics).where(eq(topics.orgId, orgId))]);
  const drawable = pool.filter((p) => fixed.has(p.itemId) || p.topics.some((t) => asked.has(t)));
  const stems = drawable.length
    ? await d.select({ id: itemVersions.id, stem: itemVersions.stem }).from(itemVersions).where(and(eq(itemVersions.orgId, orgId), inArray(itemVersions.id, drawable.map((p) => p.itemVersionId))))
    : [];
  const stemOf = new Map(stems.map((s) => [s.id, s.stem]));
  const nameOf = new Map(topicRows.map((t) => [t.slug, t.name]));
  // Grouped by the first topic the blueprint asks for (as the draw fills it), then bank order.
  const order = [...asked];
  const firstAsked = (ts: readonly string[]) => {
    const i = order.findIndex((t) => ts.includes(t));
    return i < 0 ? order.length : i;
  };
  const items = drawable
    .map((p, bankOrder) => ({ p, bankOrder, group: firstAsked(p.topics) }))
    .sort((a, b) => a.group - b.group || a.bankOrder - b.bankOrder)
    .map(({ p }) => ({ itemId: p.itemId, stem: firstWords(stemOf.get(p.itemVersionId) ?? ""), topics: p.topics.map((t) => nameOf.get(t) ?? t), fixed: fixed.has(p.itemId) }));
  return { exam, items };
}

type RatingRow = { judgeId: string; itemId: string; round: number; rating: number };

async function ratingsOf(d: DbOrTx, orgId: string, examId: string): Promise<RatingRow[]> {
  return d
    .select({ judgeId: angoffRatings.judgeId, itemId: angoffRatings.itemId, round: angoffRatings.round, rating: angoffRatings.rating })
    .from(angoffRatings)
    .where(and(eq(angoffRatings.orgId, orgId), eq(angoffRatings.examId, examId)));
}

/** judge → item → estimate, for round 1 alone or with round 2 replacing round 1 item by item. */
export function estimatesByJudge(rows: readonly RatingRow[], upTo: AngoffRound): Map<string, Map<string, number>> {
  const out = new Map<string, Map<string, number>>();
  for (const round of upTo === 1 ? [1] : [1, 2]) {
    for (const r of rows) {
      if (r.round !== round) continue;
      if (!out.has(r.judgeId)) out.set(r.judgeId, new Map());
      out.get(r.judgeId)!.set(r.itemId, r.rating);
    }
  }
  return out;
}

export type JudgeRow = { judgeId: string; name: string; rated: number; cut: number | null; cutPercent: number | null; included: boolean; note: string | null };
export type PanelResult = { judges: JudgeRow[]; panel: AngoffCut | null; reason: string | null };

/** The panel over the rating set: judges who rated every item, their cuts, spread and mean. */
export function panelOver(items: readonly RatedItem[], estimates: Map<string, Map<string, number>>, nameOf: Map<string, string>): PanelResult {
  const ids = items.map((i) => i.itemId);
  const judges = [...estimates.keys()].sort((a, b) => (nameOf.get(a) ?? a).localeCompare(nameOf.get(b) ?? b) || (a < b ? -1 : 1));
  const complete = judges.filter((j) => ids.length > 0 && ids.every((id) => estimates.get(j)!.has(id)));
  const panel = complete.length > 0 ? angoffCut(complete.map((j) => ids.map((id) => estimates.get(j)!.get(id)!))) : null;
  const rows: JudgeRow[] = judges.map((judgeId) => {
    const mine = estimates.get(judgeId)!;
    const rated = ids.filter((id) => mine.has(id)).length;
    const k = complete.indexOf(judgeId);
    if (k >= 0 && panel) return { judgeId, name: nameOf.get(judgeId) ?? "A former colleague", rated, cut: panel.judgeCuts[k], cutPercent: (panel.judgeCuts[k] / ids.length) * 100, included: true, note: null };
    return {
      judgeId,
      name: nameOf.get(judgeId) ?? "A former colleague",
      rated,
      cut: null,
      cutPercent: null,
      included: false,
      note: `Left out: rated ${rated} of ${ids.length} items. A judge's cut is the sum over every item, so it needs a rating of each.`,
    };
  });
  const reason = panel
    ? null
    : ids.length === 0
      ? "The blueprint draws no published items, so there is nothing to rate."
      : judges.length === 0
        ? "Nobody has rated these items yet."
        : "No judge has rated every item yet, so the panel has no cut.";
  return { judges: rows, panel, reason };
}

export type FormCutRow = {
  attemptId: string;
  personName: string;
  version: number;
  startedAt: Date;
  submittedAt: Date | null;
  scorePercent: number | null;
  passMarkPercent: number;
  passed: boolean | null;
  items: number;
  cutPercent: number | null;
  judges: number;
  excludedJudges: number;
  reason: string | null;
};

/** The exam's most recent attempts, each with its drawn form's own Angoff cut (Coscarelli et al., 2006). */
async function recentFormCuts(d: DbOrTx, orgId: string, examId: string, estimates: Map<string, Map<string, number>>, limit: number): Promise<FormCutRow[]> {
  const rows = await d
    .select({ a: attempts, version: examVersions.version, passMarkPercent: examVersions.passMarkPercent, personName: people.name })
    .from(attempts)
    .innerJoin(examVersions, and(eq(examVersions.id, attempts.examVersionId), eq(examVersions.orgId, orgId)))
    .innerJoin(people, and(eq(people.id, attempts.personId), eq(people.orgId, orgId)))
    .where(and(eq(attempts.orgId, orgId), eq(examVersions.examId, examId)))
    .orderBy(desc(attempts.startedAt), desc(attempts.id))
    .limit(limit);
  // item → judge → estimate, as angoffCutForForm takes it.
  const byItem = new Map<string, Map<string, number>>();
  for (const [judgeId, mine] of estimates) {
    for (const [itemId, rating] of mine) {
      if (!byItem.has(itemId)) byItem.set(itemId, new Map());
      byItem.get(itemId)!.set(judgeId, rating);
    }
  }
  return rows.map(({ a, version, passMarkPercent, personName }) => {
    const form = Array.isArray(a.form) ? (a.form as { itemId?: unknown }[]) : [];
    const ids = [...new Set(form.map((e) => e.itemId).filter((x): x is string => typeof x === "string"))];
    const base = { attemptId: a.id, personName, version, startedAt: a.startedAt, submittedAt: a.submittedAt, scorePercent: a.scorePercent, passMarkPercent, passed: a.passed, items: ids.length };
    if (ids.length === 0) return { ...base, cutPercent: null, judges: 0, excludedJudges: 0, reason: "The attempt's form lists no items." };
    const cut = angoffCutForForm(byItem, ids);
    return { ...base, cutPercent: cut.cutPercent, judges: cut.judgeIds.length, excludedJudges: cut.excludedJudgeIds.length, reason: cut.reason };
  });
}

export type AngoffPage = {
  exam: { id: string; title: string; status: ExamDetail["status"] };
  live: { version: number; passMarkPercent: number } | null;
  /** The version whose blueprint gave the items (the live one, else the newest draft). */
  basisVersion: number;
  /** A saved draft newer than the live version: adopting is refused until it is published. */
  newerDraft: number | null;
  items: RatedItem[];
  round1: PanelResult;
  final: PanelResult;
  hasRound2: boolean;
  /** Ratings kept for items the blueprint no longer draws (not counted). */
  ignoredRatings: number;
  /** The viewer's own ratings in percent, per round, to fill the form. */
  mine: Record<AngoffRound, Record<string, number>>;
  forms: FormCutRow[];
};

export async function angoffPage(orgId: string, examId: string, viewerId: string, options: { recentForms?: number } = {}): Promise<AngoffPage | null> {
  const { db } = await database();
  const set = await ratingSet(orgId, examId, db);
  if (!set) return null;
  const { exam, items } = set;
  const rows = await ratingsOf(db, orgId, examId);
  const judgeIds = [...new Set(rows.map((r) => r.judgeId))];
  const names = judgeIds.length
    ? await db.select({ id: people.id, name: people.name }).from(people).where(and(eq(people.orgId, orgId), inArray(people.id, judgeIds)))
    : [];
  const nameOf = new Map(names.map((n) => [n.id, n.name]));
  const inSet = new Set(items.map((i) => i.itemId));
  const round1 = estimatesByJudge(rows, 1);
  const final = estimatesByJudge(rows, 2);
  const mine: AngoffPage["mine"] = { 1: {}, 2: {} };
  for (const r of rows) if (r.judgeId === viewerId && (r.round === 1 || r.round === 2)) mine[r.round][r.itemId] = Math.round(r.rating * 100 * 1e6) / 1e6;
  return {
    exam: { id: exam.id, title: exam.title, status: exam.status },
    live: exam.live ? { version: exam.live.version, passMarkPercent: exam.live.passMarkPercent } : null,
    basisVersion: (exam.live ?? exam.latest).version,
    newerDraft: exam.live && exam.latest.id !== exam.live.id ? exam.latest.version : null,
    items,
    round1: panelOver(items, round1, nameOf),
    final: panelOver(items, final, nameOf),
    hasRound2: rows.some((r) => r.round === 2),
    ignoredRatings: rows.filter((r) => !inSet.has(r.itemId)).length,
    mine,
    forms: await recentFormCuts(db, orgId, examId, final, options.recentForms ?? 10),
  };
}

export type SaveRatingsResult =
  | { ok: true; rated: number; cleared: number }
  | { ok: false; reason: "not-found" }
  | { ok: false; reason: "refused"; message: string };

/**
 * Saves one judge's ratings for one round: a number is upserted on (exam, judge, item, round);
 * a blank removes that round's earlier rating of the item, if any. One "angoff.rated" event.
 */
export async function saveRatings(orgId: string, judgeId: string, examId: string, submission: RatingSubmission, now = new Date()): Promise<SaveRatingsResult> {
  const { write } = await database();
  return write(async (tx) => {
    const set = await ratingSet(orgId, examId, tx);
    if (!set) return { ok: false, reason: "not-found" };
    const inSet = new Set(set.items.map((i) => i.itemId));
    const entries = Object.entries(submission.ratings);
    const unknown = entries.filter(([id]) => !inSet.has(id)).length;
    if (unknown > 0) {
      return { ok: false, reason: "refused", message: `${unknown === 1 ? "One rating is" : `${unknown} ratings are`} for an item this exam no longer draws. Reload the page and rate the items shown.` };
    }
    const given = entries.filter((e): e is [string, number] => e[1] !== null);
    const blank = entries.filter(([, v]) => v === null).map(([id]) => id);
    const key = (c: typeof angoffRatings) => and(eq(c.orgId, orgId), eq(c.examId, examId), eq(c.judgeId, judgeId), eq(c.round, submission.round));
    const cleared = blank.length
      ? (await tx.delete(angoffRatings).where(and(key(angoffRatings), inArray(angoffRatings.itemId, blank))).returning({ id: angoffRatings.id })).length
      : 0;
    if (given.length === 0 && cleared === 0) return { ok: false, reason: "refused", message: "Enter at least one rating: a percent from 0 to 100." };
    for (const [itemId, rating] of given) {
      await tx
        .insert(angoffRatings)
        .values({ orgId, examId, judgeId, itemId, round: submission.round, rating, createdAt: now, updatedAt: now })
        .onConflictDoUpdate({ target: [angoffRatings.examId, angoffRatings.judgeId, angoffRatings.itemId, angoffRatings.round], set: { rating, updatedAt: now } });
    }
    await recordAudit(
      tx,
      { orgId, actorId: judgeId, action: "angoff.rated", entityType: "exam", entityId: examId, detail: { round: submission.round, rated: given.length, cleared, items: set.items.length } },
      now,
    );
    return { ok: true, rated: given.length, cleared };
  });
}

export type ItemDifficulties = { version: number; examinees: number; byItem: Record<string, { p: number; seenBy: number }> };

/**
 * For round 2: each item's difficulty p (the share who answered it correctly) from the item
 * analysis of the live version (app/db/queries/item-analysis.server.ts, read only). Null when
 * there is nothing analysed yet, or when the analysis cannot be read: round 2 then links to the
 * analysis page only, and rating goes on.
 */
export async function itemDifficulties(orgId: string, examId: string): Promise<ItemDifficulties | null> {
  try {
    const view = await examItemAnalysis(orgId, examId, null);
    if (!view || view === "no-such-version" || view.examinees === 0) return null;
    return { version: view.version.version, examinees: view.examinees, byItem: Object.fromEntries(view.items.map((i) => [i.itemId, { p: i.p, seenBy: i.seenBy }])) };
  } catch {
    // The statistics are a help to the judges, never a condition of rating.
    return null;
  }
}
