/**
 * Hostile input, part 2 (issue 11, item 4): fast-check generated invalid input through the real
 * route actions. Every answer must be a 4xx carrying a field error (a conform reply's `error`
 * for that field, the API's `error.field`, or the answer route's message) — never a thrown
 * error or a 500 — and nothing already saved may change: a fingerprint of every table (row
 * counts and contents, hashed) is taken before each property and compared after all its runs.
 * Runs are kept modest (25) so the file stays under a minute.
 */
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { createToken } from "~/api/token.server";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { startAttempt } from "~/db/queries/exam-attempts.server";
import { credentials, credentialTypes, exams, people, units } from "~/db/schema";
import * as apiCredential from "~/routes/api/v1/credential";
import * as apiCredentials from "~/routes/api/v1/credentials";
import * as adminReminders from "~/routes/admin/reminders";
import * as adminUnits from "~/routes/admin/units";
import * as roster from "~/routes/admin/roster";
import * as login from "~/routes/auth/login";
import * as examNew from "~/routes/bank/exam-new";
import * as bankImport from "~/routes/bank/import";
import * as itemNew from "~/routes/bank/item-new";
import * as checkoffRoute from "~/routes/checkoffs/checkoff";
import * as credentialsRoute from "~/routes/credentials/index";
import * as answers from "~/routes/exams/answers";
import * as person from "~/routes/admin/person";
import * as personNew from "~/routes/admin/person-new";
import * as accommodations from "~/routes/team/accommodations";
import { HOSTILE_STRINGS } from "../fixtures/hostile-strings";
import { useSeededDatabase } from "../setup/db";
import { args, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";
import { outcome, type Outcome } from "./admin-harness";
import { givePin, PINS, requested } from "./checkoffs-harness";

const RUNS = { numRuns: 25 };

let db: Database;
let admin: Viewer;
let therapist: Viewer;
let preceptor: Viewer;
let educator: Viewer;
let manager: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  [admin, therapist, preceptor, educator, manager] = await Promise.all(
    ["admin", "therapist", "preceptor", "educator", "manager"].map((r) => viewerFor(`${r}@kestrelvalley.test`)),
  );
});

// ── Arbitraries of invalid input ────────────────────────────────────────────────────────────

const daysIn = (y: number, m: number) => new Date(Date.UTC(y, m, 0)).getUTCDate();
const pad = (n: number, w = 2) => String(n).padStart(w, "0");
/** Dates that do not exist (Gregorian calendar, ISO 8601-1:2019) or are not YYYY-MM-DD. */
const impossibleDate = fc.oneof(
  fc
    .record({ y: fc.integer({ min: 1900, max: 2100 }), m: fc.constantFrom(2, 4, 6, 9, 11) })
    .chain(({ y, m }) => fc.integer({ min: daysIn(y, m) + 1, max: 31 }).map((d) => `${y}-${pad(m)}-${pad(d)}`)),
  fc.constantFrom("2026-02-30", "2025-02-29", "2026-13-01", "2026-00-10", "2026-04-31", "31/12/2026", "2026-1-5", "=TODAY()", "<script>alert(1)</script>"),
);
const hostile = fc.constantFrom(...HOSTILE_STRINGS.map((h) => h.value));
const overLong = (max: number) => fc.integer({ min: max + 1, max: max + 400 }).chain((n) => fc.constantFrom("a", "<", "\u{1F469}", "\u202E").map((c) => c.repeat(n)));
const blank = fc.constantFrom("", " ", "\t", "\u00A0\u3000");
const badNumber = fc.oneof(fc.constantFrom("abc", "1e999", "NaN", "-0.5", "1,5", "Infinity", "12abc", "<b>3</b>", "=1+1"), fc.integer({ min: 1000, max: 1e9 }).map(String));

// ── The database is left as it was ──────────────────────────────────────────────────────────

/** A hash of every table's rows, but the tables in `ignore`. */
async function fingerprint(ignore: readonly string[] = []): Promise<string> {
  const tables = await db.client.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '__drizzle%' ORDER BY name");
  const hash = createHash("sha256");
  for (const { name } of tables.rows) {
    if (ignore.includes(String(name))) continue;
    const rows = await db.client.execute(`SELECT * FROM "${String(name)}" ORDER BY rowid`);
    hash.update(`${String(name)}:${rows.rows.length}:${JSON.stringify(rows.rows)}`);
  }
  return hash.digest("hex");
}

