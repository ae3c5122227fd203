/**
 * `npm run test:faults` — crash and durability (issue 11, item 3). Exit 0 only when every check holds.
 *
 *   1. A production build that is not /work/main/build: by default a private copy built in a
 *      temporary folder (tests/bench/build.ts says why); `--build DIR` uses DIR (a folder holding
 *      server/index.js and client/), which CI passes after its own build step.
 *   2. Its own database, data/faults/tidemark.db: migrations and the normal demo seed, then —
 *      before the server starts — a published 30-question exam (the autosave bench's), sessions
 *      for the examinees and the demo preceptor (cookies signed as the app signs them; no e-mail),
 *      the preceptor's signing PIN (the seed gives nobody a PIN), and check-offs marked and judged
 *      competent, waiting for the preceptor's signature.
 *   3. The production server, scripts/serve.mjs, as a child process on 127.0.0.1 (port 3300, or
 *      a free one), NODE_ENV=production, reminders off.
 *   4. Writes through HTTP as the browser sends them: each examinee starts the exam
 *      (POST /exams/:examId/start) and then saves answers one after another
 *      (POST /exams/attempts/:id/answers, form-encoded `position` and `answer`, with the session
 *      cookie and our Origin), often the same question again with another answer; the preceptor
 *      signs check-offs with the PIN (POST /checkoffs/:id, `intent=sign`, `pin`: the record page's
 *      signing form). Every reply is written down (ledger.ts): a save is acknowledged by 200 with
 *      `{ ok: true, position }`, a sign-off by the action's redirect back to the record (302).
 *   5. Kill rounds (`--rounds`, 4 by default): after the server has served the load for a time
 *      drawn from a seeded random number between 1.5 and 4 s, it is killed with SIGKILL at a moment
 *      when at least one request is in flight (waited for, never assumed), then restarted on the
 *      same database file and the load carries on.
 *   6. Online backup under load: during the second-to-last round `npm run db:backup` (the real
 *      script, as a separate process) copies the database while the saves flow; the copy is
 *      restored into a fresh file with scripts/db-restore.ts, and must hold every write
 *      acknowledged before the backup started, with PRAGMA integrity_check ok.
 *   7. Stop under load: the load stops, a batch of saves, sign-offs and page requests goes out on
 *      keep-alive connections (plus idle ones), SIGTERM arrives while they are in flight, and each
 *      must get its full 2xx answer, and the process must exit with status 0 by itself.
 *   8. The database file is opened directly (libSQL client): every acknowledged write is present
 *      (answers compared with the last acknowledged value per question), and PRAGMA
 *      integrity_check says ok. Last line: `acknowledged N, found N, integrity ok`.
 *
 * Sources: SQLite, "How To Corrupt An SQLite Database File" (sqlite.org/howtocorrupt.html) —
 * the crash here is the process's, not the machine's, so the operating system still writes
 * what was handed to it; SQLite, "Atomic Commit In SQLite" and "Write-Ahead Logging"
 * (sqlite.org/wal.html) for what a commit in WAL mode with synchronous FULL promises.
 *
 * Options: --build DIR  --rounds N (4)  --port N (3300)  --examinees N (20)  --seed N
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createClient } from "@libsql/client";
import { createWriteStream, existsSync, mkdirSync, rmSync, statSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { parseArgs } from "node:util";
import { and, eq, inArray } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { openDatabase, setDatabaseForTests } from "~/db/client.server";
import { setSigningPin } from "~/db/queries/checkoffs-signing.server";
import { listPublishedChecklists } from "~/db/queries/checkoffs.server";
import { markStep, requestCheckoff, setOutcome } from "~/db/queries/checkoffs-write.server";
import type { FormShape, StoredFormEntry, SubmittedAnswer } from "~/db/queries/exam-attempts.server";
import { attempts, checklistVersions, people, personRoles, sessions } from "~/db/schema";
import { mulberry32 } from "../../seeds/prng";
import { DEMO_ACCOUNTS } from "../../seeds/kestrel-valley";
import { defaultSeedDate, seed } from "../../seeds/seed";
import { buildPrivateCopy, type BenchBuild } from "../bench/build";
import { prepareAutosave } from "../bench/autosave";
import { choosePort, httpGet } from "../bench/server";
import { sessionCookieHeader } from "../bench/session";
import { viewerFor } from "../setup/request";
import { restoreDatabase } from "../../scripts/db-restore";
import { integrityOf } from "../../scripts/db-backup";
import { fingerprint, Ledger, verify, type SaveRecord, type SignRecord, type StoredState } from "./ledger";

const PROJECT_ROOT = path.resolve(import.meta.dirname, "..", "..");
const FAULTS_DIR = path.join(PROJECT_ROOT, "data", "faults");
const DB_FILE = path.join(FAULTS_DIR, "tidemark.db");
const RESTORED_FILE = path.join(FAULTS_DIR, "restored.db");
const DATABASE_URL = `file:${DB_FILE}`;
// Test-only secrets: the server refuses to start in production without them.
const SESSION_SECRET = "tidemark-faults-session-secret-not-for-production";
const TOTP_SECRET = "0123456789abcdef".repeat(4); // 64 hex characters, as the sign-in strategy requires
const PRECEPTOR_PIN = "730415";
const CHECKOFFS = 40;
const REQUEST_TIMEOUT_MS = 15_000;

const { values: flags } = parseArgs({
  options: {
    build: { type: "string" },
    rounds: { type: "string", default: "4" },
    port: { type: "string", default: "3300" },
    examinees: { type: "string", default: "20" },
    seed: { type: "string", default: "1103" },
  },
});
function whole(name: string, raw: string | undefined, min: number): number {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min) {
    console.error(`--${name} must be a whole number of at least ${min}, got "${raw}".`);
    process.exit(2);
  }
  return n;
}
const ROUNDS = whole("rounds", flags.rounds, 3);
const EXAMINEES = whole("examinees", flags.examinees, 2);
const random = mulberry32(whole("seed", flags.seed, 0));
const started = performance.now();
const elapsed = () => `${((performance.now() - started) / 1000).toFixed(1)} s`;
const log = (line: string) => console.log(`[${elapsed()}] ${line}`);
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const message = (error: unknown) => (error instanceof Error ? error.message : String(error));

// ── The build ────────────────────────────────────────────────────────────────────────────
async function getBuild(): Promise<{ serverEntry: string; label: string; build?: BenchBuild }> {
  if (flags.build) {
    const dir = path.resolve(flags.build);
    const serverEntry = path.join(dir, "server", "index.js");
    if (!existsSync(serverEntry) || !existsSync(path.join(dir, "client"))) {
      console.error(`--build ${flags.build}: expected ${path.join(dir, "server", "index.js")} and ${path.join(dir, "client")}/ (run react-router build first).`);
      process.exit(2);
    }
    return { serverEntry, label: path.relative(PROJECT_ROOT, dir) || dir };
  }
  log("Building a private copy of the working tree (tests/bench/build.ts) …");
  const build = await buildPrivateCopy(PROJECT_ROOT);
  return { serverEntry: build.serverEntry, label: `private copy in ${build.root} (${(build.buildMs / 1000).toFixed(1)} s)`, build };
}

// ── The database ─────────────────────────────────────────────────────────────────────────
function removeFaultsDatabase(file: string): void {
  const resolved = path.resolve(file);
  // Guard: never delete anything but the faults run's own files.
  if (path.dirname(resolved) !== FAULTS_DIR) throw new Error(`Refusing to delete ${resolved}: outside data/faults/.`);
  for (const suffix of ["", "-wal", "-shm", "-journal"]) rmSync(resolved + suffix, { force: true });
}

type Prepared = {
  examId: string;
  examinees: { personId: string; email: string; cookie: string }[];
  preceptorCookie: string;
  preceptorId: string;
  checkoffIds: string[];
};

async function prepareDatabase(): Promise<Prepared> {
  mkdirSync(FAULTS_DIR, { recursive: true });
  removeFaultsDatabase(DB_FILE);
  removeFaultsDatabase(RESTORED_FILE);
  const today = defaultSeedDate();
  const seeded = await openDatabase(DATABASE_URL);
  await seed(seeded, { today });
  seeded.close();
  log(`Seeded the demo organisations (demo day ${today}) into ${path.relative(PROJECT_ROOT, DB_FILE)}.`);

  // The exam and the examinees' sessions, exactly as the autosave bench prepares them.
  const { examId, examinees } = await prepareAutosave(DATABASE_URL, EXAMINEES, SESSION_SECRET);

  const opened = openDatabase(DATABASE_URL, { migrate: false });
  setDatabaseForTests(opened);
  const database = await opened;
  try {
    const preceptor = await viewerFor(DEMO_ACCOUNTS.preceptor);
    const pin = await setSigningPin(preceptor, PRECEPTOR_PIN);
    if (!pin.ok) throw new Error(`Could not give the preceptor a signing PIN: ${pin.message}`);
    const sessionId = await database.write(async (tx) => {
      const [row] = await tx
        .insert(sessions)
        .values({ personId: preceptor.person.id, orgId: preceptor.org.id, expiresAt: new Date(Date.now() + 24 * 60 * 60 * 1000), userAgent: "tidemark-faults" })
        .returning({ id: sessions.id });
      return row.id;
    });
    // Check-offs requested by therapists (not the preceptor), every step met, judged competent.
    const therapistRows = await database.db
      .select({ email: people.email })
      .from(people)
      .innerJoin(personRoles, and(eq(personRoles.personId, people.id), eq(personRoles.role, "therapist")))
      .where(and(eq(people.orgId, preceptor.org.id), eq(people.active, true)));
    const therapists = [];
    for (const row of therapistRows.filter((r) => r.email !== DEMO_ACCOUNTS.preceptor).slice(0, 10)) therapists.push(await viewerFor(row.email));
    const checklists = await listPublishedChecklists(preceptor.org.id);
    if (therapists.length === 0 || checklists.length === 0) throw new Error("The seed has no therapist or no published checklist to sign.");
    const stepsOf = new Map<string, number>();
    for (const c of checklists) {
      const [v] = await database.db.select({ steps: checklistVersions.steps }).from(checklistVersions).where(eq(checklistVersions.id, c.versionId));
      stepsOf.set(c.id, v.steps.length);
    }
    const checkoffIds: string[] = [];
    for (let i = 0; i < CHECKOFFS; i++) {
      const therapist = therapists[i % therapists.length];
      const checklist = checklists[i % checklists.length];
      const requested = await requestCheckoff(therapist, checklist.id);
      if (!requested.ok) throw new Error(`Requesting a check-off: ${requested.message}`);
      for (let step = 0; step < stepsOf.get(checklist.id)!; step++) {
        const marked = await markStep(preceptor, requested.value, { stepIndex: step, result: "met", comment: null });
        if (!marked.ok) throw new Error(`Marking a step: ${marked.message}`);
      }
      const judged = await setOutcome(preceptor, requested.value, { outcome: "competent", practicePlan: null, practiceBy: null });
      if (!judged.ok) throw new Error(`Choosing the outcome: ${judged.message}`);
      checkoffIds.push(requested.value);
    }
    // Everything prepared is in the main file before the server (and its kills) begin.
    await database.client.execute("PRAGMA wal_checkpoint(TRUNCATE)");
    return { examId, examinees, preceptorCookie: await sessionCookieHeader(sessionId, SESSION_SECRET), preceptorId: preceptor.person.id, checkoffIds };
  } finally {
    setDatabaseForTests(undefined);
    database.close();
  }
}

// ── The server ───────────────────────────────────────────────────────────────────────────
type Server = { child: ChildProcess; pid: number; exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>; logFile: string };
let current: Server | undefined;
const children = new Set<ChildProcess>();
process.on("exit", () => {
  for (const child of children) if (child.exitCode === null && child.signalCode === null) child.kill("SIGKILL");
});
// Ctrl-C: never leave a server behind on the port (the exit handler above kills it).
process.on("SIGINT", () => process.exit(130));

async function startServer(serverEntry: string, port: number, n: number): Promise<Server> {
  const logFile = path.join(FAULTS_DIR, `server-${n}.log`);
  const logStream = createWriteStream(logFile, { flags: "w" });
  const child = spawn(process.execPath, [path.join(PROJECT_ROOT, "scripts", "serve.mjs"), serverEntry], {
    cwd: PROJECT_ROOT,
    env: {
      PATH: process.env.PATH ?? "",
      HOME: process.env.HOME ?? "",
      NODE_ENV: "production",
      PORT: String(port),
      HOST: "127.0.0.1",
      DATABASE_URL,
      DATA_DIR: path.relative(PROJECT_ROOT, FAULTS_DIR),
      SESSION_SECRET,
      TOTP_SECRET,
      TIDEMARK_REMINDERS: "off",
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  children.add(child);
  child.stdout?.pipe(logStream);
  child.stderr?.pipe(logStream);
  if (child.pid === undefined) throw new Error("The server process did not start.");
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.once("exit", (code, signal) => {
      children.delete(child);
      resolve({ code, signal });
    }),
  );
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  let last = "no answer yet";
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited with status ${child.exitCode} before /healthz answered (log: ${logFile}).`);
    try {
      const answer = await httpGet(`${baseUrl}/healthz`, {}, 2000);
      if (answer.status === 200) return { child, pid: child.pid, exited, logFile };
      last = `${answer.status}`;
    } catch (error) {
      last = message(error);
    }
    await sleep(100);
  }
  child.kill("SIGKILL");
  throw new Error(`GET /healthz did not answer 200 within 30 s (last: ${last}; log: ${logFile}).`);
}

// ── HTTP as the browser sends it ───────────────────────────────────────────────────────────
type Reply = { status: number; location?: string; body: string };

function request(agent: http.Agent, baseUrl: string, method: "GET" | "POST", pathname: string, cookie: string, fields?: Record<string, string>, onSent?: () => void): Promise<Reply> {
  const body = fields ? new URLSearchParams(fields).toString() : undefined;
  return new Promise((resolve, reject) => {
    const req = http.request(
      `${baseUrl}${pathname}`,
      {
        method,
        agent,
        timeout: REQUEST_TIMEOUT_MS,
        headers: {
          ...(cookie ? { Cookie: cookie } : {}),
          ...(body === undefined
            ? { Accept: "text/html" }
            : { "Content-Type": "application/x-www-form-urlencoded", "Content-Length": Buffer.byteLength(body), Origin: baseUrl, Accept: pathname.endsWith("/answers") ? "application/json" : "text/html" }),
        },
      },
      (response) => {
        let text = "";
        response.setEncoding("utf8");
        response.on("data", (chunk: string) => (text += chunk));
        response.on("end", () => {
          // A reply cut off by the server's death is not an answer.
          if (!response.complete) reject(new Error("reply cut off"));
          else resolve({ status: response.statusCode ?? 0, location: response.headers.location, body: text });
        });
        response.on("error", reject);
        response.on("aborted", () => reject(new Error("reply aborted")));
      },
    );
    req.on("timeout", () => req.destroy(new Error(`no reply within ${REQUEST_TIMEOUT_MS / 1000} s`)));
    req.on("error", reject);
    req.on("finish", () => onSent?.());
    req.end(body);
  });
}

/** Each save of a question differs from the one before it (ledger.ts relies on it). */
function answerFor(shape: FormShape, k: number): SubmittedAnswer {
  switch (shape.kind) {
    case "single":
      return { kind: "single", choice: shape.optionIds[k % shape.optionIds.length] };
    case "multiple": {
      const n = shape.optionIds.length;
      const mask = (k % ((1 << Math.min(n, 4)) - 1)) + 1;
      return { kind: "multiple", choices: shape.optionIds.filter((_, i) => i < 4 && mask & (1 << i)) };
    }
    case "ordering": {
      const r = k % shape.stepIds.length;
      return { kind: "ordering", order: [...shape.stepIds.slice(r), ...shape.stepIds.slice(0, r)] };
    }
    case "numeric":
      return { kind: "numeric", text: String(10 + k) };
    case "waveform-point":
      return { kind: "waveform-point", timeS: shape.fromS + ((shape.toS - shape.fromS) * ((k % 97) + 1)) / 99 };
  }
}

