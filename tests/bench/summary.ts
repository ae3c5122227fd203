/**
 * The whole-product table (issue 11 item 6): one row per measured route or job, with req/s,
 * p50/p95/p99, its ratio to the trivial route of the same build measured in the same run, the
 * targets of the earlier issues (tests/bench/targets.ts) and whether each is met. `npm run bench`
 * prints it last and writes the same rows to bench-results.json as `summary`.
 *
 * The trivial route is GET /healthz of the same build, measured in the same run under the same
 * conditions as the row it is compared with:
 *   - "20 conn": autocannon, 20 connections (the HTTP section's routes and the matrix crowd);
 *   - "1 conn":  one client, requests one after another on one keep-alive connection (one manager's
 *                Team matrix; in-process jobs are set against this one too: the cost of the
 *                cheapest round trip the server makes);
 *   - "shift":   the /healthz probe inside the shift-start mixed load.
 * Ratios: "p95 ×" = this row's p95 ÷ the trivial route's p95 (how many trivial requests one of
 * these costs at the tail); "req/s ÷" = the trivial route's req/s ÷ this row's req/s, only for
 * rows measured at capacity (autocannon): the shift-start rows' rates are set by the scenario.
 */
import type { AutosaveFigure } from "./autosave";
import type { BundleFigure } from "./bundle-size";
import type { HttpFigure, SequentialFigure } from "./http";
import type { CertificateFigure, ReminderRunFigure } from "./reminders";
import type { ScoringFigure } from "./scoring";
import type { ShiftStartFigure } from "./shift-start";
import type { SimFigure } from "./sim";
import { judge, overall, type Judgement } from "./targets";
import type { TeamMatrixFigure } from "./team-matrix";

export type TrivialBasis = "20 conn" | "1 conn" | "shift";

export type SummaryRow = {
  name: string;
  /** How it was measured: "20 conn", "1 conn", "shift start", "in-process", "build". */
  load: string;
  requestsPerSecond: number | null;
  p50Ms: number | null;
  p95Ms: number | null;
  p99Ms: number | null;
  /** Which /healthz figure the ratios use; null when there is none (a size, not a time). */
  trivial: TrivialBasis | null;
  /** p95 ÷ the trivial route's p95. */
  p95VsTrivial: number | null;
  /** The trivial route's req/s ÷ this row's req/s (capacity rows only). */
  trivialRpsVsThis: number | null;
  targets: Judgement[];
  result: ReturnType<typeof overall>;
};

export type SummaryInput = {
  sim?: SimFigure[];
  scoring?: ScoringFigure;
  certificate?: CertificateFigure;
  bundle?: BundleFigure | null;
  http?: HttpFigure[];
  healthzOneConnection?: SequentialFigure;
  teamMatrix?: TeamMatrixFigure;
  reminders?: ReminderRunFigure;
  autosave?: AutosaveFigure;
  shiftStart?: ShiftStartFigure;
};

export const TRIVIAL_ROUTE = "GET /healthz";
const AUTOSAVE_PEOPLE_FOR_TARGET = 300;

const round = (x: number) => Math.round(x * 100) / 100;
const ratio = (a: number | null | undefined, b: number | null | undefined) => (a != null && b != null && Number.isFinite(a) && Number.isFinite(b) && b > 0 ? round(a / b) : null);