/** Runs a property whose every run must be refused, then checks nothing was saved. */
async function refusedWithoutChange<T>(arb: fc.Arbitrary<T>, run: (v: T) => Promise<void>, runs = RUNS, ignore: readonly string[] = []) {
  const before = await fingerprint(ignore);
  await fc.assert(fc.asyncProperty(arb, run), runs);
  expect(await fingerprint(ignore), "a refused submission changed the database").toBe(before);
}

// ── What a refusal carries ──────────────────────────────────────────────────────────────────

type Body = { error?: Record<string, string[] | null> | { field?: string; message?: string }; message?: string; ok?: boolean; problems?: unknown[] } | null;

/** A 4xx answer carrying an error on `field` (a conform reply or the API's error object). */
function expectFieldRefusal(answer: Outcome, field: string, status: number | "4xx" = 400) {
  if (status === "4xx") expect(answer.status).toBeGreaterThanOrEqual(400), expect(answer.status).toBeLessThan(500);
  else expect(answer.status, JSON.stringify(answer.body)?.slice(0, 400)).toBe(status);
  const body = answer.body as Body;
  const error = body?.error as Record<string, unknown> | undefined;
  expect(error, `no error in ${JSON.stringify(body)?.slice(0, 300)}`).toBeTruthy();
  if (typeof error!.field === "string") {
    expect(error!.field).toBe(field);
    expect(String(error!.message).length).toBeGreaterThan(10);
  } else {
    const messages = (error as Record<string, string[] | null>)[field];
    expect(messages, `no error on ${field}: ${JSON.stringify(error)?.slice(0, 300)}`).toBeTruthy();
    expect(messages!.join(" ").length).toBeGreaterThan(10);
  }
}

const act = <F extends (a: never) => unknown>(fn: F, request: Request, viewer: Viewer | null, params: Record<string, string> = {}) => outcome(fn(args<never>(request, viewer, params)));

function multipart(path: string, fields: Record<string, string>, files: Record<string, File> = {}): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  for (const [k, f] of Object.entries(files)) form.append(k, f);
  return new Request(new URL(path, TEST_ORIGIN), { method: "POST", body: form, headers: { Origin: TEST_ORIGIN } });
}

// ── Sign-in and Admin ───────────────────────────────────────────────────────────────────────

