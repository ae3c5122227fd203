/**
 * A realistic exam load on the answer autosave (issue 5, item 7): 300 therapists of the bench
 * organisation sit a timed exam at once, each saving one answer every 5 s for 2 minutes (or a
 * scaled run), against the production build on loopback. Reported, never asserted: save p50 /
 * p95 / p99, how many saves were acknowledged, how many answers the database holds afterwards,
 * and `lost` = acknowledged − found. Targets: save p95 under 50 ms with 300 examinees; lost = 0.
 *
 * How it is set up, and why:
 *   - The exam. The seeded exams have 20 questions, fewer than the 24 saves a 2-minute run at
 *     one save per 5 s makes, and every acknowledged save must land on its own question to be
 *     counted afterwards. So before the server starts, the bench adds one exam of its own to the
 *     bench database through the educator's authoring path (createExam, then publishExam, which
 *     refuses a blueprint the bank cannot fill): 30 questions from the seeded bank, 40 minutes.
 *   - The examinees: the first N therapists of Kestrel Valley by e-mail address (the large seed
 *     has ~2000), each with a session row and a cookie signed the way the app signs it
 *     (session.ts), so the server reads it with its own code.
 *   - The attempts are started through the server: POST /exams/:examId/start as each therapist
 *     (the Start button), which answers 302 → /exams/attempts/:id. The drawn form (a `shape`
 *     per position) is then read back from the database, so each save sends an answer valid
 *     for its question: an option id for single/multiple, the steps as shown for ordering,
 *     "1" (unit omitted) for numeric, the window's midpoint for a waveform point.
 *   - The load is open-loop: every save fires at its scheduled instant (examinee start jittered
 *     over the first interval, then every interval), whether or not the previous reply is back,
 *     as the page's autosave does; a slow server therefore shows in the latency rather than
 *     quietly lowering the rate. Each examinee has its own keep-alive connection pool (at most
 *     six sockets, as a browser opens per host). Latency is timed on the client, from sending
 *     the request to the end of the reply.
 *   - Afterwards the server is stopped (so what is counted is what reached the database file)
 *     and the bench opens the database and counts, for the bench's attempts, the responses with
 *     an answer ("found"). It also compares position by position, so an acknowledged answer
 *     that is missing shows even if an unacknowledged one (a timed-out reply) was saved.
 */
import http from "node:http";
import os from "node:os";
import { and, asc, eq, inArray, isNotNull } from "drizzle-orm";
import { openDatabase, setDatabaseForTests, type Database } from "~/db/client.server";
import type { FormShape, StoredFormEntry, SubmittedAnswer } from "~/db/queries/exam-attempts.server";
import { createExam, publishExam } from "~/db/queries/exams-authoring.server";
import type { ExamSettings } from "~/routes/bank/exam-form";
import { attempts, people, personRoles, responses, sessions } from "~/db/schema";
import { mulberry32 } from "../../seeds/prng";
import { DEMO_ACCOUNTS } from "../../seeds/kestrel-valley";
import { percentile } from "./http";
import { startBenchServer, type BenchServer } from "./server";
import { sessionCookieHeader } from "./session";

export const AUTOSAVE_DEFAULTS = { examinees: 300, seconds: 120, intervalS: 5 } as const;
export const AUTOSAVE_TARGETS = "targets: save p95 under 50 ms with 300 examinees; lost = 0 (acknowledged − found)";
const TARGET_P95_MS = 50;
const REQUEST_TIMEOUT_MS = 10_000;
/** Starts in parallel while preparing (not measured as load). */
const START_CONCURRENCY = 8;

/** The bench exam: 30 questions drawn from the seeded bank, 40 minutes (the seeded exams have 30 and 40). */
export const BENCH_EXAM = {
  title: "Autosave bench exam",
  topics: { modes: 8, "lung-mechanics": 8, "alarm-reasoning": 6, "patient-ventilator-asynchrony": 4, "waveform-reading": 4 },
  minutes: 40,
} as const;
export const BENCH_EXAM_QUESTIONS = Object.values(BENCH_EXAM.topics).reduce((s, n) => s + n, 0);