/** Builds the rows from whatever parts were measured (a part not measured has no row). */
export function buildSummary(input: SummaryInput): SummaryRow[] {
  const crowdTrivial = input.http?.find((h) => h.name.startsWith(TRIVIAL_ROUTE));
  const oneTrivial = input.healthzOneConnection;
  const shiftTrivial = input.shiftStart?.kinds.find((k) => k.kind === "GET /healthz (probe)");
  const trivialP95: Record<TrivialBasis, number | undefined> = { "20 conn": crowdTrivial?.p95Ms, "1 conn": oneTrivial?.p95Ms, shift: shiftTrivial?.p95Ms };
  const rows: SummaryRow[] = [];
  const add = (r: { name: string; load: string; rps?: number | null; p50?: number | null; p95?: number | null; p99?: number | null; trivial: TrivialBasis | null; targets?: Judgement[] }) => {
    const targets = r.targets ?? [];
    rows.push({
      name: r.name,
      load: r.load,
      requestsPerSecond: r.rps ?? null,
      p50Ms: r.p50 ?? null,
      p95Ms: r.p95 ?? null,
      p99Ms: r.p99 ?? null,
      trivial: r.trivial,
      p95VsTrivial: r.trivial ? ratio(r.p95, trivialP95[r.trivial]) : null,
      trivialRpsVsThis: r.trivial === "20 conn" && r.rps != null ? ratio(crowdTrivial?.requestsPerSecond, r.rps) : null,
      targets,
      result: overall(targets),
    });
  };

  for (const h of input.http ?? []) {
    add({ name: h.name, load: "20 conn", rps: h.requestsPerSecond, p50: h.p50Ms, p95: h.p95Ms, p99: h.p99Ms, trivial: "20 conn" });
  }
  if (oneTrivial) add({ name: `${TRIVIAL_ROUTE} (one client)`, load: "1 conn", p50: oneTrivial.p50Ms, p95: oneTrivial.p95Ms, p99: oneTrivial.p99Ms, trivial: "1 conn" });

  const m = input.teamMatrix;
  if (m?.sequential) {
    const bare = m.bareSql.p95Ms;
    for (const [label, f, r] of [
      ["Team matrix document, one manager", m.sequential.document, m.sequential.ratioDocumentP95],
      ["Team matrix data request, one manager", m.sequential.data, m.sequential.ratioDataP95],
    ] as const) {
      add({ name: label, load: "1 conn", p50: f.p50Ms, p95: f.p95Ms, p99: f.p99Ms, trivial: "1 conn", targets: [judge("team-matrix-p95", f.p95Ms), judge("team-matrix-vs-sql", r ?? ratio(f.p95Ms, bare))] });
    }
  }
  if (m) add({ name: "Team matrix bare SQL (readMatrixRows)", load: "in-process", p50: m.bareSql.p50Ms, p95: m.bareSql.p95Ms, p99: m.bareSql.p99Ms, trivial: "1 conn" });

  for (const s of input.sim ?? []) {
    add({ name: `simulate 60 s, ${s.mode}`, load: "in-process", p50: s.medianMs, p95: s.p95Ms, p99: s.p99Ms, trivial: "1 conn", targets: [judge("sim-60s-median", s.simulatedS >= 60 ? s.medianMs : null, s.simulatedS >= 60 ? undefined : `simulated only ${s.simulatedS} s`)] });
  }
  if (input.scoring) {
    const s = input.scoring;
    add({ name: `grade one ${s.items}-item attempt`, load: "in-process", p50: s.p50Ms, p95: s.p95Ms, p99: s.p99Ms, trivial: "1 conn", targets: [judge("grading-50-items", s.items === 50 ? s.p95Ms : null, s.items === 50 ? undefined : `${s.items} items, the target is for 50`)] });
  }
  if (input.certificate) {
    const c = input.certificate;
    add({ name: "certificate PDF, one render", load: "in-process", p50: c.p50Ms, p95: c.p95Ms, p99: c.p99Ms, trivial: "1 conn", targets: [judge("certificate-pdf-p95", c.p95Ms)] });
  }
  if (input.reminders) {
    const r = input.reminders;
    const why = r.people < 2000 ? `${r.people} people, the target is for 2,000` : undefined;
    add({ name: `reminder daily run, ${r.people} people (one run)`, load: "in-process", p50: r.nextDay.ms, p95: r.nextDay.ms, p99: r.nextDay.ms, trivial: "1 conn", targets: [judge("reminder-run", r.nextDay.ms, why)] });
  }
  if (input.bundle) {
    add({ name: "Bench route JavaScript, gzipped (KB)", load: "build", trivial: null, targets: [judge("bench-bundle-gzip", input.bundle.jsGzipKB)] });
  }
  if (input.autosave) {
    const a = input.autosave;
    const why = a.examinees < AUTOSAVE_PEOPLE_FOR_TARGET ? `scaled: ${a.examinees} examinees, the target is for ${AUTOSAVE_PEOPLE_FOR_TARGET}` : undefined;
    add({
      name: `exam answer save, ${a.examinees} examinees (autosave)`,
      load: "open loop",
      p50: a.p50Ms,
      p95: a.p95Ms,
      p99: a.p99Ms,
      trivial: "1 conn",
      targets: [judge("autosave-p95", a.p95Ms, why), judge("autosave-lost", a.acknowledgedNotFound)],
    });
  }
  if (input.shiftStart) {
    const f = input.shiftStart;
    for (const k of f.kinds) {
      const isSave = k.kind.startsWith("POST /exams/attempts/");
      const why = f.people < AUTOSAVE_PEOPLE_FOR_TARGET ? `scaled: ${f.people} people, the target is for ${AUTOSAVE_PEOPLE_FOR_TARGET}` : undefined;
      add({
        name: `shift start ${k.kind}`,
        load: "shift",
        rps: k.requestsPerSecond,
        p50: k.p50Ms,
        p95: k.p95Ms,
        p99: k.p99Ms,
        trivial: "shift",
        targets: isSave ? [judge("autosave-p95", k.p95Ms, why), judge("autosave-lost", f.saves.acknowledgedNotFound)] : [],
      });
    }
  }
  return rows;
}