describe("sign-in and Admin forms refuse invalid input on the field", () => {
  it("sign-in e-mail: blank, malformed, markup or over-long addresses answer 400 on email", async () => {
    const bad = fc.oneof(blank, hostile, overLong(254).map((s) => `${s}@x.test`), fc.constantFrom("ana", "ana@", "@x.test", "a b@x.test"));
    await refusedWithoutChange(bad, async (email) => expectFieldRefusal(await act(login.action, postForm("/login", { email }), null), "email"));
  });

  it("units: blank or over-long names and codes that are not letters, digits and hyphens", async () => {
    const bad = fc.oneof(
      fc.record({ name: fc.oneof(blank, overLong(60)), code: fc.constant("NEWU"), field: fc.constant("name") }),
      fc.record({ name: fc.constant("New unit"), code: fc.oneof(blank, hostile, overLong(12)), field: fc.constant("code") }),
    );
    await refusedWithoutChange(bad, async ({ name, code, field }) => expectFieldRefusal(await act(adminUnits.action, postForm("/admin/units", { intent: "create-unit", name, code }), admin), field));
  });

  const personFields = { name: "Ada Quill", email: "ada.quill@kestrelvalley.test", hireDate: "2026-01-05", firstRole: "therapist", birthMonth: "4" };
  const badPerson = fc.oneof(
    fc.record({ field: fc.constant("name"), value: fc.oneof(blank, overLong(120)) }),
    fc.record({ field: fc.constant("email"), value: fc.oneof(hostile, fc.constantFrom("ada", "ada@")) }),
    fc.record({ field: fc.constant("hireDate"), value: impossibleDate }),
    fc.record({ field: fc.constant("birthMonth"), value: fc.oneof(badNumber, fc.constantFrom("0", "13", "4.5")) }),
    fc.record({ field: fc.constant("title"), value: overLong(120) }),
    fc.record({ field: fc.constant("employeeId"), value: overLong(40) }),
    fc.record({ field: fc.constant("credentialLetters"), value: hostile.filter((h) => !/^[A-Za-z0-9 ,.\-()/]*$/.test(h)) }),
  );

  it("adding a person: bad names, e-mails, impossible hire dates, months out of 1–12", async () => {
    await refusedWithoutChange(badPerson, async ({ field, value }) =>
      expectFieldRefusal(await act(personNew.action, postForm("/admin/people/new", { ...personFields, [field]: value }), admin), field),
    );
  });

  it("editing a person: the same refusals, and the person is unchanged", async () => {
    const [p] = await db.db.select().from(people).where(eq(people.id, therapist.person.id));
    const fields = { intent: "update-person", name: p.name, email: p.email, hireDate: p.hireDate ?? "2020-01-01", title: p.title ?? "", employeeId: p.employeeId ?? "" };
    await refusedWithoutChange(badPerson, async ({ field, value }) =>
      expectFieldRefusal(await act(person.action, postForm(`/admin/people/${p.id}`, { ...fields, [field]: value }), admin, { personId: p.id }), field),
    );
  });

  it("reminder policy: numbers out of range, repeated, not whole, or not numbers", async () => {
    const bad = fc.oneof(
      fc.record({ field: fc.constant("daysBefore"), value: fc.oneof(blank, badNumber.filter((v) => v !== "1,5"), fc.constantFrom("0", "30, 30", "366", "1.5")) }),
      fc.record({ field: fc.constant("boardMonthsBefore"), value: fc.oneof(fc.constantFrom("25", "0", "six", "=1"), fc.integer({ min: 25, max: 1e6 }).map(String)) }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) =>
      expectFieldRefusal(await act(adminReminders.action, postForm("/admin/reminders", { daysBefore: "30", [field]: value }), admin), field),
    );
  });

  it("roster import: an empty, binary, markup or over-long file is refused with problems listed, nothing imported", async () => {
    const bad = fc.oneof(
      fc.constant(new Uint8Array()),
      fc.constant(new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0xff, 0xfe])),
      hostile.map((h) => new TextEncoder().encode(h)),
      fc.constant(new TextEncoder().encode("employee_id,name\n'; DROP TABLE people; --,<script>alert(1)</script>\n")),
    );
    await refusedWithoutChange(
      bad,
      async (bytes) => {
        const answer = await act(roster.action, multipart("/admin/roster", { intent: "preview-roster" }, { file: new File([bytes as BlobPart], "roster.csv", { type: "text/csv" }) }), admin);
        expect(answer.status).toBeGreaterThanOrEqual(400);
        expect(answer.status).toBeLessThan(500);
        const body = answer.body as { problems?: { message: string }[]; message?: string };
        expect((body.problems?.[0]?.message ?? body.message ?? "").length, JSON.stringify(body).slice(0, 300)).toBeGreaterThan(10);
      },
      { numRuns: 10 },
    );
  });
});

// ── Credentials (form and API) ──────────────────────────────────────────────────────────────

