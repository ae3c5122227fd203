/**
 * Loading an exam's item analysis for the page, the CSV and the PDF alike: the optional
 * `?version=N` picks an exam version (default: the live one, or the newest with attempts);
 * another organisation's exam, or a version that does not exist, is a 404.
 */
import { z } from "zod";
import { notFound } from "~/auth/gate.server";
import { examItemAnalysis, type ItemAnalysisView } from "~/db/queries/item-analysis.server";

const NOT_FOUND = "We could not find that exam in your organisation's bank.";
const NO_VERSION = "There is no such version of this exam.";
const versionSchema = z.coerce.number().int().min(1).max(100_000);

/** The ?version= of an analysis address, or null when absent. */
export function requestedVersion(request: Request): number | null {
  const raw = new URL(request.url).searchParams.get("version");
  if (raw === null || raw === "") return null;
  const parsed = versionSchema.safeParse(raw);
  if (!parsed.success) notFound(NO_VERSION, true);
  return parsed.data;
}

export async function loadAnalysis(orgId: string, examId: string, request: Request): Promise<ItemAnalysisView> {
  const view = await examItemAnalysis(orgId, examId, requestedVersion(request));
  if (view === null) notFound(NOT_FOUND, true);
  if (view === "no-such-version") notFound(NO_VERSION, true);
  return view;
}

/** A file name for a download: the exam title and version, safe for a header. */
export function downloadName(view: ItemAnalysisView, ext: "csv" | "pdf"): string {
  const base = `item-analysis-${view.exam.title}-v${view.version.version}`.replace(/[^\w.-]+/g, "-").slice(0, 120);
  return `${base}.${ext}`;
}