function isSaveAck(reply: Reply, position: number): boolean {
  if (reply.status !== 200) return false;
  try {
    const json = JSON.parse(reply.body) as { ok?: boolean; position?: number };
    return json.ok === true && json.position === position;
  } catch {
    return false;
  }
}

/** The signing form's success: the action redirects back to the record (with its toast). */
const isSignAck = (reply: Reply, checkoffId: string) => reply.status === 302 && reply.location === `/checkoffs/${checkoffId}`;

// ── The load ─────────────────────────────────────────────────────────────────────────────
type Examinee = { cookie: string; attemptId: string; form: StoredFormEntry[]; counts: Map<number, number>; agent: http.Agent };

class Gate {
  private opened!: Promise<void>;
  private release: () => void = () => undefined;
  constructor() {
    this.close();
  }
  close() {
    this.opened = new Promise((resolve) => (this.release = resolve));
  }
  open() {
    this.release();
  }
  wait() {
    return this.opened;
  }
}

const ledger = new Ledger();
const gate = new Gate();
let stopping = false;
let baseUrl = "";
const failures: string[] = [];

function settleFromError(record: SaveRecord | SignRecord): void {
  ledger.settle(record, "unknown");
}

async function saveOnce(e: Examinee, agent = e.agent, onSent?: () => void, position?: number): Promise<SaveRecord> {
  const entry = position === undefined ? e.form[Math.floor(random() * e.form.length)] : e.form.find((f) => f.position === position)!;
  const k = e.counts.get(entry.position) ?? 0;
  e.counts.set(entry.position, k + 1);
  const answer = answerFor(entry.shape, k);
  const record = ledger.save(e.attemptId, entry.position, answer);
  try {
    const reply = await request(agent, baseUrl, "POST", `/exams/attempts/${e.attemptId}/answers`, e.cookie, { position: String(entry.position), answer: JSON.stringify(answer) }, onSent);
    if (isSaveAck(reply, entry.position)) ledger.settle(record, "ack", reply.status);
    else ledger.settle(record, reply.status >= 400 && reply.status < 500 ? "refused" : "unknown", reply.status);
  } catch {
    settleFromError(record);
  }
  return record;
}

