/**
 * Adopting a modified Angoff panel's cut as an exam's pass mark (issue 6, item 3). The panel is
 * the one after round 2 (angoff.server.ts); the pass mark is its cut percent rounded half up to
 * one decimal. Adopting saves a new version identical to the live one except its pass mark and
 * publishes it, through the authoring service's own save and publish (exams-authoring.server.ts),
 * then records "exam.cut-adopted" with the panel's figures.
 */
import type { ExamSettings } from "~/routes/bank/exam-form";
import { recordAudit } from "../audit.server";
import { database } from "../client.server";
import { angoffPage } from "./angoff.server";
import { blueprintOf, feasibility, getExam, publishExam, saveExamVersion } from "./exams-authoring.server";
import { adoptedPercent } from "~/routes/bank/angoff-form";


export type AdoptResult = { ok: true; version: number; passMarkPercent: number } | { ok: false; reason: "not-found" } | { ok: false; reason: "refused"; message: string };

/**
 * Adopts the panel's cut (after round 2) as the pass mark: a new exam version identical to the
 * live one except its pass mark, published at once, and an "exam.cut-adopted" event with the
 * panel's figures. `expectedPercent` is the figure the educator confirmed; if the panel has
 * moved since, nothing is changed.
 */
export async function adoptPanelCut(orgId: string, actorId: string, examId: string, expectedPercent: number | null, now = new Date()): Promise<AdoptResult> {
  const view = await angoffPage(orgId, examId, actorId, { recentForms: 0 });
  if (!view) return { ok: false, reason: "not-found" };
  const refuse = (message: string): AdoptResult => ({ ok: false, reason: "refused", message });
  const exam = (await getExam(orgId, examId))!;
  if (!exam.live) return refuse("This exam has never been published. Publish it first; the cut is adopted as a new version of the live exam.");
  if (exam.status === "retired") return refuse("This exam is retired. Publish it again first if it should be used with a new pass mark.");
  if (view.newerDraft !== null) {
    return refuse(`Version ${view.newerDraft} is a saved draft newer than the live version ${exam.live.version}. Publish it (or edit it to match) first, so adopting the cut does not overtake it.`);
  }
  const { panel } = view.final;
  if (!panel) return refuse(view.final.reason ?? "The panel has no cut yet.");
  const percent = adoptedPercent(panel.cutPercent);
  if (expectedPercent !== null && expectedPercent !== percent) return refuse(`The panel's cut is now ${percent} % (you confirmed ${expectedPercent} %): ratings changed since the page was opened. Look at the panel again.`);
  if (percent < 1) return refuse(`The panel's cut is ${percent} %; a pass mark must be from 1 to 100 %.`);
  if (percent === exam.live.passMarkPercent) return refuse(`The pass mark is already ${percent} %.`);
  const problems = await feasibility(orgId, blueprintOf(exam.live));
  if (problems.length > 0) return refuse(`The live blueprint cannot be drawn from the bank today, so a new version cannot be published: ${problems.map((p) => p.message).join(" ")}`);

  const v = exam.live;
  const settings: ExamSettings = {
    title: exam.title,
    description: v.description,
    blueprint: blueprintOf(v),
    timeLimitMinutes: v.timeLimitMinutes,
    passMarkPercent: percent,
    attemptsAllowed: v.attemptsAllowed,
    shuffleItems: v.shuffleItems,
    shuffleOptions: v.shuffleOptions,
    reviewPolicy: v.reviewPolicy,
    multipleResponseScoring: v.multipleResponseScoring,
    orderingScoring: v.orderingScoring,
    availableFrom: v.availableFrom,
    availableUntil: v.availableUntil,
  };
  // Both writes are queued on the one writer queue with no await between the calls, so no other
  // write can land between saving the new version and publishing it (publishing takes the newest).
  const saving = saveExamVersion(orgId, actorId, examId, settings, now);
  const publishing = publishExam(orgId, actorId, examId, now);
  const [saved, published] = await Promise.all([saving, publishing]);
  if (!saved.ok) return { ok: false, reason: "not-found" };
  if (!published.ok) return refuse(`Version ${saved.version} was saved with the pass mark ${percent} % but not published: ${published.reason}`);
  const { write } = await database();
  await write((tx) =>
    recordAudit(
      tx,
      {
        orgId,
        actorId,
        action: "exam.cut-adopted",
        entityType: "exam",
        entityId: examId,
        detail: {
          version: published.version,
          previousVersion: v.version,
          previousPassMarkPercent: v.passMarkPercent,
          passMarkPercent: percent,
          method: "modified Angoff (Livingston & Zieky 1982); round 2 replaces round 1 item by item",
          cutItems: panel.cut,
          cutPercent: panel.cutPercent,
          items: panel.itemCount,
          judges: view.final.judges.filter((j) => j.included).map((j) => ({ id: j.judgeId, cut: j.cut })),
          leftOut: view.final.judges.filter((j) => !j.included).map((j) => ({ id: j.judgeId, rated: j.rated })),
          min: panel.min,
          max: panel.max,
          sd: panel.sd,
          sdDivisor: panel.varianceKind === "population" ? "N" : "N-1",
        },
      },
      now,
    ),
  );
  return { ok: true, version: published.version, passMarkPercent: percent };
}

export { adoptedPercent };