/** The bench exam as the educator's exam form would save it. */
export function benchExamSettings(): ExamSettings {
  return {
    title: BENCH_EXAM.title,
    description: "Written by the bench for the autosave load: thirty questions drawn from the seeded bank.",
    blueprint: { topics: { ...BENCH_EXAM.topics } },
    timeLimitMinutes: BENCH_EXAM.minutes,
    passMarkPercent: 80,
    attemptsAllowed: 2,
    shuffleItems: true,
    shuffleOptions: true,
    reviewPolicy: "score-and-topics",
    multipleResponseScoring: "all-or-nothing",
    orderingScoring: "exact",
    availableFrom: null,
    availableUntil: null,
  };
}

export type AutosaveSettings = {
  examinees: number;
  seconds: number;
  intervalS: number;
  /** "full" is issue 5's load (300 examinees, 2 minutes, every 5 s); anything else is "scaled". */
  mode: "full" | "scaled";
  /** Where the settings came from, e.g. "defaults" or "AUTOSAVE_SECONDS=30". */
  source: string;
};

/** Settings from the CLI flags (given as strings, or undefined) and, failing those, AUTOSAVE_* variables. */
export function autosaveSettings(flags: { examinees?: string; seconds?: string; interval?: string }, env: NodeJS.ProcessEnv = process.env): AutosaveSettings {
  const sources: string[] = [];
  const pick = (flag: string | undefined, flagName: string, envName: string, fallback: number, min: number): number => {
    let raw: string | undefined;
    if (flag !== undefined) {
      raw = flag;
      sources.push(`--${flagName} ${flag}`);
    } else if (env[envName] !== undefined && env[envName] !== "") {
      raw = env[envName];
      sources.push(`${envName}=${raw}`);
    } else return fallback;
    const n = Number(raw);
    if (!Number.isFinite(n) || n < min) throw new Error(`--${flagName} (or ${envName}) must be a number of at least ${min}, got "${raw}".`);
    return n;
  };
  const examinees = pick(flags.examinees, "autosave-examinees", "AUTOSAVE_EXAMINEES", AUTOSAVE_DEFAULTS.examinees, 1);
  const seconds = pick(flags.seconds, "autosave-seconds", "AUTOSAVE_SECONDS", AUTOSAVE_DEFAULTS.seconds, 1);
  const intervalS = pick(flags.interval, "autosave-interval", "AUTOSAVE_INTERVAL", AUTOSAVE_DEFAULTS.intervalS, 0.1);
  if (!Number.isInteger(examinees)) throw new Error(`--autosave-examinees must be a whole number, got ${examinees}.`);
  const saves = savesPerExaminee({ seconds, intervalS });
  if (saves > BENCH_EXAM_QUESTIONS) {
    throw new Error(
      `${seconds} s at one save every ${intervalS} s is ${saves} saves per examinee, more than the bench exam's ${BENCH_EXAM_QUESTIONS} questions; every save must land on its own question to be counted. Shorten --autosave-seconds or lengthen --autosave-interval.`,
    );
  }
  const full = examinees === AUTOSAVE_DEFAULTS.examinees && seconds === AUTOSAVE_DEFAULTS.seconds && intervalS === AUTOSAVE_DEFAULTS.intervalS;
  return { examinees, seconds, intervalS, mode: full ? "full" : "scaled", source: sources.length ? sources.join(", ") : "defaults" };
}

/** One save at the start (jittered within the first interval), then one every interval, all inside `seconds`. */
export function savesPerExaminee(s: Pick<AutosaveSettings, "seconds" | "intervalS">): number {
  return Math.max(1, Math.floor(s.seconds / s.intervalS));
}

/** An answer the server accepts for a question of this shape (checkAnswer's rules); `k` varies the choice. */
export function answerFor(shape: FormShape, k: number): SubmittedAnswer {
  switch (shape.kind) {
    case "single":
      return { kind: "single", choice: shape.optionIds[k % shape.optionIds.length] };
    case "multiple":
      return { kind: "multiple", choices: [shape.optionIds[k % shape.optionIds.length]] };
    case "ordering":
      return { kind: "ordering", order: [...shape.stepIds] };
    case "numeric":
      return { kind: "numeric", text: "1" };
    case "waveform-point":
      return { kind: "waveform-point", timeS: (shape.fromS + shape.toS) / 2 };
  }
}

