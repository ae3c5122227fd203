/**
 * Item analysis of an exam (issue 6) on a seeded copy of the demo database, whose annual modes
 * exam has graded sittings of the two previous years (seeds/exam-history.ts): the page's loader,
 * the flags on the deliberately flawed items, one p and one corrected point-biserial recomputed
 * by hand from the raw responses (the latter with simple-statistics 7, npm, an independent
 * library), who may see it, the CSV (read back with papaparse) and the one-page PDF (read back
 * with poppler's pdftotext and pdfinfo).
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import Papa from "papaparse";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import * as ss from "simple-statistics";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import type { StoredFormEntry } from "~/db/queries/exam-attempts.server";
import type { ItemAnalysisView } from "~/db/queries/item-analysis.server";
import { attempts, exams, examVersions, items, itemVersions, responses } from "~/db/schema";
import { CSV_HEADER } from "~/routes/bank/analysis-csv";
import * as csvRoute from "~/routes/bank/exam-analysis-csv";
import * as pdfRoute from "~/routes/bank/exam-analysis-pdf";
import * as pageRoute from "~/routes/bank/exam-analysis";
import { FLAWED_ITEMS } from "../../seeds/exam-history";
import { stableId } from "../../seeds/stable-ids";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";

let db: Database;
let educator: Viewer;
let therapist: Viewer;
let otherOrg: Viewer;
let annualExamId = "";
let alarmsExamId = "";
const itemIdOf = (key: string) => stableId(`kv:item:${key}`);

const page = (viewer: Viewer, examId: string, query = "") =>
  outcome(pageRoute.loader(args<ArgsOf<typeof pageRoute.loader>>(getRequest(`/bank/exams/${examId}/analysis${query}`), viewer, { examId })));
const csv = (viewer: Viewer, examId: string) => csvRoute.loader(args<ArgsOf<typeof csvRoute.loader>>(getRequest(`/bank/exams/${examId}/analysis.csv`), viewer, { examId }));
const pdf = (viewer: Viewer, examId: string) => pdfRoute.loader(args<ArgsOf<typeof pdfRoute.loader>>(getRequest(`/bank/exams/${examId}/analysis.pdf`), viewer, { examId }));

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  therapist = await viewerFor("therapist@kestrelvalley.test");
  // An educator of another organisation (Alder Bay has none, so one is made up in memory).
  otherOrg = { ...(await viewerFor("admin@alderbay.test")), roles: ["educator"] };
  const rows = await db.db.select({ id: exams.id, title: exams.title }).from(exams).where(eq(exams.orgId, educator.org.id));
  annualExamId = rows.find((e) => e.title === "Annual ventilation modes exam")!.id;
  alarmsExamId = rows.find((e) => e.title === "Alarm reasoning and waveform exam")!.id;
});

/** The raw first sittings of the annual exam's version 1, straight from the tables. */
async function rawSittings() {
  const [v1] = await db.db.select().from(examVersions).where(and(eq(examVersions.examId, annualExamId), eq(examVersions.version, 1)));
  const sat = await db.db.select().from(attempts).where(and(eq(attempts.examVersionId, v1.id), eq(attempts.attemptNumber, 1)));
  const saved = await db.db.select().from(responses);
  return sat.map((a) => ({
    attempt: a,
    byItem: new Map(
      (a.form as StoredFormEntry[]).map((f) => [f.itemId, saved.find((r) => r.attemptId === a.id && r.position === f.position)!]),
    ),
  }));
}