async function signOnce(prepared: Prepared, checkoffId: string, agent: http.Agent, onSent?: () => void): Promise<SignRecord> {
  const record = ledger.sign(checkoffId);
  try {
    const reply = await request(agent, baseUrl, "POST", `/checkoffs/${checkoffId}`, prepared.preceptorCookie, { intent: "sign", pin: PRECEPTOR_PIN }, onSent);
    if (isSignAck(reply, checkoffId)) ledger.settle(record, "ack", reply.status);
    else ledger.settle(record, reply.status >= 400 && reply.status < 500 ? "refused" : "unknown", reply.status);
  } catch {
    settleFromError(record);
  }
  return record;
}

async function examineeWorker(e: Examinee): Promise<void> {
  while (!stopping) {
    await gate.wait();
    if (stopping) break;
    await saveOnce(e);
    // An examinee answers, then reads the next question: a short pause, not a tight loop.
    await sleep(40 + random() * 80);
  }
}

const unsigned: string[] = [];
async function signerWorker(prepared: Prepared, agent: http.Agent): Promise<void> {
  while (!stopping && unsigned.length > 4) {
    await gate.wait();
    if (stopping) break;
    // Each check-off is tried once: a sign-off cut by a kill is never sent again (it may have committed).
    await signOnce(prepared, unsigned.shift()!, agent);
    await sleep(20 + random() * 40);
  }
}