export type AutosaveFigure = {
  mode: "full" | "scaled";
  settingsFrom: string;
  examinees: number;
  intervalS: number;
  plannedDurationS: number;
  savesPerExaminee: number;
  /** From the first scheduled save to the last reply. */
  elapsedS: number;
  /** Saves per second offered by the schedule, and acknowledged per second over the run. */
  offeredRatePerS: number;
  acknowledgedRatePerS: number;
  exam: { title: string; questions: number; timeLimitMinutes: number; allowedSecondsMin: number | null; allowedSecondsMax: number | null; untimed: number; kinds: Record<string, number> };
  start: { attempts: number; p50Ms: number; p95Ms: number; maxMs: number };
  sent: number;
  acknowledged: number;
  found: number;
  lost: number;
  /** Acknowledged (attempt, position) pairs with no answer in the database: the strict loss. */
  acknowledgedNotFound: number;
  /** Answers in the database whose save was not acknowledged (e.g. a reply that timed out). */
  foundNotAcknowledged: number;
  /** Saves not acknowledged, by HTTP status or "timeout" (no reply within requestTimeoutS) / "network". */
  errors: Record<string, number>;
  requestTimeoutS: number;
  /** Saves sent again once after a reset of a reused keep-alive socket (see `post`). */
  staleSocketRetries: number;
  /** Over every save that got a reply, plus timed-out saves counted at the timeout (a lower bound). */
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  maxMs: number;
  meanMs: number;
  /** How late the load generator fired saves against the schedule (its own event-loop delay). */
  scheduleLagMs: { p99: number; max: number };
  /** The machine's 1-minute load average before and after the load (the server and the load generator share it). */
  loadAverage1m: { before: number; after: number; cpus: number };
  /** null when fewer than 300 examinees were sent: the target is stated for 300. */
  meetsP95Target: boolean | null;
  meetsLostTarget: boolean;
  targets: string;
};

const round2 = (x: number) => Math.round(x * 100) / 100;

type Examinee = { personId: string; email: string; cookie: string };

/** Before the server starts: the bench exam (authored and published as the educator) and N therapists with sessions. */
export async function prepareAutosave(databaseUrl: string, examinees: number, sessionSecret: string, now = new Date()): Promise<{ examId: string; examinees: Examinee[] }> {
  const opened = openDatabase(databaseUrl);
  setDatabaseForTests(opened);
  const database = await opened;
  try {
    const [educator] = await database.db.select({ id: people.id, orgId: people.orgId }).from(people).where(eq(people.email, DEMO_ACCOUNTS.educator)).limit(1);
    if (!educator) throw new Error(`The bench database has no ${DEMO_ACCOUNTS.educator}: was it seeded?`);
    const examId = await createExam(educator.orgId, educator.id, benchExamSettings(), now);
    const published = await publishExam(educator.orgId, educator.id, examId, now);
    if (!published.ok) throw new Error(`The bench exam could not be published: ${published.reason}`);

    const therapists = await database.db
      .select({ id: people.id, email: people.email })
      .from(people)
      .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.role, "therapist")))
      .where(and(eq(people.orgId, educator.orgId), eq(people.active, true)))
      .orderBy(asc(people.email));
    if (therapists.length < examinees) {
      throw new Error(`The bench organisation has ${therapists.length} active therapists; the autosave load needs ${examinees}. Seed more people (--people) or ask for fewer examinees (--autosave-examinees).`);
    }
    const chosen = therapists.slice(0, examinees);
    const sessionIds = await database.write(async (tx) => {
      const rows = await tx
        .insert(sessions)
        .values(chosen.map((t) => ({ personId: t.id, orgId: educator.orgId, expiresAt: new Date(now.getTime() + 24 * 60 * 60 * 1000), userAgent: "tidemark-bench-autosave" })))
        .returning({ id: sessions.id, personId: sessions.personId });
      return new Map(rows.map((r) => [r.personId, r.id]));
    });
    const result: Examinee[] = [];
    for (const t of chosen) result.push({ personId: t.id, email: t.email, cookie: await sessionCookieHeader(sessionIds.get(t.id)!, sessionSecret) });
    return { examId, examinees: result };
  } finally {
    setDatabaseForTests(undefined);
    database.close();
  }
}


