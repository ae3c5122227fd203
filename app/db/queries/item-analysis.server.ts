/**
 * Item analysis of one exam for the Bank (issue 6): gathers the graded attempts of one exam
 * version, builds each examinee's form of item scores, and hands it to the pure module
 * (app/domain/psychometrics/form-analysis.ts); then adds what a page needs — item stems and
 * topics, option choices by the upper and lower groups, flags, the band around the pass mark.
 *
 * What is analysed, and why:
 *   - One exam version at a time (the live one by default, or the newest with attempts): the
 *     blueprint, so the form length K, and the pass mark belong to a version. Other versions are
 *     offered as links.
 *   - Closed, graded attempts only, and only each person's first sitting of a cycle
 *     (attemptNumber 1): a retake is the same person again, who has seen items of the first
 *     form, so it would count one examinee twice and inflate p (common practice, no source).
 *     Retakes are counted and named on the page.
 *   - Items are identified by item id: if an item was edited while the version was live, its
 *     answers under each item version are pooled, and the item versions seen are listed.
 *
 * Every query takes the viewer's organisation id first; another organisation's exam is null.
 */
import { and, asc, desc, eq, inArray, isNotNull } from "drizzle-orm";
import { database } from "~/db/client.server";
import { attempts, exams, examVersions, itemVersions, responses, topics } from "~/db/schema";
import type { ItemContent } from "~/domain/bank/item-content";
import { presentItem } from "~/domain/bank/present";
import { GROUP_RULE_TEXT, semBand, type VarianceKind } from "~/domain/psychometrics";
import { analyzeForms, FLAG_THRESHOLDS, itemFlags, type FormAnalysis, type ItemFlag } from "~/domain/psychometrics/form-analysis";
import { contentOf, topicsOf } from "./bank.server";
import type { StoredFormEntry } from "./exam-attempts.server";

export type OptionChoice = { text: string; correct: boolean; all: number; upper: number; lower: number };

export type AnalysedItem = {
  itemId: string;
  stem: string;
  stemStart: string;
  /** Topic names the item was drawn for in this exam. */
  topics: string[];
  /** Item version numbers answered (more than one: the item was edited while the exam ran). */
  versionsSeen: number[];
  kind: "single" | "multiple" | "numeric" | "ordering" | "waveform-point";
  seenBy: number;
  p: number;
  pointBiserial: number | null;
  correctedPointBiserial: number | null;
  discrimination: number | null;
  upperCorrect: number | null;
  lowerCorrect: number | null;
  groupSize: number;
  flags: ItemFlag[];
  /** Seen by fewer than FLAG_THRESHOLDS.minItemAnswers examinees: a caution, not a flag. */
  fewAnswers: boolean;
  /** Single and multiple answer items only. */
  options: OptionChoice[] | null;
  unanswered: { all: number; upper: number; lower: number };
};

export type ItemAnalysisView = {
  exam: { id: string; title: string };
  version: { id: string; version: number; passMarkPercent: number; live: boolean };
  versions: { version: number; examinees: number; retakes: number; live: boolean }[];
  examinees: number;
  retakesExcluded: number;
  smallSample: boolean;
  summary: Pick<FormAnalysis, "method" | "formLength" | "mean" | "variance" | "sd" | "sumItemVariance" | "kr20" | "kr21" | "sem"> & { varianceKind: VarianceKind; meanPercent: number | null };
  /** The pass mark in points and the one-SEM band around it (68 %), with how many examinees fall inside. */
  passBand: { cut: number; low: number; high: number; lowPercent: number; highPercent: number; inside: number } | null;
  /** Examinees per whole score 0…K (scores with partial credit fall in the bin of their whole part). */
  distribution: { score: number; count: number }[];
  groupRule: string;
  items: AnalysedItem[];
};

const STEM_START = 90;

function stemStartOf(stem: string): string {
  const flat = stem.replace(/\s+/g, " ").trim();
  return flat.length <= STEM_START ? flat : `${flat.slice(0, STEM_START - 1).trimEnd()}…`;
}

