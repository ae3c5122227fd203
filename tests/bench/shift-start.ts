/**
 * The "shift start" mixed load (issue 11 item 6): against the production build and the
 * 2,000-person bench database, all at once —
 *
 *   - 300 therapists arrive over the first 30 s and each signs in through the real sign-in flow
 *     (GET /login, POST /login asking for a code, the code read from the e-mail, POST /login/code),
 *     lands on Today, opens Exams, the exam's start page, starts the exam (POST …/start) and its
 *     first question — with a person's pauses between pages (THINK_MS) — then saves an answer
 *     every 5 s until the end (open loop, as the page's autosave fires whether or not the
 *     previous reply is back). A request with no reply in 10 s, or a wrong answer, ends that
 *     person's flow (counted under its request kind);
 *   - 10 managers sign in the same way and page through the Team matrix: the document, then the
 *     matrix's data requests for pages 1..10 and the filter and sort views the page fetches, one
 *     after another with a second's pause between them (closed loop), until the end;
 *   - a probe asks for /healthz twice a second: the trivial route under the same load.
 *
 * Reported per request kind: count, errors by status, p50/p95/p99/max; answers acknowledged,
 * found in the database afterwards and lost (as tests/bench/autosave.ts counts them, pair by
 * pair). Targets: none of its own; issue 5's save targets (p95 under 50 ms with 300 examinees;
 * lost = 0) are judged on its saves too, in the summary table.
 *
 * How the codes are read — the real sign-in path, end to end. The bench server sends every code
 * e-mail through its configured transport (the Resend SDK, RESEND_BASE_URL) to the local e-mail
 * fake (tools/mail-fake), started here in the bench process on a free loopback port; the bench
 * reads the 6-digit code from that message's text, as the browser tests do
 * (tests/fixtures/outbox.ts). Nothing is read from the code table (it holds hashes only) and no
 * server code is skipped: the code is issued, recorded, e-mailed, checked, consumed and the
 * session started by the same code a person's browser drives.
 *
 * Rate limits. Sign-in is limited per client address (app/auth/rate-limit.server.ts: 20 code
 * requests and 30 code checks per 15 minutes): 310 people from the one loopback address would be
 * refused after the 20th. A hospital's 300 workstations have 300 addresses; the bench says so the
 * way a deployment behind a reverse proxy does — the bench server runs with TRUST_PROXY=1 (one
 * proxy in front, README "Configuration"; scripts/serve.mjs then takes the address that proxy
 * saw from X-Forwarded-For) and each simulated person sends its own address there (10.20.x.y), as
 * the hospital's proxy would forward it. The limits themselves are unchanged
 * and still apply per address and per person; no limit is raised or switched off, and the
 * production default (TRUST_PROXY unset) is untouched. Only this bench server sets it.
 *
 * Scaling down: --shift-people N (300) --shift-managers N (10) --shift-seconds S (120)
 * --shift-interval S (5), or SHIFT_PEOPLE / SHIFT_MANAGERS / SHIFT_SECONDS / SHIFT_INTERVAL; any
 * other value than the defaults is reported as "scaled".
 */
import { mkdtempSync, rmSync } from "node:fs";
import http from "node:http";
import os, { tmpdir } from "node:os";
import path from "node:path";
import { and, asc, desc, eq, inArray, isNotNull } from "drizzle-orm";
import { openDatabase, setDatabaseForTests, type Database } from "~/db/client.server";
import type { StoredFormEntry } from "~/db/queries/exam-attempts.server";
import { createExam, publishExam } from "~/db/queries/exams-authoring.server";
import { attempts, people, personRoles, responses } from "~/db/schema";
import { DEMO_ACCOUNTS } from "../../seeds/kestrel-valley";
import { mulberry32 } from "../../seeds/prng";
import { startMailFake, type MailFake } from "../../tools/mail-fake/mail-fake";
import { answerFor, BENCH_EXAM_QUESTIONS, benchExamSettings } from "./autosave";
import { percentile } from "./http";
import { startBenchServer, type BenchServer } from "./server";
import { MATRIX_DATA_VIEWS } from "./team-matrix";