type Reply = { status: number; location: string | undefined; body: string; ms: number; retried: boolean };

/**
 * One form-encoded POST as the page sends it: the session cookie and our own Origin. Timed from
 * sending to the end of the reply. The server closes keep-alive sockets idle for 5 s (Node's
 * default keepAliveTimeout), the same as the save interval, so a save can go out on a socket the
 * server is closing; as a browser does (and Node's http docs advise, `request.reusedSocket`), a
 * reset of a reused socket is retried once on a new one — counted, and timed from the first send.
 */
function post(agent: http.Agent, baseUrl: string, path: string, cookie: string, fields: Record<string, string>, t0 = performance.now(), retried = false): Promise<Reply> {
  const body = new URLSearchParams(fields).toString();
  return new Promise((resolve, reject) => {
    const request = http.request(
      `${baseUrl}${path}`,
      {
        method: "POST",
        agent,
        timeout: REQUEST_TIMEOUT_MS,
        headers: {
          "Content-Type": "application/x-www-form-urlencoded",
          "Content-Length": Buffer.byteLength(body),
          Accept: "application/json",
          Cookie: cookie,
          Origin: baseUrl,
        },
      },
      (response) => {
        let text = "";
        response.setEncoding("utf8");
        response.on("data", (chunk: string) => (text += chunk));
        response.on("end", () => resolve({ status: response.statusCode ?? 0, location: response.headers.location, body: text, ms: performance.now() - t0, retried }));
        response.on("error", reject);
      },
    );
    request.on("timeout", () => request.destroy(new TimeoutError(`POST ${path} had no reply within ${REQUEST_TIMEOUT_MS / 1000} s`)));
    request.on("error", (error: NodeJS.ErrnoException) => {
      if (!retried && request.reusedSocket && error.code === "ECONNRESET") resolve(post(agent, baseUrl, path, cookie, fields, t0, true));
      else reject(error);
    });
    request.end(body);
  });
}

class TimeoutError extends Error {}

/** Starts every examinee's attempt through the server (the Start button); attempt ids in examinee order. */
async function startAttempts(baseUrl: string, examId: string, examinees: Examinee[], agents: http.Agent[]): Promise<{ attemptIds: string[]; ms: number[] }> {
  const attemptIds: string[] = new Array<string>(examinees.length);
  const ms: number[] = [];
  let next = 0;
  const worker = async () => {
    while (next < examinees.length) {
      const i = next++;
      const reply = await post(agents[i], baseUrl, `/exams/${examId}/start`, examinees[i].cookie, { layout: "one" });
      const id = /^\/exams\/attempts\/([0-9a-f-]{36})$/.exec(reply.location ?? "")?.[1];
      if (reply.status !== 302 || !id) {
        throw new Error(`Starting the exam as ${examinees[i].email} answered ${reply.status}${reply.location ? ` → ${reply.location}` : ""}, not 302 → /exams/attempts/:id. ${reply.body.slice(0, 200)}`);
      }
      attemptIds[i] = id;
      ms.push(reply.ms);
    }
  };
  await Promise.all(Array.from({ length: Math.min(START_CONCURRENCY, examinees.length) }, worker));
  return { attemptIds, ms };
}

type OpenAttempt = { id: string; form: StoredFormEntry[]; allowedSeconds: number | null; deadlineAt: Date | null };

async function readAttempts(database: Database, attemptIds: string[]): Promise<Map<string, OpenAttempt>> {
  const rows = await database.db
    .select({ id: attempts.id, form: attempts.form, allowedSeconds: attempts.allowedSeconds, deadlineAt: attempts.deadlineAt, submittedAt: attempts.submittedAt })
    .from(attempts)
    .where(inArray(attempts.id, attemptIds));
  const out = new Map<string, OpenAttempt>();
  for (const r of rows) {
    if (r.submittedAt) throw new Error(`Attempt ${r.id} is already closed before the load.`);
    out.set(r.id, { id: r.id, form: [...(r.form as StoredFormEntry[])].sort((a, b) => a.position - b.position), allowedSeconds: r.allowedSeconds, deadlineAt: r.deadlineAt });
  }
  return out;
}

