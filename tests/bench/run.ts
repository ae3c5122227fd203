/**
 * `npm run bench` — Tidemark's performance figures (issue 2 item 11; issue 3 acceptance):
 *
 *   1. the simulator: 60 s of breathing per mode (target under 5 ms each);
 *   2. a fresh production build of the working tree in a temporary folder (tests/bench/build.ts
 *      says why not build/) and the JavaScript the Bench route adds, gzipped (target under 60 KB);
 *   3. HTTP: the large organisation (--people 2000) in its own database file, the production
 *      server on loopback, autocannon on the sign-in page, Today and Team as the manager, and
 *      /healthz, compared with STACK.md's reference ceilings for context; the Team matrix with
 *      40 requirements: its data request under the same load, one manager's sequential document
 *      and data requests beside the bare SQL, and the first request after a loud and a quiet
 *      write (tests/bench/team-matrix.ts);
 *   4. the reminder job over the same 2,000 people (a copy of the database; tests/bench/reminders.ts)
 *      and one certificate PDF render ("reminders.run-2000-people", "certificate.pdf");
 *   5. the exam autosave under a realistic load (issue 5 item 7, tests/bench/autosave.ts): 300
 *      therapists of the same database each saving an answer every 5 s for 2 minutes against a
 *      fresh server of the same build; save p50/p95/p99, answers acknowledged, found, lost.
 *
 * Everything goes to bench-results.json (git-ignored) with the machine and the settings, and
 * the change against the previous file is printed. Targets are reported, never asserted:
 * timing belongs here, not in the test suite. The exit status is 1 only when a part could
 * not be measured.
 *
 * Options: --people N (2000) --duration S (10) --warmup S (3) --connections N (20)
 *          --port N (3200; another free port when taken) --runs N (50, simulator)
 *          --autosave-examinees N (300) --autosave-seconds S (120) --autosave-interval S (5), or
 *          the same as AUTOSAVE_EXAMINEES / AUTOSAVE_SECONDS / AUTOSAVE_INTERVAL (a scaled run,
 *          e.g. AUTOSAVE_SECONDS=30, is reported as "scaled")
 *          --shift-people N (300) --shift-managers N (10) --shift-seconds S (120)
 *          --shift-interval S (5), or SHIFT_PEOPLE / SHIFT_MANAGERS / SHIFT_SECONDS / SHIFT_INTERVAL
 *          (tests/bench/shift-start.ts; anything but the defaults is reported as "scaled")
 *          --only PART[,PART…] runs only those parts: sim, scoring, certificate, bundle, http
 *          (the routes, /healthz and the Team matrix), reminders, autosave, shift-start. The parts
 *          that need them still build (bundle, http, autosave, shift-start) and seed (http,
 *          reminders, autosave, shift-start). Example of a quick scaled run while developing:
 *          `npm run bench -- --only http,shift-start --people 400 --duration 3 --warmup 1
 *          --shift-people 40 --shift-managers 4 --shift-seconds 30`. The summary table then holds
 *          the parts that ran; a ratio whose /healthz figure was not measured shows "—".
 *          --out FILE writes the results (and reads the previous ones) there instead of
 *          bench-results.json, so a scaled run does not replace the full run's figures.
 *
 *   6. the "shift start" mixed load (issue 11 item 6, tests/bench/shift-start.ts): 300 therapists
 *      signing in through the e-mailed code, opening Exams, starting the exam and saving answers,
 *      while 10 managers page through the Team matrix, against a fresh server of the same build
 *      and the same database; per request kind p50/p95/p99, counts, errors, answers lost.
 *
 * Last, the whole-product table (tests/bench/summary.ts): one row per measured route or job with
 * req/s, p50/p95/p99, its ratio to GET /healthz of the same build in the same run, the targets of
 * the earlier issues (tests/bench/targets.ts, one list) and whether each is met; the same rows go
 * to bench-results.json as `summary` (format 2).
 */
import { execSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { defaultSeedDate } from "../../seeds/seed";
import { buildPrivateCopy, type BenchBuild } from "./build";
import { measureBenchBundle } from "./bundle-size";
import { measureRoute, measureSequential, stopLoad, type HttpFigure, type LoadSettings, type RouteTarget, type SequentialFigure } from "./http";
import { compareWithPrevious, formatBundle, formatHttp, formatSim, table, type BenchResults } from "./report";
import { choosePort, httpGet, startBenchServer, type BenchServer } from "./server";
import { prepareBenchDatabase, sessionCookieHeader, type BenchDatabase } from "./session";
import { formatShiftStart, measureShiftStart, shiftStartSettings, stopShiftStart, type ShiftStartSettings } from "./shift-start";
import { buildSummary, formatSummary } from "./summary";
import { autosaveSettings, formatAutosave, measureAutosave, stopAutosave, type AutosaveSettings } from "./autosave";
import { formatScoring, timeScoring } from "./scoring";
import { timeModes } from "./sim";
import { formatCertificate, formatReminderRun, measureReminderRun, timeCertificatePdf } from "./reminders";
import {
  formatTeamMatrix,
  formatTeamMatrixSequential,
  measureMatrixAfterWrites,
  measureMatrixSequential,
  prepareMatrixWriter,
  timeBareMatrixSql,
  widenRequirements,
  withRequest,
  withSequential,
  type TeamMatrixFigure,
} from "./team-matrix";

const PROJECT_ROOT = path.resolve(import.meta.dirname, "..", "..");
const BENCH_DIR = path.join(PROJECT_ROOT, "data", "bench");
const DEFAULT_RESULTS_FILE = path.join(PROJECT_ROOT, "bench-results.json");
// Bench-only secrets: the server refuses to start in production without them (issue 2).
const SESSION_SECRET = "tidemark-bench-session-secret-not-for-production";
const TOTP_SECRET = "fedcba9876543210".repeat(4); // 64 hex characters, as the sign-in strategy requires

const { values: flags } = parseArgs({
  options: {
    people: { type: "string", default: "2000" },
    duration: { type: "string", default: "10" },
    warmup: { type: "string", default: "3" },
    connections: { type: "string", default: "20" },
    port: { type: "string", default: "3200" },
    runs: { type: "string", default: "50" },
    "autosave-examinees": { type: "string" },
    "autosave-seconds": { type: "string" },
    "autosave-interval": { type: "string" },
    "shift-people": { type: "string" },
    "shift-managers": { type: "string" },
    "shift-seconds": { type: "string" },
    "shift-interval": { type: "string" },
    only: { type: "string" },
    out: { type: "string" },
  },
});
/** Where the results go (and the previous ones are read from): bench-results.json unless --out says otherwise. */
const RESULTS_FILE = flags.out ? path.resolve(flags.out) : DEFAULT_RESULTS_FILE;
const positive = (name: string, raw: string | undefined) => {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) {
    console.error(`--${name} must be a whole number, got "${raw}".`);
    process.exit(2);
  }
  return n;
};
const load: LoadSettings = { connections: positive("connections", flags.connections), durationS: positive("duration", flags.duration), warmupS: positive("warmup", flags.warmup), timeoutS: 10 };
const peopleCount = positive("people", flags.people);
const simRuns = Math.max(1, positive("runs", flags.runs));
let autosave: AutosaveSettings;
try {
  autosave = autosaveSettings({ examinees: flags["autosave-examinees"], seconds: flags["autosave-seconds"], interval: flags["autosave-interval"] });
} catch (error) {
  console.error(error instanceof Error ? error.message : String(error));
  process.exit(2);
}
let shiftStart: ShiftStartSettings;
try {
  shiftStart = shiftStartSettings({ people: flags["shift-people"], managers: flags["shift-managers"], seconds: flags["shift-seconds"], interval: flags["shift-interval"] });
} catch (error) {
  console.error(error instanceof Error ? error.message : String(error));
  process.exit(2);
}
const PARTS = ["sim", "scoring", "certificate", "bundle", "http", "reminders", "autosave", "shift-start"] as const;
type Part = (typeof PARTS)[number];
const only = flags.only?.split(",").map((p) => p.trim()).filter(Boolean);
const unknownPart = only?.find((p) => !(PARTS as readonly string[]).includes(p));
if (unknownPart !== undefined || (only && only.length === 0)) {
  console.error(`--only takes parts separated by commas, of: ${PARTS.join(", ")}; got "${flags.only}".`);
  process.exit(2);
}
const runs = (part: Part) => !only || only.includes(part);
const needsBuild = (["bundle", "http", "autosave", "shift-start"] as const).some(runs);
const needsDatabase = (["http", "reminders", "autosave", "shift-start"] as const).some(runs);