export const SHIFT_DEFAULTS = { people: 300, managers: 10, seconds: 120, intervalS: 5 } as const;
/** Therapists arrive over this many seconds, or the first quarter of a shorter run (managers over the first third of that). */
const ARRIVAL_S = 30;
export const arrivalSeconds = (seconds: number) => Math.min(ARRIVAL_S, seconds / 4);
/**
 * How long a person takes on each page before the next request (the least, plus up to as much
 * again at random): typing the address, fetching the code from the mail on a phone and typing it,
 * a glance at Today and Exams, reading the exam's rules. Assumed, not measured (common practice,
 * no source); a run shorter than 120 s shortens them in proportion. About 15–30 s from the sign-in
 * page to the first question, so 300 people arriving over 30 s are signing in over about a minute.
 */
export const THINK_MS = { typeAddress: 3000, readCode: 5000, glance: 1500, readRules: 4000 } as const;
const MANAGER_PAUSE_MS = 1000;
const MATRIX_PAGES = 10;
const PROBE_EVERY_MS = 500;
const REQUEST_TIMEOUT_MS = 10_000;
export const SHIFT_EXAM_TITLE = "Shift start bench exam";

/** The request kinds, in the order a person meets them; the summary table keeps this order. */
export const SHIFT_KINDS = [
  "GET /login",
  "POST /login (ask for a code)",
  "POST /login/code (enter the code)",
  "GET /today",
  "GET /exams",
  "GET /exams/:examId/start",
  "POST /exams/:examId/start",
  "GET /exams/attempts/:attemptId",
  "POST /exams/attempts/:attemptId/answers (save)",
  "GET /team/matrix (manager, document)",
  "GET /team/matrix.data (manager, page or filter)",
  "GET /healthz (probe)",
] as const;
export type ShiftKind = (typeof SHIFT_KINDS)[number];

export type ShiftStartSettings = {
  people: number;
  managers: number;
  seconds: number;
  intervalS: number;
  mode: "full" | "scaled";
  source: string;
};

/** Settings from the CLI flags (strings or undefined) and, failing those, SHIFT_* variables. */
export function shiftStartSettings(flags: { people?: string; managers?: string; seconds?: string; interval?: string }, env: NodeJS.ProcessEnv = process.env): ShiftStartSettings {
  const sources: string[] = [];
  const pick = (flag: string | undefined, flagName: string, envName: string, fallback: number, min: number, whole: boolean): number => {
    let raw: string | undefined;
    if (flag !== undefined) {
      raw = flag;
      sources.push(`--${flagName} ${flag}`);
    } else if (env[envName] !== undefined && env[envName] !== "") {
      raw = env[envName];
      sources.push(`${envName}=${raw}`);
    } else return fallback;
    const n = Number(raw);
    if (!Number.isFinite(n) || n < min || (whole && !Number.isInteger(n))) {
      throw new Error(`--${flagName} (or ${envName}) must be ${whole ? "a whole number" : "a number"} of at least ${min}, got "${raw}".`);
    }
    return n;
  };
  const peopleCount = pick(flags.people, "shift-people", "SHIFT_PEOPLE", SHIFT_DEFAULTS.people, 1, true);
  const managers = pick(flags.managers, "shift-managers", "SHIFT_MANAGERS", SHIFT_DEFAULTS.managers, 0, true);
  const seconds = pick(flags.seconds, "shift-seconds", "SHIFT_SECONDS", SHIFT_DEFAULTS.seconds, 10, false);
  const intervalS = pick(flags.interval, "shift-interval", "SHIFT_INTERVAL", SHIFT_DEFAULTS.intervalS, 0.5, false);
  if (Math.floor(seconds / intervalS) > BENCH_EXAM_QUESTIONS) {
    throw new Error(
      `${seconds} s at one save every ${intervalS} s could make ${Math.floor(seconds / intervalS)} saves per person, more than the exam's ${BENCH_EXAM_QUESTIONS} questions; every save must land on its own question to be counted. Shorten --shift-seconds or lengthen --shift-interval.`,
    );
  }
  const full = peopleCount === SHIFT_DEFAULTS.people && managers === SHIFT_DEFAULTS.managers && seconds === SHIFT_DEFAULTS.seconds && intervalS === SHIFT_DEFAULTS.intervalS;
  return { people: peopleCount, managers, seconds, intervalS, mode: full ? "full" : "scaled", source: sources.length ? sources.join(", ") : "defaults" };
}