/** Milliseconds with as many places as a small figure needs. */
export function ms(x: number | null): string {
  if (x === null || !Number.isFinite(x)) return "—";
  if (x < 1) return x.toFixed(3);
  if (x < 10) return x.toFixed(2);
  return x.toFixed(1);
}

/** Requests per second: whole above 100, one place below. */
export function rps(x: number | null): string {
  if (x === null || !Number.isFinite(x)) return "—";
  return x >= 100 ? x.toFixed(0) : x.toFixed(1);
}

const times = (x: number | null) => (x === null ? "—" : `${x.toFixed(2)}×`);

function figureText(j: Judgement): string {
  if (j.value === null) return "—";
  if (j.unit === "ms") return `${ms(j.value)} ms`;
  if (j.unit === "KB") return `${j.value.toFixed(2)} KB`;
  if (j.unit === "×") return `${j.value.toFixed(2)}×`;
  return `${j.value}`;
}

/** "met (23.8 ms)", "NOT met (686.0 ms)", "not judged (scaled: …)". */
export function verdictText(j: Judgement): string {
  if (j.verdict === "not judged") return `not judged (${j.reason ?? "not measured"}${j.value !== null ? `; ${figureText(j)}` : ""})`;
  return `${j.verdict} (${figureText(j)})`;
}

export const SUMMARY_HEADERS = [
  "measured",
  "load",
  "req/s",
  "p50 ms",
  "p95 ms",
  "p99 ms",
  "p95 ÷ trivial p95",
  "trivial req/s ÷ req/s",
  "target (issue)",
  "result",
] as const;

/** The printed table: one line per target when a row has several (the figure columns on the first). */
export function formatSummary(rows: SummaryRow[], table: (headers: string[], rows: string[][], right: boolean[]) => string): string {
  const lines: string[][] = [];
  for (const r of rows) {
    const figures = [
      r.name,
      r.load,
      rps(r.requestsPerSecond),
      ms(r.p50Ms),
      ms(r.p95Ms),
      ms(r.p99Ms),
      r.p95VsTrivial === null ? "—" : `${times(r.p95VsTrivial)} [${r.trivial}]`,
      times(r.trivialRpsVsThis),
    ];
    if (r.targets.length === 0) lines.push([...figures, "—", "no target"]);
    r.targets.forEach((j, i) => lines.push([...(i === 0 ? figures : figures.map(() => "")), `${j.text} (#${j.issue})`, verdictText(j)]));
  }
  const judged = rows.flatMap((r) => r.targets);
  const count = (v: string) => judged.filter((j) => j.verdict === v).length;
  return [
    table([...SUMMARY_HEADERS], lines, [false, false, true, true, true, true, true, true, false, false]),
    `Targets: ${count("met")} met, ${count("NOT met")} NOT met, ${count("not judged")} not judged, of ${judged.length}; ${rows.filter((r) => r.result === "no target").length} rows have no target.`,
    "The trivial route is GET /healthz of this build in this run, measured the same way as the row: [20 conn] autocannon at 20 connections; [1 conn] one client, one request at a time (in-process jobs and the open-loop autosave are set against it too); [shift] the /healthz probe inside the shift-start load.",
    "\"p95 ÷ trivial p95\" = this row's p95 ÷ the trivial route's p95; \"trivial req/s ÷ req/s\" = the trivial route's req/s ÷ this row's, only for rows measured at capacity (20 conn). Shift-start req/s is the rate the scenario asked for, not a capacity.",
  ].join("\n");
}
