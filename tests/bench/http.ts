/**
 * HTTP throughput and latency with autocannon against the production server on loopback.
 *
 * autocannon reports p50/p90/p97.5/p99 but no p95 (STACK.md), so every response time is
 * collected from its "response" event (high-resolution, ms) and the percentiles are computed
 * here from the raw values by the nearest-rank method; autocannon's own p50/p97.5/p99 are
 * kept beside them as a cross-check. Requests per second is autocannon's average over its
 * one-second samples, the figure STACK.md's reference ceilings were measured with.
 */
import http from "node:http";
import autocannon, { type Instance, type Result } from "autocannon";

export type LoadSettings = { connections: number; durationS: number; warmupS: number; timeoutS: number };

export type RouteTarget = {
  /** What the row is called in the table, e.g. "GET /today (manager)". */
  name: string;
  path: string;
  headers?: Record<string, string>;
  /** STACK.md's reference ceiling for this kind of page, for context only. */
  reference: { label: string; requestsPerSecond: number };
};

export type HttpFigure = {
  name: string;
  path: string;
  requestsPerSecond: number;
  responses: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  /** autocannon's own histogram (2xx only, its rounding), for comparison. */
  autocannon: { p50Ms: number; p97_5Ms: number; p99Ms: number };
  non2xx: number;
  statusCodes: Record<string, number>;
  errors: number;
  timeouts: number;
  durationS: number;
  reference: { label: string; requestsPerSecond: number };
};

/** Nearest-rank percentile (the smallest value with at least p % of values at or below it). */
export function percentile(sorted: Float64Array | number[], p: number): number {
  if (sorted.length === 0) return Number.NaN;
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length, Math.max(1, rank)) - 1];
}

type Run = { result: Result; latencies: Float64Array };

let running: Instance | undefined;
/** Ends the load in progress at once (on Ctrl-C), so its connections do not hold the server open. */
export function stopLoad(): void {
  running?.stop();
}

/** One bounded autocannon run; every response time is kept. */
function load(url: string, headers: Record<string, string>, connections: number, durationS: number, timeoutS: number): Promise<Run> {
  return new Promise((resolve, reject) => {
    let latencies = new Float64Array(1 << 16);
    let count = 0;
    // Bound: autocannon stops itself after `durationS`; this only guards against a hang.
    const guard = setTimeout(() => instance.stop(), (durationS + timeoutS + 15) * 1000);
    const instance = autocannon({ url, connections, duration: durationS, timeout: timeoutS, pipelining: 1, headers }, (error, result) => {
      clearTimeout(guard);
      running = undefined;
      if (error) reject(error);
      else resolve({ result, latencies: latencies.slice(0, count) });
    });
    running = instance;
    instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTimeMs: number) => {
      if (count === latencies.length) {
        const grown = new Float64Array(latencies.length * 2);
        grown.set(latencies);
        latencies = grown;
      }
      latencies[count++] = responseTimeMs;
    });
  });
}

const round2 = (x: number) => Math.round(x * 100) / 100;

export async function measureRoute(baseUrl: string, target: RouteTarget, settings: LoadSettings): Promise<HttpFigure> {
  const url = `${baseUrl}${target.path}`;
  const headers = { ...target.headers };
  // Warm-up: lets the server's JIT, the SQLite page cache and the connection pool settle.
  if (settings.warmupS > 0) await load(url, headers, settings.connections, settings.warmupS, settings.timeoutS);
  const { result, latencies } = await load(url, headers, settings.connections, settings.durationS, settings.timeoutS);
  latencies.sort();
  const statusCodes: Record<string, number> = {};
  for (const [code, stat] of Object.entries(result.statusCodeStats)) statusCodes[code] = stat.count;
  return {
    name: target.name,
    path: target.path,
    requestsPerSecond: round2(result.requests.average),
    responses: latencies.length,
    p50Ms: round2(percentile(latencies, 50)),
    p95Ms: round2(percentile(latencies, 95)),
    p99Ms: round2(percentile(latencies, 99)),
    maxMs: round2(latencies.length ? latencies[latencies.length - 1] : Number.NaN),
    autocannon: { p50Ms: result.latency.p50, p97_5Ms: result.latency.p97_5, p99Ms: result.latency.p99 },
    non2xx: result.non2xx,
    statusCodes,
    errors: result.errors,
    timeouts: result.timeouts,
    durationS: result.duration,
    reference: target.reference,
  };
}

export type SequentialFigure = { name: string; path: string; requests: number; p50Ms: number; p95Ms: number; p99Ms: number; maxMs: number };

/**
 * One client alone: `requests` GETs one after another on one keep-alive connection (after a
 * warm-up of 20), timed from sending to the end of the reply — the trivial route's figure for
 * rows measured the same way (one manager's Team matrix) and for in-process jobs.
 */
export async function measureSequential(baseUrl: string, name: string, path: string, requests = 200, headers: Record<string, string> = {}): Promise<SequentialFigure> {
  const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });
  const once = () =>
    new Promise<number>((resolve, reject) => {
      const t0 = performance.now();
      const request = http.get(`${baseUrl}${path}`, { agent, headers, timeout: 10_000 }, (response) => {
        response.on("data", () => undefined);
        response.on("end", () => (response.statusCode === 200 ? resolve(performance.now() - t0) : reject(new Error(`GET ${path} answered ${response.statusCode}, not 200`))));
        response.on("error", reject);
      });
      request.on("timeout", () => request.destroy(new Error(`GET ${path} timed out`)));
      request.on("error", reject);
    });
  try {
    for (let i = 0; i < 20; i++) await once();
    const times: number[] = [];
    for (let i = 0; i < requests; i++) times.push(await once());
    times.sort((a, b) => a - b);
    return { name, path, requests, p50Ms: round2(percentile(times, 50)), p95Ms: round2(percentile(times, 95)), p99Ms: round2(percentile(times, 99)), maxMs: round2(times[times.length - 1]) };
  } finally {
    agent.destroy();
  }
}