let server: BenchServer | undefined;
let build: BenchBuild | undefined;
/** The seeded bench database (the HTTP, reminder, autosave and shift-start parts share it). */
let benchDatabase: BenchDatabase | undefined;
let interrupted = false;
// `on`, not `once`: Ctrl-C reaches npm, tsx and this process, and tsx relays it once more;
// a second SIGINT without a handler would end the process before the server is stopped.
process.on("SIGINT", () => {
  if (interrupted) return;
  interrupted = true;
  console.error("\nInterrupted: stopping the load and the bench server.");
  stopLoad();
  stopAutosave();
  stopShiftStart();
  void (server?.stop() ?? Promise.resolve()).finally(() => {
    build?.remove();
    process.exit(130);
  });
});

const errors: string[] = [];
const message = (error: unknown) => (error instanceof Error ? error.message : String(error));
const section = (title: string) => console.log(`\n== ${title}`);

function gitInfo(): BenchResults["git"] {
  try {
    const commit = execSync("git rev-parse --short HEAD", { cwd: PROJECT_ROOT, encoding: "utf8" }).trim();
    const dirty = execSync("git status --porcelain", { cwd: PROJECT_ROOT, encoding: "utf8" }).trim() !== "";
    return { commit, uncommittedChanges: dirty };
  } catch {
    return { commit: "unknown", uncommittedChanges: true };
  }
}

const escapeHtml = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#x27;");

/** A route is measured only when one request gets what a person would get: 200, and signed in where it must be. */
async function check(baseUrl: string, target: RouteTarget, mustShow?: string): Promise<void> {
  const answer = await httpGet(`${baseUrl}${target.path}`, target.headers);
  if (answer.status !== 200) {
    throw new Error(`expected 200 before measuring, got ${answer.status}${answer.headers.location ? ` → ${answer.headers.location}` : ""}.`);
  }
  if (mustShow && !answer.body.includes(mustShow) && !answer.body.includes(escapeHtml(mustShow))) {
    throw new Error(`the page does not show "${mustShow}" — the session cookie was not accepted.`);
  }
}

/** The large organisation in its own file, widened to 40 requirements (every part that uses it sees the same). */
async function seedBenchDatabase(settings: Record<string, unknown>): Promise<{ db: BenchDatabase; widened?: Awaited<ReturnType<typeof widenRequirements>> }> {
  mkdirSync(BENCH_DIR, { recursive: true });
  const today = defaultSeedDate();
  console.log(`Seeding the large organisation (${peopleCount} people, demo day ${today}) into data/bench/tidemark.db …`);
  const db = await prepareBenchDatabase({ dbFile: path.join(BENCH_DIR, "tidemark.db"), people: peopleCount, today });
  console.log(`  seeded in ${(db.seedMs / 1000).toFixed(1)} s; session for ${db.manager.email} (${db.manager.name}).`);
  Object.assign(settings, { people: peopleCount, seedToday: today, seedS: Math.round(db.seedMs / 100) / 10 });
  try {
    return { db, widened: await widenRequirements(db.databaseUrl, db.manager.email) };
  } catch (error) {
    errors.push(`team-matrix requirements: ${message(error)}`);
    return { db };
  }
}