export type KindFigure = {
  kind: ShiftKind;
  /** Replies (any status) plus timed-out requests. */
  requests: number;
  ok: number;
  /** Requests without the expected answer, by status, "timeout" or "network (…)". */
  errors: Record<string, number>;
  /** Replies per second over the whole load (what the scenario asked for, not a capacity). */
  requestsPerSecond: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
};

export type ShiftStartFigure = {
  mode: "full" | "scaled";
  settingsFrom: string;
  people: number;
  managers: number;
  plannedDurationS: number;
  elapsedS: number;
  intervalS: number;
  exam: { title: string; questions: number };
  signIn: { transport: string; rateLimitKey: string; attempted: number; signedIn: number; codeReadP95Ms: number };
  /** People who reached their first question (sign-in, Today, Exams, start, the attempt page). */
  examineesReady: number;
  kinds: KindFigure[];
  saves: { sent: number; acknowledged: number; found: number; lost: number; acknowledgedNotFound: number; foundNotAcknowledged: number };
  /** First failures of the flow (at most 10), so an error count has a reason beside it. */
  failures: string[];
  requestTimeoutS: number;
  staleSocketRetries: number;
  loadAverage1m: { before: number; after: number; cpus: number };
};

type Reply = { status: number; location: string | undefined; body: string; ms: number; setCookies: string[] };
class TimeoutError extends Error {}

/** One person's browser: its own keep-alive sockets (six, as a browser opens per host), cookie jar and address. */
class Browser {
  readonly agent = new http.Agent({ keepAlive: true, maxSockets: 6 });
  private readonly jar = new Map<string, string>();
  constructor(
    private readonly baseUrl: string,
    private readonly address: string,
    private readonly onRetry: () => void,
  ) {}

  cookieHeader(): string {
    return [...this.jar].map(([k, v]) => `${k}=${v}`).join("; ");
  }

  private keep(setCookies: string[]) {
    for (const line of setCookies) {
      const [pair, ...attributes] = line.split(";");
      const eq = pair.indexOf("=");
      if (eq < 1) continue;
      const name = pair.slice(0, eq).trim();
      const value = pair.slice(eq + 1).trim();
      const expired = attributes.some((a) => /^\s*max-age=0\s*$/i.test(a) || (/^\s*expires=/i.test(a) && Date.parse(a.split("=")[1]) < Date.now()));
      if (expired || value === "") this.jar.delete(name);
      else this.jar.set(name, value);
    }
  }

  /**
   * GET, or a form-encoded POST with our own Origin. Timed from sending to the end of the reply;
   * a reset of a reused keep-alive socket is sent again once on a new one (as a browser does),
   * timed from the first send.
   */
  request(method: "GET" | "POST", path: string, options: { form?: Record<string, string>; accept?: string } = {}, t0 = performance.now(), retried = false): Promise<Reply> {
    const body = options.form ? new URLSearchParams(options.form).toString() : undefined;
    const headers: Record<string, string | number> = { "X-Forwarded-For": this.address, Accept: options.accept ?? "text/html" };
    const cookie = this.cookieHeader();
    if (cookie) headers.Cookie = cookie;
    if (body !== undefined) Object.assign(headers, { "Content-Type": "application/x-www-form-urlencoded", "Content-Length": Buffer.byteLength(body), Origin: this.baseUrl });
    return new Promise((resolve, reject) => {
      const request = http.request(`${this.baseUrl}${path}`, { method, agent: this.agent, timeout: REQUEST_TIMEOUT_MS, headers }, (response) => {
        let text = "";
        response.setEncoding("utf8");
        response.on("data", (chunk: string) => (text += chunk));
        response.on("end", () => {
          const setCookies = response.headers["set-cookie"] ?? [];
          this.keep(setCookies);
          resolve({ status: response.statusCode ?? 0, location: response.headers.location, body: text, ms: performance.now() - t0, setCookies });
        });
        response.on("error", reject);
      });
      request.on("timeout", () => request.destroy(new TimeoutError(`${method} ${path} had no reply within ${REQUEST_TIMEOUT_MS / 1000} s`)));
      request.on("error", (error: NodeJS.ErrnoException) => {
        if (!retried && request.reusedSocket && error.code === "ECONNRESET") {
          this.onRetry();
          resolve(this.request(method, path, options, t0, true));
        } else reject(error);
      });
      request.end(body);
    });
  }