async function startAttempts(prepared: Prepared): Promise<Examinee[]> {
  const out: Examinee[] = [];
  for (const x of prepared.examinees) {
    const agent = new http.Agent({ keepAlive: true, maxSockets: 6 });
    const reply = await request(agent, baseUrl, "POST", `/exams/${prepared.examId}/start`, x.cookie, { layout: "one" });
    const id = /^\/exams\/attempts\/([0-9a-f-]{36})$/.exec(reply.location ?? "")?.[1];
    if (reply.status !== 302 || !id) throw new Error(`Starting the exam as ${x.email} answered ${reply.status} ${reply.location ?? ""}, not 302 → /exams/attempts/:id.`);
    out.push({ cookie: x.cookie, attemptId: id, form: [], counts: new Map(), agent });
  }
  const reader = createClient({ url: DATABASE_URL });
  try {
    const rows = await drizzle(reader).select({ id: attempts.id, form: attempts.form }).from(attempts).where(inArray(attempts.id, out.map((e) => e.attemptId)));
    const forms = new Map(rows.map((r) => [r.id, r.form as StoredFormEntry[]]));
    for (const e of out) {
      e.form = [...(forms.get(e.attemptId) ?? [])].sort((a, b) => a.position - b.position);
      if (e.form.length === 0) throw new Error(`Attempt ${e.attemptId} has no form.`);
    }
  } finally {
    reader.close();
  }
  return out;
}