type PlannedSave = { examinee: number; attemptId: string; position: number; answer: SubmittedAnswer; atMs: number };

let cancelled = false;
const pendingTimers = new Set<ReturnType<typeof setTimeout>>();
/** Ends the autosave load at once (on Ctrl-C): saves not yet sent are not sent. */
export function stopAutosave(): void {
  cancelled = true;
  for (const t of pendingTimers) clearTimeout(t);
  pendingTimers.clear();
}

type LoadOutcome = { latencies: number[]; lags: number[]; acknowledged: Set<string>; errors: Record<string, number>; sent: number; retries: number; elapsedMs: number };

/** Fires every planned save at its instant (open loop) and waits for every reply. */
async function runLoad(baseUrl: string, plan: PlannedSave[], examinees: Examinee[], agents: http.Agent[]): Promise<LoadOutcome> {
  const latencies: number[] = [];
  const lags: number[] = [];
  const acknowledged = new Set<string>();
  const errors: Record<string, number> = {};
  const bump = (key: string) => (errors[key] = (errors[key] ?? 0) + 1);
  let sent = 0;
  let retries = 0;
  let lastReply = 0;
  const t0 = performance.now() + 500;
  const fire = (save: PlannedSave) =>
    new Promise<void>((resolve) => {
      const timer = setTimeout(() => {
        pendingTimers.delete(timer);
        if (cancelled) return resolve();
        lags.push(performance.now() - (t0 + save.atMs));
        sent++;
        const fields = { position: String(save.position), answer: JSON.stringify(save.answer) };
        post(agents[save.examinee], baseUrl, `/exams/attempts/${save.attemptId}/answers`, examinees[save.examinee].cookie, fields)
          .then((reply) => {
            latencies.push(reply.ms);
            if (reply.retried) retries++;
            let ok = false;
            if (reply.status === 200) {
              try {
                const json = JSON.parse(reply.body) as { ok?: boolean; position?: number };
                ok = json.ok === true && json.position === save.position;
              } catch {
                ok = false;
              }
              if (!ok) bump("200 without ok:true");
            } else bump(String(reply.status));
            if (ok) acknowledged.add(`${save.attemptId}:${save.position}`);
          })
          .catch((error: unknown) => {
            if (error instanceof TimeoutError) {
              // Censored at the timeout: the save took at least this long, and leaving it out would flatter the tail.
              latencies.push(REQUEST_TIMEOUT_MS);
              bump("timeout");
            } else bump(`network (${(error as NodeJS.ErrnoException).code ?? "error"})`);
          })
          .finally(() => {
            lastReply = performance.now();
            resolve();
          });
      }, Math.max(0, t0 + save.atMs - performance.now()));
      pendingTimers.add(timer);
    });
  await Promise.all(plan.map(fire));
  return { latencies, lags, acknowledged, errors, sent, retries, elapsedMs: Math.max(0, lastReply - t0) };
}

/** Answers the database holds for the bench's attempts, as "attemptId:position". */
async function answersFound(database: Database, attemptIds: string[]): Promise<Set<string>> {
  const rows = await database.db
    .select({ attemptId: responses.attemptId, position: responses.position })
    .from(responses)
    .where(and(inArray(responses.attemptId, attemptIds), isNotNull(responses.answer)));
  return new Set(rows.map((r) => `${r.attemptId}:${r.position}`));
}

/**
 * The whole autosave measurement on an already seeded bench database whose server is NOT
 * running: prepares the exam and examinees, starts its own production server, starts the
 * attempts, runs the load, stops the server and counts what the database file holds.
 */