  close() {
    this.agent.destroy();
  }
}

/** The code in a sign-in e-mail's text (the same reading as tests/fixtures/outbox.ts codeIn). */
export function codeInText(text: string | null): string | null {
  const t = text ?? "";
  return /sign-in page:\s*(\d{6})\b/.exec(t)?.[1] ?? /\b(\d{6})\b/.exec(t)?.[1] ?? null;
}

/** A distinct private address per simulated person, as a proxy would forward it: 10.20.0.1, 10.20.0.2, … */
export function addressFor(index: number): string {
  const n = index + 1;
  return `10.20.${Math.floor(n / 250) % 250}.${(n % 250) + 1}`;
}

/** Collects every timed request by kind. */
class Recorder {
  private readonly times = new Map<ShiftKind, number[]>();
  private readonly count = new Map<ShiftKind, number>();
  private readonly okCount = new Map<ShiftKind, number>();
  private readonly errorCount = new Map<ShiftKind, Record<string, number>>();
  readonly failures: string[] = [];

  /** `ms` null: no reply and no time to count (a network error). */
  record(kind: ShiftKind, ms: number | null, error?: string, detail?: string) {
    const list = this.times.get(kind) ?? [];
    if (ms !== null) list.push(ms);
    this.times.set(kind, list);
    this.count.set(kind, (this.count.get(kind) ?? 0) + 1);
    if (!error) this.okCount.set(kind, (this.okCount.get(kind) ?? 0) + 1);
    else {
      const e = this.errorCount.get(kind) ?? {};
      e[error] = (e[error] ?? 0) + 1;
      this.errorCount.set(kind, e);
      if (this.failures.length < 10) this.failures.push(`${kind}: ${error}${detail ? ` — ${detail.slice(0, 160)}` : ""}`);
    }
  }

  figures(elapsedS: number): KindFigure[] {
    return SHIFT_KINDS.filter((k) => this.times.has(k)).map((kind) => {
      const sorted = [...(this.times.get(kind) ?? [])].sort((a, b) => a - b);
      return {
        kind,
        requests: this.count.get(kind) ?? 0,
        ok: this.okCount.get(kind) ?? 0,
        errors: this.errorCount.get(kind) ?? {},
        requestsPerSecond: round2(elapsedS > 0 ? (this.count.get(kind) ?? 0) / elapsedS : Number.NaN),
        p50Ms: round2(percentile(sorted, 50)),
        p95Ms: round2(percentile(sorted, 95)),
        p99Ms: round2(percentile(sorted, 99)),
        maxMs: round2(sorted[sorted.length - 1] ?? Number.NaN),
      };
    });
  }
}

const round2 = (x: number) => Math.round(x * 100) / 100;
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, Math.max(0, ms)));

class FlowError extends Error {}

let cancelled = false;
/** Ends the shift-start load at once (on Ctrl-C): nothing more is sent. */
export function stopShiftStart(): void {
  cancelled = true;
}

type Person = { email: string; kind: "therapist" | "manager" };