describe("credentials refuse impossible dates, over-long text and bad files, on the field", () => {
  let typeId = "";
  beforeAll(async () => {
    const [t] = await db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, therapist.org.id));
    typeId = t.id;
  });
  const base = () => ({ intent: "record-credential", personId: therapist.person.id, credentialTypeId: typeId, issuedOn: "2026-11-20" });

  it("the page: dates, numbers and issuers", async () => {
    const bad = fc.oneof(
      fc.record({ field: fc.constant("issuedOn"), value: fc.oneof(impossibleDate, blank) }),
      fc.record({ field: fc.constant("validThrough"), value: fc.oneof(impossibleDate, fc.constant("2020-01-01")) }),
      fc.record({ field: fc.constant("number"), value: overLong(60) }),
      fc.record({ field: fc.constant("issuer"), value: overLong(120) }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) => expectFieldRefusal(await act(credentialsRoute.action, multipart("/credentials", { ...base(), [field]: value }), therapist), field));
  });

  it("the page: a scan that is empty, not a PNG/JPEG/PDF by content (whatever its name and type), or over 10 MB", async () => {
    const bad = fc.oneof(
      fc.record({ bytes: fc.constant(new Uint8Array()), name: fc.constant("card.png"), type: fc.constant("image/png") }),
      fc.record({ bytes: fc.constant(new Uint8Array([0x4d, 0x5a, 0x90, 0x00])), name: fc.constantFrom("card.pdf", "card.png"), type: fc.constantFrom("application/pdf", "image/png") }),
      fc.record({ bytes: hostile.map((h) => new TextEncoder().encode(h)), name: fc.constantFrom("card.pdf", "<script>.jpg"), type: fc.constantFrom("application/pdf", "image/jpeg", "text/html") }),
      fc.record({ bytes: fc.uint8Array({ minLength: 1, maxLength: 64 }).filter((b) => b[0] !== 0x25 && b[0] !== 0x89 && b[0] !== 0xff), name: fc.constant("card.jpg"), type: fc.constant("image/jpeg") }),
    );
    await refusedWithoutChange(bad, async ({ bytes, name, type }) =>
      expectFieldRefusal(await act(credentialsRoute.action, multipart("/credentials", base(), { scan: new File([bytes as BlobPart], name, { type }) }), therapist), "scan"),
    );
    const big = new Uint8Array(10 * 1024 * 1024 + 10);
    big.set(new TextEncoder().encode("%PDF-1.4\n"));
    const before = await fingerprint();
    const answer = await act(credentialsRoute.action, multipart("/credentials", base(), { scan: new File([big], "big.pdf", { type: "application/pdf" }) }), therapist);
    expect([400, 413]).toContain(answer.status);
    expect((answer.body as { error: Record<string, string[]> }).error.scan?.[0]).toMatch(/10 MB/);
    expect(await fingerprint()).toBe(before);
  });

  it("the JSON API: POST and PATCH refuse wrong types, impossible dates and over-long text with error.field", async () => {
    const { token } = await createToken(admin.org.id, admin.person.id, { name: "hostile input test", scopes: ["read", "write"], expiresOn: null });
    const [existing] = await db.db.select().from(credentials).where(eq(credentials.personId, therapist.person.id)).limit(1);
    const json = (method: string, path: string, body: unknown) =>
      new Request(new URL(path, TEST_ORIGIN), { method, headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: JSON.stringify(body) });
    const call = async (fn: (a: never) => Promise<Response>, request: Request, params: Record<string, string> = {}) => {
      const response = await fn(args<never>(request, null, params));
      return { status: response.status, location: null, body: JSON.parse(await response.text()) } as Outcome;
    };
    const bad = fc.oneof(
      fc.record({ field: fc.constant("issuedOn"), value: fc.oneof(impossibleDate, fc.integer(), fc.constant(null), fc.constant(true)) as fc.Arbitrary<unknown> }),
      fc.record({ field: fc.constant("validThrough"), value: fc.oneof(impossibleDate, fc.integer(), fc.array(fc.string(), { maxLength: 2 })) as fc.Arbitrary<unknown> }),
      fc.record({ field: fc.constant("number"), value: fc.oneof(overLong(60), fc.integer(), fc.object({ maxDepth: 1 })) as fc.Arbitrary<unknown> }),
      fc.record({ field: fc.constant("issuer"), value: fc.oneof(overLong(120), fc.boolean()) as fc.Arbitrary<unknown> }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) => {
      const body = { personId: therapist.person.id, credentialTypeId: typeId, issuedOn: "2026-11-20", [field]: value };
      expectFieldRefusal(await call(apiCredentials.action as never, json("POST", "/api/v1/credentials", body)), field);
      expectFieldRefusal(await call(apiCredential.action as never, json("PATCH", `/api/v1/credentials/${existing.id}`, { [field]: value }), { credentialId: existing.id }), field);
      // The token's last-used time and the per-token rate-limit count are written on every authenticated call (app/api/token.server.ts); nothing else may change.
    }, RUNS, ["api_tokens", "rate_limit_hits"]);
  });
});

// ── Bank: items, import, exams ──────────────────────────────────────────────────────────────