export async function measureAutosave(options: {
  projectRoot: string;
  serverEntry: string;
  databaseUrl: string;
  port: number;
  logFile: string;
  env: Record<string, string>;
  sessionSecret: string;
  settings: AutosaveSettings;
  /** Told of the server when it starts (and of undefined when it stops), so Ctrl-C can stop it. */
  onServer?: (server: BenchServer | undefined) => void;
  log?: (line: string) => void;
}): Promise<AutosaveFigure> {
  const { settings } = options;
  const log = options.log ?? console.log;
  cancelled = false;
  const prepared = await prepareAutosave(options.databaseUrl, settings.examinees, options.sessionSecret);
  log(`  "${BENCH_EXAM.title}" (${BENCH_EXAM_QUESTIONS} questions, ${BENCH_EXAM.minutes} min) published as the educator; ${prepared.examinees.length} therapists signed in.`);

  const server = await startBenchServer({ projectRoot: options.projectRoot, serverEntry: options.serverEntry, port: options.port, logFile: options.logFile, env: options.env });
  options.onServer?.(server);
  const agents = prepared.examinees.map(() => new http.Agent({ keepAlive: true, maxSockets: 6 }));
  let startMs: number[];
  let attemptIds: string[];
  let open: Map<string, OpenAttempt>;
  let outcome: LoadOutcome;
  let plan: PlannedSave[];
  let loadBefore = Number.NaN;
  try {
    log(`  Server PID ${server.pid} on ${server.baseUrl}; starting ${prepared.examinees.length} attempts with POST /exams/:examId/start …`);
    ({ attemptIds, ms: startMs } = await startAttempts(server.baseUrl, prepared.examId, prepared.examinees, agents));

    const reader = await openDatabase(options.databaseUrl, { migrate: false });
    try {
      open = await readAttempts(reader, attemptIds);
    } finally {
      reader.close();
    }
    const saves = savesPerExaminee(settings);
    const mustLastUntil = Date.now() + (settings.seconds + 60) * 1000;
    for (const a of open.values()) {
      if (a.form.length < saves) throw new Error(`Attempt ${a.id} has ${a.form.length} questions; the load saves ${saves} answers per examinee.`);
      if (a.deadlineAt && a.deadlineAt.getTime() < mustLastUntil) throw new Error(`Attempt ${a.id} ends at ${a.deadlineAt.toISOString()}, before the load would (${settings.seconds} s and a minute's margin).`);
    }

    // Seeded jitter: the same settings give the same schedule, run after run.
    const random = mulberry32(0x5a7e);
    plan = [];
    attemptIds.forEach((attemptId, examinee) => {
      const form = open.get(attemptId)!.form;
      const jitterMs = random() * settings.intervalS * 1000;
      for (let k = 0; k < saves; k++) {
        plan.push({ examinee, attemptId, position: form[k].position, answer: answerFor(form[k].shape, examinee + k), atMs: jitterMs + k * settings.intervalS * 1000 });
      }
    });
    log(`  ${plan.length} saves: each examinee one every ${settings.intervalS} s for ${settings.seconds} s (${settings.mode}; ${settings.source}) …`);
    loadBefore = round2(os.loadavg()[0]);
    outcome = await runLoad(server.baseUrl, plan, prepared.examinees, agents);
  } finally {
    for (const agent of agents) agent.destroy();
    await server.stop();
    options.onServer?.(undefined);
    log(`  Server PID ${server.pid} stopped.`);
  }
  if (cancelled) throw new Error("interrupted");

  const counter = await openDatabase(options.databaseUrl, { migrate: false });
  let found: Set<string>;
  try {
    found = await answersFound(counter, attemptIds);
  } finally {
    counter.close();
  }
  const acknowledgedNotFound = [...outcome.acknowledged].filter((k) => !found.has(k)).length;
  const foundNotAcknowledged = [...found].filter((k) => !outcome.acknowledged.has(k)).length;

  const latencies = [...outcome.latencies].sort((a, b) => a - b);
  const lags = [...outcome.lags].sort((a, b) => a - b);
  const starts = [...startMs].sort((a, b) => a - b);
  const allowed = [...open.values()].map((a) => a.allowedSeconds).filter((s): s is number => s !== null);
  const kinds: Record<string, number> = {};
  for (const s of plan) kinds[s.answer.kind] = (kinds[s.answer.kind] ?? 0) + 1;
  const p95 = round2(percentile(latencies, 95));
  const lost = outcome.acknowledged.size - found.size;
  const elapsedS = outcome.elapsedMs / 1000;
  return {
    mode: settings.mode,
    settingsFrom: settings.source,
    examinees: prepared.examinees.length,
    intervalS: settings.intervalS,
    plannedDurationS: settings.seconds,
    savesPerExaminee: savesPerExaminee(settings),
    elapsedS: round2(elapsedS),
    offeredRatePerS: round2(prepared.examinees.length / settings.intervalS),
    acknowledgedRatePerS: round2(elapsedS > 0 ? outcome.acknowledged.size / elapsedS : Number.NaN),
    exam: {
      title: BENCH_EXAM.title,
      questions: BENCH_EXAM_QUESTIONS,
      timeLimitMinutes: BENCH_EXAM.minutes,
      allowedSecondsMin: allowed.length ? Math.min(...allowed) : null,
      allowedSecondsMax: allowed.length ? Math.max(...allowed) : null,
      untimed: open.size - allowed.length,
      kinds,
    },
    start: { attempts: attemptIds.length, p50Ms: round2(percentile(starts, 50)), p95Ms: round2(percentile(starts, 95)), maxMs: round2(starts[starts.length - 1]) },
    sent: outcome.sent,
    acknowledged: outcome.acknowledged.size,
    found: found.size,
    lost,
    acknowledgedNotFound,
    foundNotAcknowledged,
    errors: outcome.errors,
    requestTimeoutS: REQUEST_TIMEOUT_MS / 1000,
    staleSocketRetries: outcome.retries,
    p50Ms: round2(percentile(latencies, 50)),
    p95Ms: p95,
    p99Ms: round2(percentile(latencies, 99)),
    maxMs: round2(latencies.length ? latencies[latencies.length - 1] : Number.NaN),
    meanMs: round2(latencies.length ? latencies.reduce((s, x) => s + x, 0) / latencies.length : Number.NaN),
    scheduleLagMs: { p99: round2(percentile(lags, 99)), max: round2(lags.length ? lags[lags.length - 1] : Number.NaN) },
    loadAverage1m: { before: loadBefore, after: round2(os.loadavg()[0]), cpus: os.cpus().length },
    meetsP95Target: prepared.examinees.length >= AUTOSAVE_DEFAULTS.examinees ? p95 < TARGET_P95_MS : null,
    // Met when no acknowledged answer is missing. `lost` goes below 0 when saves whose reply timed
    // out were stored anyway; those hide nothing, since acknowledgedNotFound is counted pair by pair.
    meetsLostTarget: acknowledgedNotFound === 0,
    targets: AUTOSAVE_TARGETS,
  };
}