/** Before the server starts: the exam (authored and published as the educator) and who takes part. */
export async function prepareShiftStart(databaseUrl: string, settings: Pick<ShiftStartSettings, "people" | "managers">, now = new Date()): Promise<{ examId: string; therapists: Person[]; managers: Person[] }> {
  const opened = openDatabase(databaseUrl);
  setDatabaseForTests(opened);
  const database = await opened;
  try {
    const [educator] = await database.db.select({ id: people.id, orgId: people.orgId }).from(people).where(eq(people.email, DEMO_ACCOUNTS.educator)).limit(1);
    if (!educator) throw new Error(`The bench database has no ${DEMO_ACCOUNTS.educator}: was it seeded?`);
    const examId = await createExam(educator.orgId, educator.id, { ...benchExamSettings(), title: SHIFT_EXAM_TITLE, description: "Written by the bench for the shift-start load: thirty questions drawn from the seeded bank." }, now);
    const published = await publishExam(educator.orgId, educator.id, examId, now);
    if (!published.ok) throw new Error(`The shift-start exam could not be published: ${published.reason}`);
    const withRole = (role: "therapist" | "manager", order: "asc" | "desc") =>
      database.db
        .select({ email: people.email })
        .from(people)
        .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.role, role)))
        .where(and(eq(people.orgId, educator.orgId), eq(people.active, true)))
        .orderBy(order === "asc" ? asc(people.email) : desc(people.email));
    // Therapists from the end of the address list: the autosave load takes the first 300 and the
    // Team matrix writer the very last, so with 2,000 people nobody here has another bench's session.
    const therapists = (await withRole("therapist", "desc")).slice(1);
    const managers = await withRole("manager", "asc");
    if (therapists.length < settings.people) {
      throw new Error(`The bench organisation has ${therapists.length} active therapists to spare; the shift-start load needs ${settings.people}. Seed more people (--people) or ask for fewer (--shift-people).`);
    }
    if (managers.length < settings.managers) {
      throw new Error(`The bench organisation has ${managers.length} managers; the shift-start load needs ${settings.managers} (each signs in with their own address). Seed more people or ask for fewer (--shift-managers).`);
    }
    // Distinct people each: one code request per address keeps well inside the per-address limit (5 per 15 minutes).
    return {
      examId,
      therapists: therapists.slice(0, settings.people).map((t) => ({ email: t.email, kind: "therapist" as const })),
      managers: managers.slice(0, settings.managers).map((m) => ({ email: m.email, kind: "manager" as const })),
    };
  } finally {
    setDatabaseForTests(undefined);
    database.close();
  }
}

/**
 * The whole measurement on an already seeded bench database whose server is NOT running: prepares
 * the exam and the people, starts the e-mail fake and a production server pointed at it, runs the
 * load, stops the server and counts the answers the database file holds.
 */