describe("the analysis page of the annual modes exam", () => {
  let view: ItemAnalysisView;
  beforeAll(async () => {
    const result = await page(educator, annualExamId);
    expect(result.status).toBe(200);
    view = result.body as ItemAnalysisView;
  });

  it("analyses the seeded first sittings of version 1 as random forms of 20 items, retakes counted apart", async () => {
    const raw = await rawSittings();
    const retakes = await db.db.select({ id: attempts.id, n: attempts.attemptNumber }).from(attempts).innerJoin(examVersions, eq(examVersions.id, attempts.examVersionId)).where(eq(examVersions.examId, annualExamId));
    expect(view.version).toMatchObject({ version: 1, passMarkPercent: 80, live: true });
    expect(view.examinees).toBe(raw.length);
    expect(view.examinees).toBeGreaterThanOrEqual(50);
    expect(view.retakesExcluded).toBe(retakes.filter((r) => r.n > 1).length);
    expect(view.retakesExcluded).toBeGreaterThan(0);
    expect(view.smallSample).toBe(false);
    expect(view.summary).toMatchObject({ method: "random-forms", formLength: 20, varianceKind: "population" });
    // The mean is the mean of the stored raw scores (finishAttempt's grading, replayed by the seed).
    expect(view.summary.mean).toBeCloseTo(ss.mean(raw.map((r) => r.attempt.rawScore!)), 10);
    expect(view.summary.sd).toBeCloseTo(ss.standardDeviation(raw.map((r) => r.attempt.rawScore!)), 10);
    for (const key of ["kr20", "kr21"] as const) {
      expect(view.summary[key]).toBeGreaterThan(0.3);
      expect(view.summary[key]).toBeLessThan(1);
    }
    // SEM = SD · √(1 − KR-20) (Lane, Online Statistics Education, glossary).
    expect(view.summary.sem).toBeCloseTo(view.summary.sd! * Math.sqrt(1 - view.summary.kr20!), 12);
    // The band around the pass mark: 80 % of 20 items = 16, ± one SEM.
    expect(view.passBand!.cut).toBe(16);
    expect(view.passBand!.low).toBeCloseTo(16 - view.summary.sem!, 12);
    expect(view.passBand!.inside).toBe(raw.filter((r) => Math.abs(r.attempt.rawScore! - 16) <= view.summary.sem!).length);
    // The distribution counts every examinee once, on 0…20.
    expect(view.distribution).toHaveLength(21);
    expect(ss.sum(view.distribution.map((d) => d.count))).toBe(view.examinees);
  });

  it("p of the everyone-right item, recomputed by hand from the raw responses, and it is flagged too easy", async () => {
    const itemId = itemIdOf(FLAWED_ITEMS.easy);
    const scores = (await rawSittings()).flatMap((r) => (r.byItem.has(itemId) ? [r.byItem.get(itemId)!.score!] : []));
    const item = view.items.find((i) => i.itemId === itemId)!;
    expect(item.seenBy).toBe(scores.length);
    // p = right answers ÷ examinees who saw it.
    expect(item.p).toBeCloseTo(scores.filter((s) => s === 1).length / scores.length, 12);
    expect(item.p).toBeGreaterThan(0.9);
    expect(item.flags).toContain("too-easy");
  });

  it("the item stronger examinees miss has a negative corrected point-biserial (checked with simple-statistics) and is flagged", async () => {
    const itemId = itemIdOf(FLAWED_ITEMS.negative);
    const seen = (await rawSittings()).filter((r) => r.byItem.has(itemId));
    const s = seen.map((r) => r.byItem.get(itemId)!.score!);
    const rest = seen.map((r, i) => r.attempt.rawScore! - s[i]);
    const item = view.items.find((i) => i.itemId === itemId)!;
    expect(item.correctedPointBiserial).toBeCloseTo(ss.sampleCorrelation(s, rest), 12);
    expect(item.correctedPointBiserial).toBeLessThan(0);
    expect(item.flags).toContain("negative-discrimination");
    expect(item.flags).not.toContain("weak-discrimination");
    // Its option table: the key, and the option the upper group fell for.
    expect(item.options!.find((o) => o.correct)!.text).toMatch(/^About 8 cmH2O/);
    const lure = item.options!.find((o) => /PEEP plus auto-PEEP/.test(o.text))!;
    expect(lure.upper).toBeGreaterThan(lure.lower);
  });

  it("an option nobody chose is named on the item", () => {
    const item = view.items.find((i) => i.itemId === itemIdOf(FLAWED_ITEMS.deadDistractor))!;
    expect(item.flags).toContain("unused-option");
    const unused = item.options!.filter((o) => !o.correct && o.all === 0);
    expect(unused.length).toBeGreaterThanOrEqual(1);
    // Every answer given is counted once against an option or as no answer.
    expect(ss.sum(item.options!.map((o) => o.all)) + item.unanswered.all).toBe(item.seenBy);
  });

  it("lists flagged items first, each linking to its edit page", () => {
    const firstUnflagged = view.items.findIndex((i) => i.flags.length === 0);
    expect(view.items.slice(firstUnflagged).every((i) => i.flags.length === 0)).toBe(true);
    expect(view.items.every((i) => i.stemStart.length > 0 && i.topics.length > 0)).toBe(true);
  });

  it("answers an exam without sittings with an empty analysis, and an unknown version with 404", async () => {
    const empty = await page(educator, alarmsExamId);
    expect(empty.status).toBe(200);
    expect((empty.body as ItemAnalysisView).examinees).toBe(0);
    expect((await page(educator, annualExamId, "?version=9")).status).toBe(404);
    expect((await page(educator, annualExamId, "?version=abc")).status).toBe(404);
    expect((await page(educator, annualExamId, "?version=1")).status).toBe(200);
  });
});