// ── Reading back ─────────────────────────────────────────────────────────────────────────
async function readState(file: string, attemptIds: string[], preceptorId: string): Promise<StoredState & { integrity: string }> {
  const integrity = await integrityOf(file);
  const client = createClient({ url: `file:${file}` });
  try {
    const answers = new Map<string, string>();
    const placeholders = attemptIds.map(() => "?").join(",");
    const rows = await client.execute({ sql: `SELECT attempt_id, position, answer FROM responses WHERE attempt_id IN (${placeholders})`, args: attemptIds });
    for (const r of rows.rows) answers.set(`${r.attempt_id}:${r.position}`, fingerprint(r.answer === null ? null : JSON.parse(String(r.answer))));
    const signed = await client.execute({
      sql: `SELECT c.id FROM checkoffs c JOIN signatures s ON s.record_type = 'checkoff' AND s.record_id = c.id AND s.signer_id = ?
            WHERE c.status IN ('signed', 'acknowledged') AND c.preceptor_id = ? AND c.signed_at IS NOT NULL`,
      args: [preceptorId, preceptorId],
    });
    return { answers, signedCheckoffs: new Set(signed.rows.map((r) => String(r.id))), integrity };
  } finally {
    client.close();
  }
}

// ── The run ──────────────────────────────────────────────────────────────────────────────
async function backupUnderLoad(): Promise<{ before: number; file: string; acknowledgedDuring: number; ms: number }> {
  const out = path.join(FAULTS_DIR, `backup-${Date.now()}.db`);
  const before = performance.now();
  const ackedBefore = ledger.acknowledged().saves.length + ledger.acknowledged().signs.length;
  const child = spawn(path.join(PROJECT_ROOT, "node_modules", ".bin", "tsx"), [path.join(PROJECT_ROOT, "scripts", "db-backup.ts"), "--out", out], {
    cwd: PROJECT_ROOT,
    env: { ...process.env, DATABASE_URL },
    stdio: ["ignore", "pipe", "pipe"],
  });
  children.add(child);
  let output = "";
  child.stdout?.on("data", (c: Buffer) => (output += c.toString()));
  child.stderr?.on("data", (c: Buffer) => (output += c.toString()));
  const code = await new Promise<number | null>((resolve) => child.once("exit", (c) => resolve(c)));
  children.delete(child);
  const ms = performance.now() - before;
  if (code !== 0) throw new Error(`npm run db:backup failed (exit ${code}):\n${output.trim()}`);
  for (const line of output.trim().split("\n")) log(`  db:backup │ ${line}`);
  const ackedAfter = ledger.acknowledged().saves.length + ledger.acknowledged().signs.length;
  return { before, file: out, acknowledgedDuring: ackedAfter - ackedBefore, ms };
}