export async function measureShiftStart(options: {
  projectRoot: string;
  serverEntry: string;
  databaseUrl: string;
  port: number;
  logFile: string;
  env: Record<string, string>;
  settings: ShiftStartSettings;
  onServer?: (server: BenchServer | undefined) => void;
  log?: (line: string) => void;
}): Promise<ShiftStartFigure> {
  const { settings } = options;
  const log = options.log ?? console.log;
  cancelled = false;
  const prepared = await prepareShiftStart(options.databaseUrl, settings);
  log(`  "${SHIFT_EXAM_TITLE}" (${BENCH_EXAM_QUESTIONS} questions) published as the educator; ${prepared.therapists.length} therapists and ${prepared.managers.length} managers will sign in.`);

  const outboxDir = mkdtempSync(path.join(tmpdir(), "tidemark-bench-shift-mail-"));
  let fake: MailFake | undefined;
  let server: BenchServer | undefined;
  let reader: Database | undefined;
  const browsers: Browser[] = [];
  const recorder = new Recorder();
  let retries = 0;
  const acknowledged = new Set<string>();
  const attemptIds: string[] = [];
  const codeReadMs: number[] = [];
  let saveSent = 0;
  let signedIn = 0;
  let examineesReady = 0;
  let loadBefore = Number.NaN;
  let elapsedS = 0;
  try {
    fake = await startMailFake({ port: 0, dataDir: outboxDir });
    server = await startBenchServer({
      projectRoot: options.projectRoot,
      serverEntry: options.serverEntry,
      port: options.port,
      logFile: options.logFile,
      // TRUST_PROXY=1: each simulated person's own address arrives in X-Forwarded-For (see the header comment).
      env: { ...options.env, TRUST_PROXY: "1", MAIL_TRANSPORT: "resend", RESEND_BASE_URL: fake.url, RESEND_API_KEY: "re_bench_shift_start" },
    });
    options.onServer?.(server);
    reader = await openDatabase(options.databaseUrl, { migrate: false });
    const baseUrl = server.baseUrl;
    const mail = fake;
    const db = reader;
    log(`  Server PID ${server.pid} on ${baseUrl} (TRUST_PROXY=1; e-mail to the fake at ${mail.url}); ${settings.seconds} s of load (${settings.mode}; ${settings.source}) …`);

    const random = mulberry32(0x5417f7);
    const t0 = performance.now() + 300;
    const endAt = t0 + settings.seconds * 1000;
    const thinkScale = Math.min(1, settings.seconds / SHIFT_DEFAULTS.seconds);
    const pause = (base: number) => sleep((base + random() * base) * thinkScale);

    /** One timed request of a kind; throws FlowError (recorded) when the answer is not the expected one. */
    const step = async (browser: Browser, kind: ShiftKind, method: "GET" | "POST", urlPath: string, expect: (r: Reply) => string | null, options?: { form?: Record<string, string>; accept?: string }): Promise<Reply> => {
      let reply: Reply;
      try {
        reply = await browser.request(method, urlPath, options);
      } catch (error) {
        if (error instanceof TimeoutError) {
          recorder.record(kind, REQUEST_TIMEOUT_MS, "timeout");
          throw new FlowError("timeout");
        }
        const code = (error as NodeJS.ErrnoException).code ?? "error";
        recorder.record(kind, null, `network (${code})`);
        throw new FlowError(code);
      }
      const problem = expect(reply);
      recorder.record(kind, reply.ms, problem ? String(reply.status) : undefined, problem ? `${method} ${urlPath}: ${problem}` : undefined);
      if (problem) throw new FlowError(problem);
      return reply;
    };
    const status = (want: number, location?: RegExp) => (r: Reply) =>
      r.status !== want ? `answered ${r.status}${r.location ? ` → ${r.location}` : ""}, not ${want}` : location && !location.test(r.location ?? "") ? `redirected to ${r.location}, not ${location}` : null;

    const readCode = async (email: string, since: string): Promise<string> => {
      const started = performance.now();
      while (performance.now() - started < 10_000) {
        const message = mail.messages().find((m) => m.created_at >= since && m.to.some((t) => t.toLowerCase() === email.toLowerCase()));
        const code = message ? codeInText(message.text) : null;
        if (code) {
          codeReadMs.push(performance.now() - started);
          return code;
        }
        await sleep(50);
      }
      throw new FlowError(`no sign-in code e-mail to ${email} within 10 s`);
    };

    const signIn = async (browser: Browser, person: Person) => {
      await step(browser, "GET /login", "GET", "/login", status(200));
      await pause(THINK_MS.typeAddress);
      const since = new Date(Date.now() - 1000).toISOString();
      await step(browser, "POST /login (ask for a code)", "POST", "/login", status(302, /^\/login\/code$/), { form: { email: person.email } });
      const code = await readCode(person.email, since);
      await pause(THINK_MS.readCode);
      const entered = await step(browser, "POST /login/code (enter the code)", "POST", "/login/code", status(302, /^\/today$/), { form: { code } });
      if (!entered.setCookies.some((c) => c.startsWith("tm_session="))) throw new FlowError("signed in without a session cookie");
      signedIn++;
      await step(browser, "GET /today", "GET", "/today", status(200));
      await pause(THINK_MS.glance);
    };

    const therapist = async (person: Person, index: number) => {
      await sleep(t0 + random() * arrivalSeconds(settings.seconds) * 1000 - performance.now());
      if (cancelled) return;
      const browser = new Browser(baseUrl, addressFor(index), () => retries++);
      browsers.push(browser);
      try {
        await signIn(browser, person);
        await step(browser, "GET /exams", "GET", "/exams", (r) => (r.status !== 200 ? `answered ${r.status}` : r.body.includes(SHIFT_EXAM_TITLE) ? null : "the exam is not listed"));
        await pause(THINK_MS.glance);
        await step(browser, "GET /exams/:examId/start", "GET", `/exams/${prepared.examId}/start`, status(200));
        await pause(THINK_MS.readRules);
        const started = await step(browser, "POST /exams/:examId/start", "POST", `/exams/${prepared.examId}/start`, status(302, /^\/exams\/attempts\/[0-9a-f-]{36}$/), { form: { layout: "one" } });
        const attemptId = started.location!.split("/").pop()!;
        attemptIds.push(attemptId);
        await step(browser, "GET /exams/attempts/:attemptId", "GET", `/exams/attempts/${attemptId}`, status(200));
        // The drawn form (a shape per position), read from the database, so each save is valid for its question.
        const [row] = await db.db.select({ form: attempts.form }).from(attempts).where(eq(attempts.id, attemptId));
        const form = [...((row?.form ?? []) as StoredFormEntry[])].sort((a, b) => a.position - b.position);
        examineesReady++;
        // Open loop: each save fires at its instant, whether or not the previous reply is back.
        const first = performance.now() + random() * settings.intervalS * 1000;
        const saves: Promise<void>[] = [];
        for (let k = 0; k < form.length && first + k * settings.intervalS * 1000 < endAt; k++) {
          const at = first + k * settings.intervalS * 1000;
          const entry = form[k];
          saves.push(
            sleep(at - performance.now()).then(async () => {
              if (cancelled) return;
              saveSent++;
              const fields = { position: String(entry.position), answer: JSON.stringify(answerFor(entry.shape, index + k)) };
              try {
                await step(browser, "POST /exams/attempts/:attemptId/answers (save)", "POST", `/exams/attempts/${attemptId}/answers`, (r) => {
                  if (r.status !== 200) return `answered ${r.status}`;
                  try {
                    const json = JSON.parse(r.body) as { ok?: boolean; position?: number };
                    return json.ok === true && json.position === entry.position ? null : "200 without ok:true";
                  } catch {
                    return "200 without JSON";
                  }
                }, { form: fields, accept: "application/json" });
                acknowledged.add(`${attemptId}:${entry.position}`);
              } catch (error) {
                if (!(error instanceof FlowError)) throw error;
              }
            }),
          );
        }
        await Promise.all(saves);
      } catch (error) {
        if (!(error instanceof FlowError)) throw error;
        // Recorded already; this person stops here, as a person whose page failed would.
      }
    };

    const manager = async (person: Person, index: number) => {
      await sleep(t0 + random() * (arrivalSeconds(settings.seconds) / 3) * 1000 - performance.now());
      if (cancelled) return;
      const browser = new Browser(baseUrl, addressFor(settings.people + index), () => retries++);
      browsers.push(browser);
      const views = [...Array.from({ length: MATRIX_PAGES }, (_, i) => `page=${i + 1}`), ...MATRIX_DATA_VIEWS];
      try {
        await signIn(browser, person);
        let v = 0;
        while (performance.now() < endAt && !cancelled) {
          await pause(MANAGER_PAUSE_MS);
          if (performance.now() >= endAt) break;
          try {
            if (v % (views.length + 1) === 0) await step(browser, "GET /team/matrix (manager, document)", "GET", "/team/matrix", status(200));
            else await step(browser, "GET /team/matrix.data (manager, page or filter)", "GET", `/team/matrix.data?${views[(v % (views.length + 1)) - 1]}&_routes=routes%2Fteam%2Fmatrix`, status(200));
          } catch (error) {
            if (!(error instanceof FlowError)) throw error;
          }
          v++;
        }
      } catch (error) {
        if (!(error instanceof FlowError)) throw error;
      }
    };

    const probe = async () => {
      const browser = new Browser(baseUrl, "10.99.0.1", () => retries++);
      browsers.push(browser);
      await sleep(t0 - performance.now());
      while (performance.now() < endAt && !cancelled) {
        const next = performance.now() + PROBE_EVERY_MS;
        try {
          await step(browser, "GET /healthz (probe)", "GET", "/healthz", status(200), { accept: "application/json" });
        } catch (error) {
          if (!(error instanceof FlowError)) throw error;
        }
        await sleep(next - performance.now());
      }
    };

    loadBefore = round2(os.loadavg()[0]);
    await Promise.all([...prepared.therapists.map(therapist), ...prepared.managers.map(manager), probe()]);
    elapsedS = (performance.now() - t0) / 1000;
  } finally {
    for (const b of browsers) b.close();
    reader?.close();
    if (server) {
      await server.stop();
      options.onServer?.(undefined);
      log(`  Server PID ${server.pid} stopped.`);
    }
    await fake?.close();
    rmSync(outboxDir, { recursive: true, force: true });
  }
  if (cancelled) throw new Error("interrupted");

  // What reached the database file, counted with the server stopped.
  const counter = await openDatabase(options.databaseUrl, { migrate: false });
  let found: Set<string>;
  try {
    const rows = attemptIds.length
      ? await counter.db
          .select({ attemptId: responses.attemptId, position: responses.position })
          .from(responses)
          .where(and(inArray(responses.attemptId, attemptIds), isNotNull(responses.answer)))
      : [];
    found = new Set(rows.map((r) => `${r.attemptId}:${r.position}`));
  } finally {
    counter.close();
  }
  const codeSorted = [...codeReadMs].sort((a, b) => a - b);
  return {
    mode: settings.mode,
    settingsFrom: settings.source,
    people: prepared.therapists.length,
    managers: prepared.managers.length,
    plannedDurationS: settings.seconds,
    elapsedS: round2(elapsedS),
    intervalS: settings.intervalS,
    exam: { title: SHIFT_EXAM_TITLE, questions: BENCH_EXAM_QUESTIONS },
    signIn: {
      transport: "code e-mailed through the Resend SDK to the local e-mail fake, read from its outbox",
      rateLimitKey: "TRUST_PROXY=1, one X-Forwarded-For address per person",
      attempted: prepared.therapists.length + prepared.managers.length,
      signedIn,
      codeReadP95Ms: round2(percentile(codeSorted, 95)),
    },
    examineesReady,
    kinds: recorder.figures(elapsedS),
    saves: {
      sent: saveSent,
      acknowledged: acknowledged.size,
      found: found.size,
      lost: acknowledged.size - found.size,
      acknowledgedNotFound: [...acknowledged].filter((k) => !found.has(k)).length,
      foundNotAcknowledged: [...found].filter((k) => !acknowledged.has(k)).length,
    },
    failures: recorder.failures,
    requestTimeoutS: REQUEST_TIMEOUT_MS / 1000,
    staleSocketRetries: retries,
    loadAverage1m: { before: loadBefore, after: round2(os.loadavg()[0]), cpus: os.cpus().length },
  };
}