async function measureHttp(benchBuild: BenchBuild, db: BenchDatabase, widened: Awaited<ReturnType<typeof widenRequirements>> | undefined, settings: Record<string, unknown>): Promise<HttpFigure[]> {
  // Team matrix (issue 8): 40 requirements, and the bare SQL behind the matrix timed before the server starts.
  let matrixFigure: TeamMatrixFigure | undefined;
  try {
    if (!widened) throw new Error("the requirements were not widened (see above).");
    const bare = await timeBareMatrixSql(db.databaseUrl, widened.orgId, widened.unitIds);
    matrixFigure = { requirements: widened.count, ...bare, targets: "targets: request p95 under 50 ms, within 3× the bare query" };
  } catch (error) {
    errors.push(`team-matrix bare SQL: ${message(error)}`);
  }
  // A therapist who makes the loud and quiet writes the matrix is timed after (tests/bench/team-matrix.ts).
  let matrixWriter: Awaited<ReturnType<typeof prepareMatrixWriter>> | undefined;
  try {
    matrixWriter = await prepareMatrixWriter(db.databaseUrl, SESSION_SECRET);
  } catch (error) {
    errors.push(`team-matrix writer: ${message(error)}`);
  }

  const port = await choosePort(positive("port", flags.port));
  // TIDEMARK_REMINDERS=off on the bench's servers: the reminder job is timed on its own (below);
  // inside a measured server its first catch-up run would be timed as request latency.
  server = await startBenchServer({
    projectRoot: PROJECT_ROOT,
    serverEntry: benchBuild.serverEntry,
    port,
    logFile: path.join(BENCH_DIR, "server.log"),
    env: { NODE_ENV: "production", DATABASE_URL: db.databaseUrl, DATA_DIR: path.relative(PROJECT_ROOT, BENCH_DIR), SESSION_SECRET, TOTP_SECRET, TIDEMARK_REMINDERS: "off" },
  });
  console.log(`Server PID ${server.pid} on ${server.baseUrl} (log: data/bench/server.log).`);
  settings.port = port;

  const cookie = { Cookie: await sessionCookieHeader(db.sessionId, SESSION_SECRET) };
  const small = { label: "page, small loader", requestsPerSecond: 670 };
  const oneQuery = { label: "page, one SQLite query", requestsPerSecond: 480 };
  const targets: { target: RouteTarget; mustShow?: string }[] = [
    { target: { name: "GET /login (sign-in page)", path: "/login", reference: small } },
    { target: { name: "GET /today (manager)", path: "/today", headers: cookie, reference: oneQuery }, mustShow: db.manager.name },
    { target: { name: "GET /team (manager)", path: "/team", headers: cookie, reference: oneQuery }, mustShow: db.manager.name },
    { target: { name: "GET /healthz", path: "/healthz", reference: { label: "JSON resource route", requestsPerSecond: 1370 } } },
  ];

  const benchPage = await httpGet(`${server.baseUrl}/bench`, cookie).catch((e: unknown) => ({ status: 0, error: message(e) }));
  console.log(`GET /bench as the manager answers ${benchPage.status} (checked, not measured).`);

  const figures: HttpFigure[] = [];
  for (const { target, mustShow } of targets) {
    if (interrupted) break;
    try {
      await check(server.baseUrl, target, mustShow);
      console.log(`Measuring ${target.name}: ${load.warmupS} s warm-up, ${load.durationS} s at ${load.connections} connections …`);
      figures.push(await measureRoute(server.baseUrl, target, load));
    } catch (error) {
      if (interrupted) break;
      errors.push(`HTTP ${target.name}: ${message(error)}`);
      console.error(`  ${message(error)}`);
    }
  }
  // The trivial route for one client alone: what the one-manager Team matrix rows and the in-process jobs are set against.
  if (!interrupted) {
    try {
      console.log("Measuring GET /healthz for one client: 200 requests one after another on one connection …");
      const one: SequentialFigure = await measureSequential(server.baseUrl, "GET /healthz (one client, sequential)", "/healthz");
      settings["healthz.one-connection"] = one;
      console.log(`  p50 ${one.p50Ms} ms, p95 ${one.p95Ms} ms, p99 ${one.p99Ms} ms, max ${one.maxMs} ms`);
    } catch (error) {
      errors.push(`GET /healthz, one client: ${message(error)}`);
    }
  }
  // What the matrix's useFetcher asks for: the matrix route's data alone, a status filter applied.
  const matrixTarget: RouteTarget = {
    name: "GET /team/matrix.data?status=lapsed (manager, team-matrix)",
    path: "/team/matrix.data?status=lapsed&_routes=routes%2Fteam%2Fmatrix",
    headers: cookie,
    reference: oneQuery,
  };
  if (matrixFigure && !interrupted) {
    const t0 = performance.now();
    const first = await httpGet(`${server.baseUrl}${matrixTarget.path}`, matrixTarget.headers);
    const coldMs = performance.now() - t0;
    if (first.status !== 200) errors.push(`team-matrix request: expected 200, got ${first.status}`);
    else {
      try {
        console.log(`Measuring ${matrixTarget.name}: ${load.warmupS} s warm-up, ${load.durationS} s at ${load.connections} connections …`);
        const fig = await measureRoute(server.baseUrl, matrixTarget, load);
        figures.push(fig);
        matrixFigure = withRequest(matrixFigure, { name: matrixTarget.name, p50Ms: fig.p50Ms, p95Ms: fig.p95Ms, p99Ms: fig.p99Ms }, coldMs);
      } catch (error) {
        errors.push(`HTTP ${matrixTarget.name}: ${message(error)}`);
      }
    }
    // One manager alone (the case the target describes), then the first request after a loud and a quiet write.
    if (!interrupted) {
      try {
        console.log("Measuring the Team matrix for one manager: sequential document and data requests on one connection …");
        matrixFigure = withSequential(matrixFigure, await measureMatrixSequential(server.baseUrl, cookie.Cookie));
      } catch (error) {
        errors.push(`team-matrix sequential: ${message(error)}`);
      }
    }
    if (matrixWriter && !interrupted) {
      try {
        console.log(`Measuring the Team matrix after loud and quiet writes (as ${matrixWriter.email}) …`);
        matrixFigure = { ...matrixFigure, afterWrite: await measureMatrixAfterWrites(server.baseUrl, cookie.Cookie, matrixWriter) };
      } catch (error) {
        errors.push(`team-matrix after writes: ${message(error)}`);
      }
    }
    settings["team-matrix"] = matrixFigure;
    console.log(formatTeamMatrix(matrixFigure));
    const more = formatTeamMatrixSequential(matrixFigure);
    if (more) console.log(more);
  }
  return figures;
}