export function formatAutosave(f: AutosaveFigure): string {
  const errors = Object.entries(f.errors);
  return [
    `autosave (${f.mode}; ${f.settingsFrom}): ${f.examinees} examinees, one save every ${f.intervalS} s for ${f.plannedDurationS} s (${f.savesPerExaminee} each), ${f.elapsedS} s elapsed`,
    `autosave save latency: p50 ${f.p50Ms} ms, p95 ${f.p95Ms} ms, p99 ${f.p99Ms} ms, max ${f.maxMs} ms (mean ${f.meanMs} ms); offered ${f.offeredRatePerS}/s, acknowledged ${f.acknowledgedRatePerS}/s`,
    `autosave answers: sent ${f.sent}, acknowledged ${f.acknowledged}, found in the database ${f.found}, lost ${f.lost} (acknowledged but missing ${f.acknowledgedNotFound}; saved without acknowledgement ${f.foundNotAcknowledged})`,
    `autosave errors: ${errors.length ? errors.map(([k, n]) => `${k} × ${n}`).join(", ") : "none"} (timeout: no reply in ${f.requestTimeoutS} s); stale keep-alive sockets retried ${f.staleSocketRetries}; attempts started p50 ${f.start.p50Ms} ms, p95 ${f.start.p95Ms} ms`,
    `autosave context: load generator lag p99 ${f.scheduleLagMs.p99} ms, max ${f.scheduleLagMs.max} ms; load average ${f.loadAverage1m.before} → ${f.loadAverage1m.after} on ${f.loadAverage1m.cpus} CPUs (server and load generator share them)`,
    `autosave ${f.targets} — p95 ${f.meetsP95Target === null ? `not judged (fewer than ${AUTOSAVE_DEFAULTS.examinees} examinees)` : f.meetsP95Target ? "met" : "NOT met"}, lost ${f.meetsLostTarget ? "met (no acknowledged answer missing)" : `NOT met (${f.acknowledgedNotFound} acknowledged answers missing)`}`,
  ].join("\n");
}