describe("who may see it", () => {
  it("another organisation's educator finds no such exam (404), on the page, the CSV and the PDF", async () => {
    expect((await page(otherOrg, annualExamId)).status).toBe(404);
    expect((await outcome(csv(otherOrg, annualExamId))).status).toBe(404);
    expect((await outcome(pdf(otherOrg, annualExamId))).status).toBe(404);
  });

  it("a therapist is refused (403)", async () => {
    expect((await page(therapist, annualExamId)).status).toBe(403);
    expect((await outcome(csv(therapist, annualExamId))).status).toBe(403);
    expect((await outcome(pdf(therapist, annualExamId))).status).toBe(403);
  });
});

describe("the CSV export", () => {
  it("has the header and one row per item, and neutralises a stem a spreadsheet would run as a formula", async () => {
    // An educator's stem that starts like a formula (OWASP, "CSV Injection").
    const itemId = itemIdOf(FLAWED_ITEMS.easy);
    const hostile = "=HYPERLINK(\"http://example.test\",\"A time-triggered breath\")";
    await db.write((tx) => tx.update(itemVersions).set({ stem: hostile }).where(eq(itemVersions.itemId, itemId)));
    const response = (await csv(educator, annualExamId)) as Response;
    expect(response.headers.get("Content-Type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("Content-Disposition")).toMatch(/^attachment; filename="item-analysis-Annual-ventilation-modes-exam-v1\.csv"$/);
    const parsed = Papa.parse<string[]>(await response.text(), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, ...rows] = parsed.data;
    expect(header).toEqual([...CSV_HEADER]);
    const view = (await page(educator, annualExamId)).body as ItemAnalysisView;
    expect(rows).toHaveLength(view.items.length);
    const row = rows.find((r) => r[0] === itemId)!;
    expect(row[1]).toBe(`'${hostile}`);
    expect(Number(row[6])).toBeCloseTo(view.items.find((i) => i.itemId === itemId)!.p, 4);
    expect(row[13]).toContain("Too easy");
    const negative = rows.find((r) => r[0] === itemIdOf(FLAWED_ITEMS.negative))!;
    expect(Number(negative[8])).toBeLessThan(0);
    // A negative number is a number, not a formula: it stays as it is.
    expect(negative[8]).toMatch(/^-0\.\d{4}$/);
  });
});

describe("the PDF", () => {
  it("is one page with the exam title, KR-20 and the caution, read back by poppler", async () => {
    const response = (await pdf(educator, annualExamId)) as Response;
    expect(response.headers.get("Content-Type")).toBe("application/pdf");
    const dir = mkdtempSync(path.join(tmpdir(), "tidemark-analysis-pdf-"));
    const file = path.join(dir, "analysis.pdf");
    writeFileSync(file, Buffer.from(await response.arrayBuffer()));
    const info = execFileSync("pdfinfo", [file], { encoding: "utf8" });
    expect(info).toMatch(/^Pages:\s+1$/m);
    // Lines wrap where the page ends them; compare words, not line breaks.
    const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    expect(text).toContain("Annual ventilation modes exam");
    expect(text).toContain("KR-20");
    expect(text).toContain("KR-21");
    expect(text).toMatch(/Flagged items \(\d+ of \d+\)/);
    expect(text).toContain("For educational use");
    expect(text).toContain("Follow local policy");
    const view = (await page(educator, annualExamId)).body as ItemAnalysisView;
    expect(text).toContain(`KR-20: ${view.summary.kr20!.toFixed(3)}`);
    const fonts = execFileSync("pdffonts", [file], { encoding: "utf8" });
    expect(fonts).toMatch(/SourceSans3/i);
  });

  it("is still one page, with nothing flagged, for an exam nobody has sat; its CSV is the header alone", async () => {
    const response = (await pdf(educator, alarmsExamId)) as Response;
    const dir = mkdtempSync(path.join(tmpdir(), "tidemark-analysis-pdf-"));
    const file = path.join(dir, "empty.pdf");
    writeFileSync(file, Buffer.from(await response.arrayBuffer()));
    expect(execFileSync("pdfinfo", [file], { encoding: "utf8" })).toMatch(/^Pages:\s+1$/m);
    const text = execFileSync("pdftotext", [file, "-"], { encoding: "utf8" }).replace(/\s+/g, " ");
    expect(text).toContain("Alarm reasoning and waveform exam");
    expect(text).toContain("0 examinees");
    expect(text).toContain("No item is flagged.");
    const rows = Papa.parse<string[]>(await ((await csv(educator, alarmsExamId)) as Response).text(), { skipEmptyLines: true }).data;
    expect(rows).toEqual([[...CSV_HEADER]]);
  });
});

/** The page as the server renders it, from its real loader (as exams-authoring-pages.test.tsx does). */
async function renderPage(examId: string): Promise<string> {
  const path = `/bank/exams/${examId}/analysis`;
  const data = await pageRoute.loader(args<ArgsOf<typeof pageRoute.loader>>(getRequest(path), educator, { examId }));
  const Page = pageRoute.default as unknown as (props: Record<string, unknown>) => React.ReactElement;
  const Component = () => <Page loaderData={data} actionData={undefined} params={{ examId }} matches={[]} />;
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component }]);
  const context = await handler.query(new Request(`http://localhost${path}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  const router = createStaticRouter(handler.dataRoutes, context);
  return renderToString(<StaticRouterProvider router={router} context={context} hydrate={false} />).replaceAll("<!-- -->", "");
}

describe("the page as rendered", () => {
  it("draws the distribution as an SVG with a text alternative, explains flags in words, and links to edit, CSV and PDF", async () => {
    const html = await renderPage(annualExamId);
    const view = (await page(educator, annualExamId)).body as ItemAnalysisView;
    // The chart is an image named by its caption, which lists every non-empty score with its count.
    expect(html).toMatch(/<svg[^>]*role="img"[^>]*aria-labelledby="distribution-caption"/);
    const caption = html.match(/<figcaption id="distribution-caption"[^>]*>([\s\S]*?)<\/figcaption>/)![1];
    for (const d of view.distribution.filter((b) => b.count > 0)) expect(caption).toContain(`${d.score}: ${d.count}`);
    expect(html).toContain("<summary>The distribution as a table</summary>");
    expect(html).toContain("KR-20");
    expect(html).toContain("Variances divide by N (population variance)");
    expect(html).toContain(view.groupRule.replaceAll("'", "&#x27;"));
    expect(html).toContain("Negative discrimination.</strong> Its corrected point-biserial is below 0");
    expect(html).toContain(`href="/bank/items/${itemIdOf(FLAWED_ITEMS.negative)}/edit"`);
    expect(html).toContain("Option choices by the upper and lower groups");
    expect(html).toContain(`href="/bank/exams/${annualExamId}/analysis.csv"`);
    expect(html).toContain(`href="/bank/exams/${annualExamId}/analysis.pdf"`);
  });

  it("says plainly when nobody has sat the exam", async () => {
    expect(await renderPage(alarmsExamId)).toContain("Nobody has completed a graded sitting of this version yet");
  });
});

// Keep the item table honest about which items exist: every analysed item is an item of the bank.
describe("item identity", () => {
  it("every analysed item is a bank item of the organisation", async () => {
    const view = (await page(educator, annualExamId)).body as ItemAnalysisView;
    const bank = new Set((await db.db.select({ id: items.id }).from(items).where(eq(items.orgId, educator.org.id))).map((i) => i.id));
    expect(view.items.every((i) => bank.has(i.itemId))).toBe(true);
  });
});