export function formatShiftStart(f: ShiftStartFigure, table: (headers: string[], rows: string[][], right: boolean[]) => string): string {
  const errors = (e: Record<string, number>) => {
    const entries = Object.entries(e);
    return entries.length ? entries.map(([k, n]) => `${k} × ${n}`).join(", ") : "0";
  };
  const rows = f.kinds.map((k) => [k.kind, String(k.requests), k.requestsPerSecond.toFixed(1), k.p50Ms.toFixed(1), k.p95Ms.toFixed(1), k.p99Ms.toFixed(1), k.maxMs.toFixed(1), errors(k.errors)]);
  return [
    `shift start (${f.mode}; ${f.settingsFrom}): ${f.people} therapists arriving over ${arrivalSeconds(f.plannedDurationS)} s and ${f.managers} managers, ${f.plannedDurationS} s planned, ${f.elapsedS} s elapsed`,
    `  sign-in: ${f.signIn.signedIn} of ${f.signIn.attempted} signed in (${f.signIn.transport}; code in the outbox p95 ${f.signIn.codeReadP95Ms} ms after the reply; rate limits keyed by ${f.signIn.rateLimitKey}); ${f.examineesReady} reached their first question`,
    table(["request", "count", "per s", "p50 ms", "p95 ms", "p99 ms", "max ms", "errors"], rows, [false, true, true, true, true, true, true, false]),
    `  answers: sent ${f.saves.sent}, acknowledged ${f.saves.acknowledged}, found in the database ${f.saves.found}, lost ${f.saves.lost} (acknowledged but missing ${f.saves.acknowledgedNotFound}; saved without acknowledgement ${f.saves.foundNotAcknowledged})`,
    `  timeouts counted at ${f.requestTimeoutS} s; stale keep-alive sockets retried ${f.staleSocketRetries}; load average ${f.loadAverage1m.before} → ${f.loadAverage1m.after} on ${f.loadAverage1m.cpus} CPUs (server, e-mail fake and load generator share them)`,
    ...(f.failures.length ? [`  first failures: ${f.failures.join(" | ")}`] : []),
  ].join("\n");
}