async function sigtermUnderLoad(prepared: Prepared, examinees: Examinee[], server: Server): Promise<string> {
  // Keep-alive sockets, opened (and accepted by the server) before the batch: the batch's
  // requests reach the server on them, and a few stay idle through the stop.
  const batch = examinees.length * 2 + 4;
  const idle = 6;
  const agent = new http.Agent({ keepAlive: true, maxSockets: batch + idle });
  await Promise.all(Array.from({ length: batch + idle }, () => request(agent, baseUrl, "GET", "/healthz", "")));
  let sent = 0;
  let allSent!: () => void;
  const everySent = new Promise<void>((resolve) => (allSent = resolve));
  const onSent = () => {
    if (++sent === batch) allSent();
  };
  type Item = { what: string; run: Promise<{ ok: boolean; detail: string; done: boolean }> };
  const items: Item[] = [];
  const settled = new Set<number>();
  const track = (i: number, p: Promise<{ ok: boolean; detail: string }>) =>
    p.then((r) => {
      settled.add(i);
      return { ...r, done: true };
    });
  examinees.forEach((e, i) => {
    for (const position of [e.form[0].position, e.form[e.form.length - 1].position]) {
      const n = items.length;
      items.push({ what: `save ${i}:${position}`, run: track(n, saveOnce(e, agent, onSent, position).then((r) => ({ ok: r.outcome === "ack", detail: `${r.outcome} ${r.status ?? ""}` }))) });
    }
  });
  for (let s = 0; s < 2; s++) {
    const id = unsigned.shift();
    if (!id) break;
    const n = items.length;
    items.push({ what: `sign-off ${id}`, run: track(n, signOnce(prepared, id, agent, onSent).then((r) => ({ ok: r.outcome === "ack", detail: `${r.outcome} ${r.status ?? ""}` }))) });
  }
  while (items.length < batch) {
    const e = examinees[items.length % examinees.length];
    const n = items.length;
    items.push({
      what: `GET /exams/attempts/${e.attemptId}`,
      run: track(
        n,
        request(agent, baseUrl, "GET", `/exams/attempts/${e.attemptId}`, e.cookie, undefined, onSent).then(
          (r) => ({ ok: r.status === 200 && r.body.includes("</html>"), detail: `${r.status}, ${r.body.length} characters` }),
          (error: unknown) => ({ ok: false, detail: message(error) }),
        ),
      ),
    });
  }
  await everySent;
  const inFlight = batch - settled.size;
  server.child.kill("SIGTERM");
  const sigtermAt = performance.now();
  const results = await Promise.all(items.map((i) => i.run));
  const lastReplyAt = performance.now();
  const exit = await Promise.race([server.exited, sleep(15_000).then(() => null)]);
  const exitMs = performance.now() - sigtermAt;
  const afterLastReplyMs = performance.now() - lastReplyAt;
  agent.destroy();
  const bad = results.map((r, i) => ({ ...r, what: items[i].what })).filter((r) => !r.ok);
  if (inFlight === 0) failures.push("SIGTERM: no request was still in flight when the signal was sent; the stop was not tested under load.");
  if (bad.length) failures.push(`SIGTERM: ${bad.length} of ${batch} requests did not get their full 2xx answer: ${bad.slice(0, 5).map((b) => `${b.what} → ${b.detail}`).join("; ")}`);
  if (exit === null) {
    server.child.kill("SIGKILL");
    failures.push("SIGTERM: the server had not exited 15 s after the signal (idle keep-alive connections or a request holding it open).");
  } else if (exit.code !== 0) failures.push(`SIGTERM: the server exited with ${exit.code === null ? `signal ${exit.signal}` : `status ${exit.code}`}, not 0.`);
  // Node's keepAliveTimeout is 5 s: a process still there 3 s after the last reply is held by idle connections.
  else if (afterLastReplyMs > 3000) failures.push(`SIGTERM: the server exited ${Math.round(afterLastReplyMs)} ms after the last reply; idle keep-alive connections held it open.`);
  const okCount = results.filter((r) => r.ok).length;
  return `SIGTERM under load: ${inFlight} of ${batch} requests in flight at the signal (plus ${idle} idle keep-alive connections); ${okCount} of ${batch} got their full 2xx answer; the process exited ${exit === null ? "— not within 15 s" : exit.code === null ? `by signal ${exit.signal}` : `with status ${exit.code}`} ${Math.round(exitMs)} ms after the signal (${Math.round(afterLastReplyMs)} ms after the last reply)`;
}