function kindOf(content: ItemContent): AnalysedItem["kind"] {
  if (content.body.kind === "scenario") return content.type === "single" ? "single" : "numeric";
  return content.body.kind;
}

/** The options an examinee saw for one item version, by option id, and which are keyed right. */
function optionsOf(content: ItemContent, itemSeed: number): { id: number; text: string; correct: boolean }[] | null {
  const b = content.body;
  if (b.kind === "single") return b.options.map((text, id) => ({ id, text, correct: id === b.correct }));
  if (b.kind === "multiple") return b.options.map((text, id) => ({ id, text, correct: b.correct.includes(id) }));
  if (b.kind === "scenario") {
    // Scenario options come from the template; the key is drawn per seed, the texts are fixed.
    const { presented } = presentItem(content, itemSeed);
    if (presented.kind !== "single") return null;
    return presented.options.map((o) => ({ id: o.id, text: o.text, correct: false }));
  }
  return null;
}

function chosenIds(answer: unknown): number[] | null {
  if (!answer || typeof answer !== "object") return null;
  const a = answer as { kind?: string; choice?: number; choices?: number[] };
  if (a.kind === "single" && typeof a.choice === "number") return [a.choice];
  if (a.kind === "multiple" && Array.isArray(a.choices)) return a.choices;
  return null;
}

