/**
 * What `npm run bench` prints and keeps: the detailed tables, the JSON written to
 * bench-results.json (with the whole-product `summary`, tests/bench/summary.ts), and the change
 * against the previous run's file. Figures only — targets are judged in tests/bench/targets.ts.
 */
import type { BundleFigure } from "./bundle-size";
import type { HttpFigure } from "./http";
import type { SimFigure } from "./sim";
import type { SummaryRow } from "./summary";

export type BenchResults = {
  /** Bumped when the shape changes, so a comparison never mixes shapes (2: `summary` added). */
  format: 2;
  timestamp: string;
  machine: { cpus: number; cpuModel: string; platform: string; release: string; node: string; totalMemoryGB: number; loadAverage1m: number };
  git: { commit: string; uncommittedChanges: boolean };
  settings: Record<string, unknown>;
  http: HttpFigure[];
  sim: SimFigure[];
  bundle: BundleFigure | null;
  /** The whole-product table's rows, as printed last (tests/bench/summary.ts). */
  summary: SummaryRow[];
  errors: string[];
};

export function table(headers: string[], rows: string[][], rightAligned: boolean[]): string {
  const widths = headers.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) => cells.map((c, i) => (rightAligned[i] ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join("  ");
  return [line(headers), widths.map((w) => "-".repeat(w)).join("  "), ...rows.map(line)].join("\n");
}

const fixed = (x: number, places = 1) => (Number.isFinite(x) ? x.toFixed(places) : "—");

export function formatHttp(figures: HttpFigure[]): string {
  const rows = figures.map((f) => [
    f.name,
    fixed(f.requestsPerSecond, 0),
    fixed(f.p50Ms),
    fixed(f.p95Ms),
    fixed(f.p99Ms),
    String(f.non2xx + f.errors),
    `${f.reference.label} ~${f.reference.requestsPerSecond} (${Math.round((f.requestsPerSecond / f.reference.requestsPerSecond) * 100)} %)`,
  ]);
  return table(["route", "req/s", "p50 ms", "p95 ms", "p99 ms", "non-2xx", "STACK.md reference req/s (this run as % of it; context, not a target)"], rows, [false, true, true, true, true, true, false]);
}

export function formatSim(figures: SimFigure[]): string {
  const rows = figures.map((f) => [
    f.mode,
    f.scenario,
    `${fixed(f.simulatedS, 1)} s / ${f.breaths}`,
    fixed(f.medianMs, 3),
    fixed(f.p90Ms, 3),
    `< ${f.targetMs} ms: ${f.meetsTarget ? "met" : "NOT met"}`,
  ]);
  return table(["mode", "scenario", "simulated / breaths", "median ms", "p90 ms", "target"], rows, [false, false, true, true, true, false]);
}

export function formatBundle(b: BundleFigure): string {
  const rows = b.files.map((f) => [f.file, f.kind, (f.bytes / 1024).toFixed(2), (f.gzipBytes / 1024).toFixed(2)]);
  rows.push(["total JavaScript the Bench route adds", "", b.jsRawKB.toFixed(2), b.jsGzipKB.toFixed(2)]);
  return [
    table(["chunk", "loaded", "KB", "KB gzip"], rows, [false, false, true, true]),
    `Target: under ${b.targetKB} KB gzipped — ${b.meetsTarget ? "met" : "NOT met"} (${b.jsGzipKB.toFixed(2)} KB, of which ${b.lazyGzipKB.toFixed(2)} KB loaded later by import()).`,
    `For context: the shell every signed-in page loads is ${b.shellJsGzipKB.toFixed(2)} KB gzipped; the Bench route's own CSS ${b.cssGzipKB.toFixed(2)} KB gzipped.`,
  ].join("\n");
}

function change(label: string, before: number | undefined, after: number, unit: string, places: number): string | null {
  if (before === undefined || !Number.isFinite(before) || !Number.isFinite(after)) return null;
  const delta = after - before;
  const pct = before !== 0 ? ` (${delta >= 0 ? "+" : ""}${((delta / before) * 100).toFixed(1)} %)` : "";
  return `  ${label}: ${before.toFixed(places)} → ${after.toFixed(places)}${unit ? ` ${unit}` : ""}${pct}`;
}

/** The change of every figure present in both runs, as lines to print. */
export function compareWithPrevious(previous: BenchResults, current: BenchResults): string[] {
  const lines = [`Change since the previous run (${previous.timestamp}, ${previous.machine.cpus} CPUs, node ${previous.machine.node}):`];
  for (const now of current.http) {
    const was = previous.http.find((h) => h.name === now.name);
    if (!was) continue;
    lines.push(
      ...[
        change(`${now.name} req/s`, was.requestsPerSecond, now.requestsPerSecond, "", 0),
        change(`${now.name} p50`, was.p50Ms, now.p50Ms, "ms", 1),
        change(`${now.name} p95`, was.p95Ms, now.p95Ms, "ms", 1),
        change(`${now.name} p99`, was.p99Ms, now.p99Ms, "ms", 1),
      ].filter((l): l is string => l !== null),
    );
  }
  for (const now of current.sim) {
    const was = previous.sim.find((s) => s.mode === now.mode);
    const line = was ? change(`simulate 60 s, ${now.mode} (median)`, was.medianMs, now.medianMs, "ms", 3) : null;
    if (line) lines.push(line);
  }
  if (previous.bundle && current.bundle) {
    const line = change("Bench route JavaScript, gzipped", previous.bundle.jsGzipKB, current.bundle.jsGzipKB, "KB", 2);
    if (line) lines.push(line);
  }
  // The whole-product rows, by name: every timed row of the summary present in both runs.
  for (const now of current.summary ?? []) {
    const was = (previous.summary ?? []).find((r) => r.name === now.name);
    if (!was || current.http.some((h) => h.name === now.name)) continue;
    lines.push(
      ...[
        was.requestsPerSecond !== null && now.requestsPerSecond !== null ? change(`${now.name} req/s`, was.requestsPerSecond, now.requestsPerSecond, "", 0) : null,
        was.p95Ms !== null && now.p95Ms !== null ? change(`${now.name} p95`, was.p95Ms, now.p95Ms, "ms", 2) : null,
      ].filter((l): l is string => l !== null),
    );
  }
  if (lines.length === 1) lines.push("  (no figure in common)");
  return lines;
}