describe("the Bank refuses invalid items, files and exams on the field", () => {
  const item = { kind: "single", stem: "Which variable ends inspiration in volume control?", topics: "cycle-variables", rationale: "Volume cycles it.", reference: "Chatburn 2014", options: "Volume\nPressure", correct: "1" };

  it("item editor: blank or over-long text, correct options that are not options, bad numbers", async () => {
    const bad = fc.oneof(
      fc.record({ field: fc.constant("stem"), value: fc.oneof(blank, overLong(2000)) }),
      fc.record({ field: fc.constant("rationale"), value: overLong(3000) }),
      fc.record({ field: fc.constant("reference"), value: overLong(500) }),
      fc.record({ field: fc.constant("correct"), value: fc.oneof(badNumber, fc.constantFrom("0", "3", "-1", "1.5")) }),
      fc.record({ field: fc.constant("options"), value: fc.constantFrom("Only one", "Same\nsame", "") }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) => expectFieldRefusal(await act(itemNew.action, postForm("/bank/items/new", { ...item, [field]: value }), educator), field));
    const numeric = { ...item, kind: "numeric", unit: "cmH2O", answer: "7.5", tolerance: "0.1", decimals: "1" };
    const badNumeric = fc.record({ field: fc.constantFrom("answer", "tolerance", "decimals"), value: fc.constantFrom("abc", "Infinity", "-1", "9", "1e999") }).filter(({ field, value }) => !(field === "answer" && (value === "-1" || value === "9")) && !(field === "tolerance" && value === "9"));
    await refusedWithoutChange(badNumeric, async ({ field, value }) => expectFieldRefusal(await act(itemNew.action, postForm("/bank/items/new", { ...numeric, [field]: value }), educator), field));
  });

  it("import: empty, binary, markup or malformed files are refused with a message, nothing imported", async () => {
    const bad = fc.oneof(
      fc.record({ text: fc.constant(""), name: fc.constant("items.csv") }),
      fc.record({ text: hostile, name: fc.constantFrom("items.csv", "items.json") }),
      fc.record({ text: fc.constantFrom("{nope", "[1,2,3]", '{"items": "x"}', "\u0000\u0001\u0002"), name: fc.constantFrom("items.json", "items.bin", "<script>.csv") }),
    );
    await refusedWithoutChange(
      bad,
      async ({ text, name }) => {
        const answer = await act(bankImport.action, multipart("/bank/import", { intent: "check" }, { file: new File([text], name, { type: "text/plain" }) }), educator);
        // A file that parses but has no valid row is "checked" with its errors listed (200) — never a 500.
        expect(answer.status).toBeLessThan(500);
        const body = answer.body as { message?: string; valid?: number; errors?: unknown[] };
        if (answer.status === 200) expect(body.valid === 0 && (body.errors?.length ?? 0) > 0, JSON.stringify(body).slice(0, 300)).toBe(true);
        else expect((body.message ?? "").length).toBeGreaterThan(10);
      },
      { numRuns: 15 },
    );
  });

  it("exam authoring: titles, time limits, pass marks, attempts and dates", async () => {
    const exam = { title: "Hostile input exam", "topics.cycle-variables": "1", passMarkPercent: "80", attemptsAllowed: "2", timeLimitMinutes: "30", reviewPolicy: "score-and-topics", multipleResponseScoring: "all-or-nothing", orderingScoring: "exact" };
    const bad = fc.oneof(
      fc.record({ field: fc.constant("title"), value: fc.oneof(blank, overLong(200)) }),
      fc.record({ field: fc.constant("timeLimitMinutes"), value: fc.oneof(badNumber, fc.constantFrom("0", "481", "2.5")) }),
      fc.record({ field: fc.constant("passMarkPercent"), value: fc.constantFrom("0", "101", "abc", "", "1e999") }),
      fc.record({ field: fc.constant("attemptsAllowed"), value: fc.constantFrom("0", "11", "1.5", "two", "") }),
      fc.record({ field: fc.constant("availableFrom"), value: impossibleDate }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) => expectFieldRefusal(await act(examNew.action, postForm("/bank/exams/new", { ...exam, [field]: value }), educator), field));
  });
});

// ── Exams, check-offs, accommodations ───────────────────────────────────────────────────────