/** The environment of every bench server: production, the bench database, bench-only secrets, no reminder timer. */
const serverEnv = (databaseUrl: string) => ({ NODE_ENV: "production", DATABASE_URL: databaseUrl, DATA_DIR: path.relative(PROJECT_ROOT, BENCH_DIR), SESSION_SECRET, TOTP_SECRET, TIDEMARK_REMINDERS: "off" });

async function main(): Promise<void> {
  const started = performance.now();
  const settings: Record<string, unknown> = { ...load, simRuns, simWarmupRuns: 10, ...(only ? { only } : {}) };
  const results: BenchResults = {
    format: 2,
    timestamp: new Date().toISOString(),
    machine: {
      cpus: os.cpus().length,
      cpuModel: os.cpus()[0]?.model ?? "unknown",
      platform: os.platform(),
      release: os.release(),
      node: process.version,
      totalMemoryGB: Math.round((os.totalmem() / 1024 ** 3) * 10) / 10,
      loadAverage1m: Math.round(os.loadavg()[0] * 100) / 100,
    },
    git: gitInfo(),
    settings,
    http: [],
    sim: [],
    bundle: null,
    summary: [],
    errors,
  };

  if (runs("sim")) {
    section("Simulator: 60 s of breathing per mode");
    try {
      results.sim = timeModes(path.join(PROJECT_ROOT, "seeds", "scenarios"), { runs: simRuns, warmupRuns: 10 });
      console.log(formatSim(results.sim));
    } catch (error) {
      errors.push(`Simulator: ${message(error)}`);
    }
  }

  if (runs("scoring")) {
    section("Scoring: grading one 50-item attempt");
    try {
      const scoring = timeScoring({ runs: 2000, warmupRuns: 200 });
      settings.scoring = scoring;
      console.log(formatScoring(scoring));
    } catch (error) {
      errors.push(`Scoring: ${message(error)}`);
    }
  }

  if (runs("certificate")) {
    section("Certificate PDF: one render");
    try {
      const certificate = await timeCertificatePdf();
      settings["certificate.pdf"] = certificate;
      console.log(formatCertificate(certificate));
    } catch (error) {
      errors.push(`certificate.pdf: ${message(error)}`);
    }
  }

  if (needsBuild) {
    section("Production build (fresh, of the working tree, in a temporary folder)");
    try {
      build = await buildPrivateCopy(PROJECT_ROOT);
      settings.build = `fresh react-router build of the working tree (${build.files} files) in a temporary copy, ${(build.buildMs / 1000).toFixed(1)} s`;
      console.log(settings.build);
    } catch (error) {
      errors.push(`Build: ${message(error)}`);
    }
  }

  if (build && runs("bundle")) {
    section("Bench page JavaScript beyond the shell");
    try {
      results.bundle = measureBenchBundle(build.clientDir);
      console.log(formatBundle(results.bundle));
    } catch (error) {
      errors.push(`Bundle size: ${message(error)}`);
    }
  }

  let widened: Awaited<ReturnType<typeof widenRequirements>> | undefined;
  if (needsDatabase && !interrupted) {
    section(`Bench database (${peopleCount} people)`);
    try {
      ({ db: benchDatabase, widened } = await seedBenchDatabase(settings));
    } catch (error) {
      errors.push(`Bench database: ${message(error)}`);
    }
  }
  const notSeeded = "the bench database was not seeded (see the error above).";

  try {
    if (build && runs("http")) {
      section("HTTP (production build, loopback)");
      try {
        if (!benchDatabase) throw new Error(notSeeded);
        results.http = await measureHttp(build, benchDatabase, widened, settings);
      } catch (error) {
        errors.push(`HTTP: ${message(error)}`);
      } finally {
        await server?.stop();
        if (server) console.log(`Server PID ${server.pid} stopped.`);
        server = undefined;
      }
      if (results.http.length > 0) {
        console.log(formatHttp(results.http));
        console.log("p50/p95/p99 from every response time (nearest rank); no compression requested (autocannon sends no Accept-Encoding).");
      }
    }

    if (runs("reminders")) {
      section(`Reminder job over the large organisation (${peopleCount} people)`);
      try {
        if (interrupted) throw new Error("interrupted");
        if (!benchDatabase) throw new Error(notSeeded);
        const figure = await measureReminderRun({ sourceUrl: benchDatabase.databaseUrl, workDir: BENCH_DIR, today: String(settings.seedToday ?? defaultSeedDate()) });
        settings["reminders.run-2000-people"] = figure;
        console.log(formatReminderRun(figure));
      } catch (error) {
        errors.push(`reminders.run-2000-people: ${message(error)}`);
        console.error(`  ${message(error)}`);
      }
    }

    if (build && runs("autosave")) {
      section(`Exam autosave under load (${autosave.examinees} examinees, ${autosave.seconds} s, ${autosave.mode})`);
      try {
        if (interrupted) throw new Error("interrupted");
        if (!benchDatabase) throw new Error(notSeeded);
        const databaseUrl = benchDatabase.databaseUrl;
        const figure = await measureAutosave({
          projectRoot: PROJECT_ROOT,
          serverEntry: build.serverEntry,
          databaseUrl,
          port: await choosePort(positive("port", flags.port) + 1),
          logFile: path.join(BENCH_DIR, "server-autosave.log"),
          env: serverEnv(databaseUrl),
          sessionSecret: SESSION_SECRET,
          settings: autosave,
          onServer: (s) => (server = s),
        });
        settings.autosave = figure;
        console.log(formatAutosave(figure));
      } catch (error) {
        errors.push(`Autosave: ${message(error)}`);
        console.error(`  ${message(error)}`);
      }
    }

    if (build && runs("shift-start")) {
      section(`Shift start: ${shiftStart.people} people signing in and taking an exam, ${shiftStart.managers} managers paging Team (${shiftStart.seconds} s, ${shiftStart.mode})`);
      try {
        if (interrupted) throw new Error("interrupted");
        if (!benchDatabase) throw new Error(notSeeded);
        const databaseUrl = benchDatabase.databaseUrl;
        const figure = await measureShiftStart({
          projectRoot: PROJECT_ROOT,
          serverEntry: build.serverEntry,
          databaseUrl,
          port: await choosePort(positive("port", flags.port) + 2),
          logFile: path.join(BENCH_DIR, "server-shift-start.log"),
          env: serverEnv(databaseUrl),
          settings: shiftStart,
          onServer: (s) => (server = s),
        });
        settings["shift-start"] = figure;
        console.log(formatShiftStart(figure, table));
      } catch (error) {
        errors.push(`Shift start: ${message(error)}`);
        console.error(`  ${message(error)}`);
      }
    }
  } finally {
    build?.remove();
  }

  results.summary = buildSummary({
    sim: results.sim,
    scoring: settings.scoring as never,
    certificate: settings["certificate.pdf"] as never,
    bundle: results.bundle,
    http: results.http,
    healthzOneConnection: settings["healthz.one-connection"] as never,
    teamMatrix: settings["team-matrix"] as never,
    reminders: settings["reminders.run-2000-people"] as never,
    autosave: settings.autosave as never,
    shiftStart: settings["shift-start"] as never,
  });
  section(`Whole product: every measured route and job against the targets of issues 3, 5, 8 and 9${only ? ` (only: ${only.join(", ")})` : ""}`);
  console.log(formatSummary(results.summary, table));

  const previous = existsSync(RESULTS_FILE) ? (JSON.parse(readFileSync(RESULTS_FILE, "utf8")) as BenchResults) : null;
  writeFileSync(RESULTS_FILE, `${JSON.stringify(results, null, 2)}\n`);
  section("Results");
  console.log(`Wrote ${path.relative(PROJECT_ROOT, RESULTS_FILE) || RESULTS_FILE} (${results.machine.cpus} CPUs, node ${results.machine.node}, load ${results.machine.loadAverage1m}) in ${((performance.now() - started) / 1000).toFixed(0)} s.`);
  // Format 1 files hold the same http, sim and bundle shapes (format 2 added `summary`): compared on what both hold.
  if (previous && (previous.format === results.format || (previous.format as number) === 1)) console.log(compareWithPrevious(previous, results).join("\n"));
  else if (previous) console.log("The previous bench-results.json has another format: no comparison.");
  else console.log("No previous bench-results.json: nothing to compare with.");

  if (errors.length > 0) {
    console.error(`\nNot measured:\n${errors.map((e) => `  - ${e}`).join("\n")}`);
    process.exitCode = 1;
  }
}

main().catch(async (error: unknown) => {
  console.error(message(error));
  await server?.stop();
  build?.remove();
  process.exit(1);
});