/** "p50 12 ms, max 340 ms" over the acknowledged records. */
function latency(records: (SaveRecord | SignRecord)[]): string {
  const ms = records.filter((r) => r.outcome === "ack" && r.ackAt !== undefined).map((r) => r.ackAt! - r.sentAt).sort((a, b) => a - b);
  if (ms.length === 0) return "none";
  return `p50 ${Math.round(ms[Math.floor((ms.length - 1) / 2)])} ms, max ${Math.round(ms[ms.length - 1])} ms`;
}

/** "unknown × 40, 409 × 1": the writes without an acknowledgement, by what happened to them. */
function notAcknowledged(records: (SaveRecord | SignRecord)[]): string {
  const counts = new Map<string, number>();
  for (const r of records) {
    if (r.outcome === "ack") continue;
    const key = r.status ? `${r.outcome} (HTTP ${r.status})` : `${r.outcome} (no reply)`;
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return counts.size ? [...counts].map(([k, n]) => `${k} × ${n}`).join(", ") : "none";
}

async function main(): Promise<number> {
  const build = await getBuild();
  log(`Build: ${build.label}`);
  const prepared = await prepareDatabase();
  unsigned.push(...prepared.checkoffIds);
  log(`Prepared ${prepared.examinees.length} examinees with sessions, the preceptor's PIN and ${prepared.checkoffIds.length} check-offs ready to sign.`);

  const port = await choosePort(whole("port", flags.port, 1));
  baseUrl = `http://127.0.0.1:${port}`;
  let n = 0;
  current = await startServer(build.serverEntry, port, ++n);
  log(`Server PID ${current.pid} on ${baseUrl} (scripts/serve.mjs; log data/faults/server-${n}.log).`);
  const examinees = await startAttempts(prepared);
  log(`${examinees.length} attempts started through POST /exams/:examId/start (${examinees[0].form.length} questions each).`);

  gate.open();
  // Two preceptor tabs signing at once, beside the examinees' saves.
  const signerAgent = new http.Agent({ keepAlive: true, maxSockets: 6 });
  const workers = [...examinees.map((e) => examineeWorker(e)), signerWorker(prepared, signerAgent), signerWorker(prepared, signerAgent)];
  const kills: string[] = [];
  let backup: Awaited<ReturnType<typeof backupUnderLoad>> | undefined;
  for (let round = 1; round <= ROUNDS; round++) {
    const runMs = 1500 + random() * 2500;
    if (round === ROUNDS - 1) {
      await sleep(runMs / 2);
      backup = await backupUnderLoad();
      log(`Backup taken under load in ${Math.round(backup.ms)} ms; ${backup.acknowledgedDuring} writes acknowledged while it ran.`);
      await sleep(runMs / 2);
    } else await sleep(runMs);
    // Kill at a moment with requests in flight (waited for, up to 2 s).
    const waitUntil = performance.now() + 2000;
    while (ledger.inFlight() === 0 && performance.now() < waitUntil) await sleep(2);
    const inFlight = ledger.inFlight();
    gate.close();
    current.child.kill("SIGKILL");
    const exit = await current.exited;
    const acked = ledger.acknowledged();
    const line = `kill ${round}: SIGKILL after ${(runMs / 1000).toFixed(1)} s of load with ${inFlight} requests in flight (exit signal ${exit.signal}); acknowledged so far ${acked.saves.length} saves, ${acked.signs.length} sign-offs`;
    kills.push(line);
    log(line);
    if (inFlight === 0) failures.push(`kill ${round}: no request was in flight at the kill.`);
    // Let every request cut by the kill settle before the restart.
    while (ledger.inFlight() > 0) await sleep(5);
    current = await startServer(build.serverEntry, port, ++n);
    log(`  restarted: PID ${current.pid} on the same database file.`);
    gate.open();
  }
  await sleep(1000);
  stopping = true;
  gate.open();
  await Promise.all(workers);
  for (const e of examinees) e.agent.destroy();
  signerAgent.destroy();

  const sigterm = await sigtermUnderLoad(prepared, examinees, current);
  log(sigterm);

  // Backup: restore into a fresh file (the faults run's, never the app's) and check it.
  let backupLine = "backup under load: not taken";
  if (backup) {
    const restored = await restoreDatabase({ backup: backup.file, target: RESTORED_FILE });
    const state = await readState(RESTORED_FILE, examinees.map((e) => e.attemptId), prepared.preceptorId);
    const verdict = verify(ledger, state, backup.before);
    backupLine = `backup under load (npm run db:backup, VACUUM INTO; ${backup.acknowledgedDuring} writes acknowledged while it ran): restored to ${path.relative(PROJECT_ROOT, RESTORED_FILE)} (${statSync(RESTORED_FILE).size} bytes, ${restored.migrations} migrations); acknowledged before it began ${verdict.acknowledged}, found ${verdict.found}, integrity ${state.integrity}`;
    if (state.integrity !== "ok") failures.push(`backup: PRAGMA integrity_check on the restored copy: ${state.integrity}`);
    if (verdict.found !== verdict.acknowledged) failures.push(`backup: ${verdict.acknowledged - verdict.found} writes acknowledged before the backup began are missing from it:\n  ${verdict.missing.slice(0, 20).join("\n  ")}`);
    rmSync(backup.file, { force: true });
  }

  const state = await readState(DB_FILE, examinees.map((e) => e.attemptId), prepared.preceptorId);
  const verdict = verify(ledger, state);
  console.log("");
  for (const k of kills) console.log(k);
  console.log(
    `answer saves: sent ${ledger.saves.length}, acknowledged ${verdict.saves.acknowledged} over ${verdict.saves.questions} questions (${verdict.saves.superseded} overwritten by a later acknowledged save), found ${verdict.saves.found}; ${verdict.saves.heldByUnconfirmedLaterSave} questions hold a later save whose reply the kill cut`,
  );
  console.log(`sign-offs: sent ${ledger.signs.length}, acknowledged ${verdict.signs.acknowledged}, found ${verdict.signs.found}`);
  console.log(`reply times of acknowledged writes: saves ${latency(ledger.saves)}; sign-offs ${latency(ledger.signs)}`);
  console.log(`not acknowledged (cut by a kill, or refused): saves ${notAcknowledged(ledger.saves)}; sign-offs ${notAcknowledged(ledger.signs)}`);
  console.log(backupLine);
  console.log(sigterm);
  if (verdict.signs.acknowledged === 0 || verdict.saves.acknowledged === 0) failures.push("No sign-off or no answer save was acknowledged: the load did not run.");
  if (verdict.missing.length) failures.push(`${verdict.missing.length} acknowledged writes are missing:\n  ${verdict.missing.slice(0, 30).join("\n  ")}`);
  if (state.integrity !== "ok") failures.push(`PRAGMA integrity_check: ${state.integrity}`);
  build.build?.remove();
  if (failures.length) {
    console.log(`\nFAILED (${elapsed()}):`);
    for (const f of failures) console.log(`- ${f}`);
    console.log(`acknowledged ${verdict.acknowledged}, found ${verdict.found}, integrity ${state.integrity}`);
    return 1;
  }
  console.log(`acknowledged ${verdict.acknowledged}, found ${verdict.found}, integrity ${state.integrity}`);
  return 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    console.error(`\nThe faults run could not complete: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
    process.exit(1);
  },
);