describe("taking an exam, check-offs and accommodations refuse invalid input", () => {
  it("answer saves: positions and answers that are not numbers, not JSON or not an answer's shape answer 4xx with a message", async () => {
    const [exam] = await db.db.select().from(exams).where(eq(exams.orgId, therapist.org.id));
    const started = await startAttempt({ orgId: therapist.org.id, personId: therapist.person.id, timeZone: therapist.org.timeZone }, exam.id, "one", new Date(), 7);
    if (!started.ok) throw new Error(started.message);
    const attemptId = started.attemptId;
    const bad = fc.oneof(
      fc.record({ position: fc.oneof(badNumber, fc.constantFrom("-1", "")), answer: fc.constant('{"kind":"single","choice":0}') }),
      fc.record({ position: fc.constant("0"), answer: fc.oneof(hostile, fc.constantFrom("{nope", "[]", '{"kind":"single","choice":"a"}', '{"kind":"numeric","text":1}', '{"kind":"single","choice":0,"extra":1}')) }),
      fc.record({ position: fc.constant("0"), answer: fc.integer({ min: 61, max: 200 }).map((n) => JSON.stringify({ kind: "numeric", text: "9".repeat(n) })) }),
      fc.record({ position: fc.constant("0"), answer: overLong(2000) }),
    );
    await refusedWithoutChange(bad, async (fields) => {
      const answer = await act(answers.action, postForm(`/exams/attempts/${attemptId}/answers`, fields), therapist, { attemptId });
      expect(answer.status, JSON.stringify(answer.body)).toBeGreaterThanOrEqual(400);
      expect(answer.status).toBeLessThan(500);
      const body = answer.body as { ok: boolean; message: string };
      expect(body.ok).toBe(false);
      expect(body.message.length).toBeGreaterThan(10);
    });
  });

  it("check-off marks and sign-off: bad steps, over-long comments and PINs that are not 6–12 digits", async () => {
    await givePin(preceptor, PINS.preceptor);
    const { id } = await requested(therapist);
    const path = `/checkoffs/${id}`;
    const badMark = fc.oneof(
      fc.record({ stepIndex: fc.oneof(badNumber, fc.constantFrom("-1", "", " ", "1.5")), result: fc.constant("met"), comment: fc.constant("") }),
      fc.record({ stepIndex: fc.constant("0"), result: fc.oneof(hostile, fc.constant("passed")), comment: fc.constant("") }),
      fc.record({ stepIndex: fc.constant("0"), result: fc.constant("met"), comment: overLong(2000) }),
    );
    await refusedWithoutChange(badMark, async (fields) => {
      const answer = await act(checkoffRoute.action, postForm(path, { intent: "mark-step", ...fields }), preceptor, { checkoffId: id });
      expect(answer.status, JSON.stringify(answer.body)).toBeGreaterThanOrEqual(400);
      expect(answer.status).toBeLessThan(500);
      const body = answer.body as { message?: string; error?: Record<string, string[]> };
      expect((body.message ?? Object.values(body.error ?? {}).flat().join(" ")).length).toBeGreaterThan(10);
    });
    const badPin = fc.oneof(fc.stringMatching(/^\d{0,5}$/), fc.stringMatching(/^\d{13,16}$/), hostile, fc.constantFrom("12345a", "١٢٣٤٥٦"));
    await refusedWithoutChange(badPin, async (pin) => expectFieldRefusal(await act(checkoffRoute.action, postForm(path, { intent: "sign", pin }), preceptor, { checkoffId: id }), "pin"));
  });

  it("accommodations: reasons, multipliers outside 1.1–10 and end dates that do not exist or are past", async () => {
    const base = { intent: "grant-accommodation", personId: therapist.person.id, kind: "multiplier", multiplier: "1.5", reason: "Documented need for extra time" };
    const bad = fc.oneof(
      fc.record({ field: fc.constant("reason"), value: fc.oneof(blank, fc.constant("abc"), overLong(500)) }),
      fc.record({ field: fc.constant("multiplier"), value: fc.oneof(badNumber, fc.constantFrom("1", "1.09", "10.01", "0", "-2")) }),
      fc.record({ field: fc.constant("endsOn"), value: fc.oneof(impossibleDate, fc.constant("2020-01-01")) }),
      fc.record({ field: fc.constant("kind"), value: hostile }),
    );
    await refusedWithoutChange(bad, async ({ field, value }) => expectFieldRefusal(await act(accommodations.action, postForm("/team/accommodations", { ...base, [field]: value }), educator), field));
  });
});

it("the seeded organisation still has its units (the fingerprint compares real rows)", async () => {
  expect((await db.db.select().from(units).where(eq(units.orgId, admin.org.id))).length).toBeGreaterThan(0);
  expect(manager.roles).toContain("manager");
});