/** The analysis of one exam version, or null when the exam is not the organisation's. */
export async function examItemAnalysis(orgId: string, examId: string, requestedVersion: number | null): Promise<ItemAnalysisView | "no-such-version" | null> {
  const { db } = await database();
  const [exam] = await db.select({ id: exams.id, title: exams.title, currentVersionId: exams.currentVersionId }).from(exams).where(and(eq(exams.orgId, orgId), eq(exams.id, examId)));
  if (!exam) return null;
  const versions = await db.select().from(examVersions).where(and(eq(examVersions.orgId, orgId), eq(examVersions.examId, examId))).orderBy(desc(examVersions.version));
  if (versions.length === 0) return null;
  const versionIds = versions.map((v) => v.id);
  const graded = await db
    .select({ id: attempts.id, examVersionId: attempts.examVersionId, attemptNumber: attempts.attemptNumber, form: attempts.form, rawScore: attempts.rawScore })
    .from(attempts)
    .where(and(eq(attempts.orgId, orgId), inArray(attempts.examVersionId, versionIds), isNotNull(attempts.submittedAt), isNotNull(attempts.rawScore)))
    .orderBy(asc(attempts.startedAt), asc(attempts.id));
  const perVersion = versions.map((v) => {
    const own = graded.filter((a) => a.examVersionId === v.id);
    return { version: v.version, examinees: own.filter((a) => a.attemptNumber === 1).length, retakes: own.filter((a) => a.attemptNumber !== 1).length, live: v.id === exam.currentVersionId };
  });

  let chosen = requestedVersion !== null ? versions.find((v) => v.version === requestedVersion) : undefined;
  if (requestedVersion !== null && !chosen) return "no-such-version";
  if (!chosen) {
    const live = versions.find((v) => v.id === exam.currentVersionId);
    const withAttempts = (v: (typeof versions)[number]) => graded.some((a) => a.examVersionId === v.id && a.attemptNumber === 1);
    chosen = (live && withAttempts(live) ? live : versions.find(withAttempts)) ?? live ?? versions[0];
  }
  const version = chosen;
  const sittings = graded.filter((a) => a.examVersionId === version.id && a.attemptNumber === 1);
  const retakesExcluded = graded.filter((a) => a.examVersionId === version.id && a.attemptNumber !== 1).length;

  const saved = sittings.length
    ? await db
        .select({ attemptId: responses.attemptId, position: responses.position, itemVersionId: responses.itemVersionId, answer: responses.answer, score: responses.score })
        .from(responses)
        .innerJoin(attempts, eq(attempts.id, responses.attemptId))
        .where(and(eq(responses.orgId, orgId), eq(attempts.orgId, orgId), eq(attempts.examVersionId, version.id), eq(attempts.attemptNumber, 1), isNotNull(attempts.submittedAt)))
    : [];
  const byAttempt = new Map<string, Map<number, (typeof saved)[number]>>();
  for (const r of saved) {
    const m = byAttempt.get(r.attemptId) ?? new Map();
    m.set(r.position, r);
    byAttempt.set(r.attemptId, m);
  }

  type Seen = { entry: StoredFormEntry; itemVersionId: string; answer: unknown };
  const seenOf: Map<string, Seen>[] = [];
  const forms = sittings.map((a) => {
    const answers = byAttempt.get(a.id) ?? new Map();
    const seen = new Map<string, Seen>();
    const items = (a.form as StoredFormEntry[]).map((entry) => {
      const r = answers.get(entry.position);
      seen.set(entry.itemId, { entry, itemVersionId: r?.itemVersionId ?? entry.itemVersionId, answer: r?.answer ?? null });
      // A closed attempt was graded place by place (finishAttempt); a missing score counts as 0.
      return { itemId: entry.itemId, score: r?.score ?? 0 };
    });
    seenOf.push(seen);
    return { items };
  });
  const analysis = analyzeForms(forms);

  const seenVersionIds = [...new Set(seenOf.flatMap((m) => [...m.values()].map((s) => s.itemVersionId)))];
  const [versionRows, topicMap, topicRows] = await Promise.all([
    seenVersionIds.length ? db.select().from(itemVersions).where(and(eq(itemVersions.orgId, orgId), inArray(itemVersions.id, seenVersionIds))) : Promise.resolve([]),
    topicsOf(db, seenVersionIds),
    db.select({ slug: topics.slug, name: topics.name }).from(topics).where(eq(topics.orgId, orgId)),
  ]);
  const versionById = new Map(versionRows.map((v) => [v.id, v]));
  const contentById = new Map(versionRows.map((v) => [v.id, contentOf(v, topicMap.get(v.id) ?? [])]));
  const topicName = new Map(topicRows.map((t) => [t.slug, t.name]));

  const items: AnalysedItem[] = analysis.items.map((s) => {
    const seen = s.members.map((m) => ({ ...m, seen: seenOf[m.examinee].get(s.itemId)! }));
    const versionsSeen = [...new Set(seen.map((m) => versionById.get(m.seen.itemVersionId)?.version ?? 0))].sort((a, b) => a - b);
    const newest = [...seen].sort((a, b) => (versionById.get(b.seen.itemVersionId)?.version ?? 0) - (versionById.get(a.seen.itemVersionId)?.version ?? 0))[0];
    const content = contentById.get(newest.seen.itemVersionId)!;
    const kind = kindOf(content);
    const unanswered = { all: 0, upper: 0, lower: 0 };
    let options: OptionChoice[] | null = null;
    if (kind === "single" || kind === "multiple") {
      const table = new Map<string, OptionChoice>();
      const optionCache = new Map<string, ReturnType<typeof optionsOf>>();
      for (const m of seen) {
        const c = contentById.get(m.seen.itemVersionId)!;
        let shown = optionCache.get(m.seen.itemVersionId);
        if (shown === undefined) {
          shown = optionsOf(c, m.seen.entry.itemSeed);
          optionCache.set(m.seen.itemVersionId, shown);
        }
        if (!shown) continue;
        // A scenario item's key depends on the seed; its right answer is the one that scored.
        const keyed = c.body.kind === "scenario" ? presentItem(c, m.seen.entry.itemSeed).key : null;
        for (const o of shown) {
          const correct = keyed && keyed.kind === "single" ? keyed.correct === o.id : o.correct;
          const row = table.get(o.text) ?? { text: o.text, correct: false, all: 0, upper: 0, lower: 0 };
          // A scenario item's option counts as right when it was the key for anyone who saw it.
          row.correct ||= correct;
          table.set(o.text, row);
        }
        const ids = chosenIds(m.seen.answer);
        if (!ids || ids.length === 0) {
          unanswered.all += 1;
          unanswered.upper += m.upper;
          unanswered.lower += m.lower;
          continue;
        }
        for (const id of ids) {
          const o = shown.find((x) => x.id === id);
          if (!o) continue;
          const row = table.get(o.text)!;
          row.all += 1;
          row.upper += m.upper;
          row.lower += m.lower;
        }
      }
      options = [...table.values()];
    } else {
      for (const m of seen) {
        if (m.seen.answer === null) {
          unanswered.all += 1;
          unanswered.upper += m.upper;
          unanswered.lower += m.lower;
        }
      }
    }
    const unusedOptions = options ? options.filter((o) => !o.correct && o.all === 0).length : 0;
    const wrongAnswers = seen.filter((m) => m.score < 1).length;
    // A scenario stem has placeholders for the numbers drawn per attempt: show it as one examinee saw it.
    const stem = content.body.kind === "scenario" ? presentItem(content, newest.seen.entry.itemSeed).presented.stem : content.stem;
    const drawnFor = [...new Set(seen.map((m) => m.seen.entry.topic))].map((slug) => topicName.get(slug) ?? slug).sort();
    return {
      itemId: s.itemId,
      stem,
      stemStart: stemStartOf(stem),
      topics: drawnFor,
      versionsSeen,
      kind,
      seenBy: s.seenBy,
      p: s.p,
      pointBiserial: s.pointBiserial,
      correctedPointBiserial: s.correctedPointBiserial,
      discrimination: s.discrimination,
      upperCorrect: s.upperCorrect,
      lowerCorrect: s.lowerCorrect,
      groupSize: s.groupSize,
      flags: itemFlags(s, unusedOptions, wrongAnswers),
      fewAnswers: s.seenBy < FLAG_THRESHOLDS.minItemAnswers,
      options,
      unanswered,
    };
  });
  // Flagged items first (most flags first), then by topic and stem.
  items.sort((a, b) => b.flags.length - a.flags.length || a.topics.join().localeCompare(b.topics.join()) || a.stem.localeCompare(b.stem));

  const k = analysis.formLength;
  let passBand: ItemAnalysisView["passBand"] = null;
  if (k !== null && analysis.sem !== null) {
    const cut = (k * version.passMarkPercent) / 100;
    const band = semBand(cut, analysis.sem);
    passBand = {
      cut,
      low: band.low,
      high: band.high,
      lowPercent: (band.low * 100) / k,
      highPercent: (band.high * 100) / k,
      inside: analysis.totals.filter((t) => t >= band.low && t <= band.high).length,
    };
  }
  const top = k ?? Math.ceil(Math.max(0, ...analysis.totals));
  const distribution = Array.from({ length: top + 1 }, (_, score) => ({ score, count: 0 }));
  for (const t of analysis.totals) distribution[Math.min(top, Math.floor(t + 1e-9))].count += 1;

  return {
    exam: { id: exam.id, title: exam.title },
    version: { id: version.id, version: version.version, passMarkPercent: version.passMarkPercent, live: version.id === exam.currentVersionId },
    versions: perVersion,
    examinees: analysis.examinees,
    retakesExcluded,
    smallSample: analysis.examinees < FLAG_THRESHOLDS.minExaminees,
    summary: {
      method: analysis.method,
      formLength: k,
      mean: analysis.mean,
      variance: analysis.variance,
      sd: analysis.sd,
      sumItemVariance: analysis.sumItemVariance,
      kr20: analysis.kr20,
      kr21: analysis.kr21,
      sem: analysis.sem,
      varianceKind: analysis.varianceKind,
      meanPercent: k && analysis.mean !== null ? (analysis.mean * 100) / k : null,
    },
    passBand,
    distribution: analysis.examinees > 0 ? distribution : [],
    groupRule: GROUP_RULE_TEXT,
    items,
  };
}
