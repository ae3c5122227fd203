/**
 * Hostile input, part 1 (issue 11, item 4): fast-check properties over every zod schema the
 * app's forms, address bars and JSON API parse with.
 *
 * Coverage is enforced by ENUMERATION, not by a hand-kept list alone: the first test walks
 * app/ for every non-`.server`, non-test `.ts` module that imports zod, imports it, and collects
 * every exported zod schema (any value carrying zod's `_zod` internals), every exported schema
 * factory (a function whose name ends in `Schema`) and every zod schema inside an exported plain
 * object (MATRIX_FILTER_FIELDS). Each one must have an entry in COVERAGE below, so a schema added
 * to a form or API module fails this file until someone writes its properties. Schemas declared
 * inside route modules (`.tsx`) and not exported (the exam start's layout, the Bench page's
 * search) cannot be enumerated; the actions file drives those routes.
 *
 * For each input schema: valid input parses and round-trips (what was given is what comes out,
 * modulo the documented normalisation: trimming, e-mail lower-casing, unit codes upper-cased,
 * "" meaning none); invalid input (wrong types, out-of-range numbers, impossible dates such as
 * 2026-02-30, over-long text, blank required fields) fails with an issue on that field's path
 * and, for a field a person types or chooses, a message in words (not zod's default "Invalid
 * input: …" / "Too small: …" wording). Output-only API schemas (response shapes) are checked to
 * be registered for the OpenAPI document instead: nothing parses user input with them.
 *
 * Date validity: the Gregorian calendar (ISO 8601-1:2019 §4.2.1, leap years every 4th year except
 * centuries not divisible by 400); the days in each month are computed here with JavaScript's
 * Date.UTC (ECMA-262 §21.4.3.4), independently of the app's own calendar code.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { API_SCHEMAS } from "~/api/schemas";
import { HOSTILE_STRINGS } from "../fixtures/hostile-strings";

const RUNS = { numRuns: 40 };
const ROOT = path.resolve(__dirname, "../..");

// ── Enumerating the app's schema modules ────────────────────────────────────────────────────

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    return statSync(full).isDirectory() ? walk(full) : [full];
  });
}

const SCHEMA_MODULES = walk(path.join(ROOT, "app"))
  .filter((f) => f.endsWith(".ts") && !f.endsWith(".server.ts") && !f.endsWith(".test.ts") && !f.endsWith(".d.ts"))
  .filter((f) => /from "zod"/.test(readFileSync(f, "utf8")))
  .map((f) => path.relative(ROOT, f).split(path.sep).join("/"))
  .sort();

const isZod = (v: unknown): v is z.ZodType => !!v && typeof v === "object" && "_zod" in v;

async function exportedSchemas(): Promise<string[]> {
  const found: string[] = [];
  for (const file of SCHEMA_MODULES) {
    const mod = (await import(/* @vite-ignore */ path.join(ROOT, file))) as Record<string, unknown>;
    for (const [name, value] of Object.entries(mod)) {
      if (isZod(value)) found.push(`${file}#${name}`);
      else if (typeof value === "function" && /Schema$/.test(name)) found.push(`${file}#${name}`);
      else if (value && typeof value === "object" && !Array.isArray(value)) {
        for (const [inner, v] of Object.entries(value)) if (isZod(v)) found.push(`${file}#${name}.${inner}`);
      }
    }
  }
  return found.sort();
}

// ── Arbitraries ─────────────────────────────────────────────────────────────────────────────

const iso = (y: number, m: number, d: number) => `${String(y).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
const daysIn = (y: number, m: number) => new Date(Date.UTC(y, m, 0)).getUTCDate();

/** Real calendar dates 1900–2100, including 29 February of leap years. */
const validDate = fc
  .record({ y: fc.integer({ min: 1900, max: 2100 }), m: fc.integer({ min: 1, max: 12 }), d: fc.integer({ min: 1, max: 31 }) })
  .map(({ y, m, d }) => iso(y, m, Math.min(d, daysIn(y, m))));
const dateFrom = (min: string) => validDate.filter((d) => d >= min);

/** Dates that do not exist or are not YYYY-MM-DD: 2026-02-30, 2025-02-29, month 13, day 0, other formats. */
const impossibleDate = fc.oneof(
  fc
    .record({ y: fc.integer({ min: 1900, max: 2100 }), m: fc.constantFrom(2, 4, 6, 9, 11) })
    .chain(({ y, m }) => fc.integer({ min: daysIn(y, m) + 1, max: 31 }).map((d) => iso(y, m, d))),
  fc.record({ y: fc.integer({ min: 1900, max: 2100 }), m: fc.constantFrom(0, 13, 14, 99), d: fc.integer({ min: 1, max: 28 }) }).map(({ y, m, d }) => iso(y, m, d)),
  fc.record({ y: fc.integer({ min: 1900, max: 2100 }), m: fc.integer({ min: 1, max: 12 }) }).map(({ y, m }) => iso(y, m, 0)),
  fc.constantFrom("2026-02-30", "2025-02-29", "2100-02-29", "2026-04-31", "2026-1-5", "12/03/2026", "2026-02-3O", "20260212", "2026-02-12T00:00", "tomorrow", "'; DROP TABLE x; --"),
);

/** Any text: arbitrary code units (lone surrogates included), graphemes, and the hostile corpus. */
const anyText = (maxLength: number) =>
  fc.oneof(
    fc.string({ unit: "binary", maxLength }),
    fc.string({ unit: "grapheme", maxLength: Math.max(1, Math.floor(maxLength / 4)) }),
    fc.constantFrom(...HOSTILE_STRINGS.map((h) => h.value)),
  );
/**
 * zod 4.6 counts a string's length in code points, not UTF-16 units (its checks.js: "A code point
 * is one or two UTF-16 units"), so an emoji counts once against a field's limit; a lone surrogate
 * counts as one code point too.
 */
const codePoints = (s: string) => [...s].length;
const textWithin = (min: number, max: number, trim = true) =>
  anyText(Math.min(max, 300)).filter((s) => {
    const n = codePoints(trim ? s.trim() : s);
    return n >= min && n <= max;
  });
/** Text longer than `max` code points after trimming. */
const tooLong = (max: number) =>
  fc.record({ n: fc.integer({ min: max + 1, max: max + 50 }), c: fc.constantFrom("a", "é", "\u05D0", "<", "'", "\u{1F469}") }).map(({ n, c }) => c.repeat(n));
const blank = fc.constantFrom("", " ", "\t\n ", "\u00A0", "\u3000 ");
const notOneOf = (values: readonly string[]) => anyText(30).filter((s) => !values.includes(s));
/** Wrong JavaScript types for a field that expects text. */
const notText = fc.oneof(fc.integer(), fc.boolean(), fc.constant(null), fc.array(fc.string(), { maxLength: 2 }), fc.object({ maxDepth: 1 }));

// ── Assertions ──────────────────────────────────────────────────────────────────────────────

type Result = z.ZodSafeParseResult<unknown>;
const parse = (schema: z.ZodType, input: unknown): Promise<Result> => schema.safeParseAsync(input);

/** zod's own English defaults; a field a person fills in must say more than these. */
const ZOD_DEFAULT = /^(Invalid input|Too small|Too big|Invalid option|Invalid string|Invalid)\b/;
function issueAt(result: Result, field: string) {
  if (result.success) return undefined;
  return result.error.issues.find((i) => i.path.map(String).join(".") === field);
}
function expectFieldError(result: Result, field: string, human = true) {
  expect(result.success, `expected a refusal on ${field}`).toBe(false);
  const issue = issueAt(result, field);
  expect(issue, `no issue on "${field}": ${JSON.stringify(result.success ? null : result.error.issues.map((i) => [i.path.join("."), i.message]))}`).toBeDefined();
  expect(issue!.message.length).toBeGreaterThan(3);
  if (human) expect(issue!.message, `message on ${field}`).not.toMatch(ZOD_DEFAULT);
}
function expectOk(result: Result): Record<string, unknown> {
  expect(result.success, result.success ? "" : JSON.stringify(result.error.issues.map((i) => [i.path.join("."), i.message]))).toBe(true);
  return (result as { data: Record<string, unknown> }).data;
}

type Spec =
  | { kind: "text"; field: string; min: number; max: number; trim?: boolean; out?: (given: string) => unknown; human?: boolean; optional?: boolean }
  | { kind: "date"; field: string; optional?: boolean; min?: string }
  | { kind: "enum"; field: string; values: readonly string[]; human?: boolean }
  | { kind: "int"; field: string; min: number; max: number; coerce?: boolean; human?: boolean };

/** The properties of one field of a flat form schema, every other field held at `base`. */
async function checkField(schema: z.ZodType, base: Record<string, unknown>, spec: Spec) {
  const at = (v: unknown) => ({ ...base, [spec.field]: v });
  const without = () => Object.fromEntries(Object.entries(base).filter(([k]) => k !== spec.field));
  switch (spec.kind) {
    case "text": {
      const trim = spec.trim ?? true;
      const out = spec.out ?? ((s: string) => s);
      await fc.assert(
        fc.asyncProperty(textWithin(spec.min, spec.max, trim), async (s) => {
          const data = expectOk(await parse(schema, at(s)));
          expect(data[spec.field]).toEqual(out(trim ? s.trim() : s));
        }),
        RUNS,
      );
      await fc.assert(fc.asyncProperty(tooLong(spec.max), async (s) => expectFieldError(await parse(schema, at(s)), spec.field, spec.human)), RUNS);
      await fc.assert(fc.asyncProperty(notText, async (v) => expectFieldError(await parse(schema, at(v)), spec.field, false)), { numRuns: 10 });
      if (spec.min > 0) {
        await fc.assert(fc.asyncProperty(blank.filter((b) => trim || b === ""), async (b) => expectFieldError(await parse(schema, at(b)), spec.field, spec.human)), { numRuns: 10 });
        if (!spec.optional) expectFieldError(await parse(schema, without()), spec.field, false);
      }
      return;
    }
    case "date": {
      const valid = spec.min ? dateFrom(spec.min) : validDate;
      await fc.assert(fc.asyncProperty(valid, async (d) => void expect(expectOk(await parse(schema, at(d)))[spec.field]).toBe(d)), RUNS);
      await fc.assert(fc.asyncProperty(impossibleDate, async (d) => expectFieldError(await parse(schema, at(d)), spec.field)), RUNS);
      if (!spec.optional) expectFieldError(await parse(schema, without()), spec.field, false);
      return;
    }
    case "enum": {
      for (const v of spec.values) expect(expectOk(await parse(schema, at(v)))[spec.field]).toBe(v);
      await fc.assert(fc.asyncProperty(notOneOf(spec.values), async (s) => expectFieldError(await parse(schema, at(s)), spec.field, spec.human ?? true)), RUNS);
      return;
    }
    case "int": {
      const give = (n: number) => (spec.coerce ? String(n) : n);
      await fc.assert(fc.asyncProperty(fc.integer({ min: spec.min, max: spec.max }), async (n) => void expect(expectOk(await parse(schema, at(give(n))))[spec.field]).toBe(n)), RUNS);
      const below = fc.integer({ min: -1e9, max: spec.min - 1 });
      const outside = fc.oneof(below, fc.integer({ min: spec.max + 1, max: spec.max + 1e9 }));
      await fc.assert(fc.asyncProperty(outside, async (n) => expectFieldError(await parse(schema, at(give(n))), spec.field, spec.human ?? true)), RUNS);
      const fraction = fc.integer({ min: spec.min, max: spec.max - 1 }).map((n) => n + 0.5);
      await fc.assert(fc.asyncProperty(fraction, async (n) => expectFieldError(await parse(schema, at(give(n))), spec.field, spec.human ?? true)), RUNS);
      const junk = spec.coerce ? fc.constantFrom("abc", "1,5", "NaN", "1e999", "--1") : fc.constantFrom("7", null, true, Number.NaN, Number.POSITIVE_INFINITY);
      await fc.assert(fc.asyncProperty(junk, async (v) => expectFieldError(await parse(schema, at(v)), spec.field, false)), { numRuns: 5 });
      return;
    }
  }
}

async function checkForm(schema: z.ZodType, base: Record<string, unknown>, specs: Spec[]) {
  expectOk(await parse(schema, base));
  for (const spec of specs) await checkField(schema, base, spec);
}

/** A lenient address-bar schema: anything at all parses, to values inside the allowed set. */
async function checkLenient(schema: z.ZodType, keys: string[], inside: (out: Record<string, unknown>) => void) {
  await fc.assert(
    fc.asyncProperty(fc.record(Object.fromEntries(keys.map((k) => [k, fc.oneof(anyText(300), fc.constant(undefined), fc.integer().map(String))]))), async (input) => {
      inside(expectOk(await parse(schema, input)));
    }),
    RUNS,
  );
}

/** Output-only: a response shape for the OpenAPI document, never used to parse what a person sends. */
function checkOutputOnly(schema: z.ZodType) {
  expect(API_SCHEMAS.get(schema)?.id, "an output-only schema must be registered for the OpenAPI document").toBeTruthy();
}

// ── The coverage table ──────────────────────────────────────────────────────────────────────

type Mod = Record<string, unknown>;
const load = (file: string): Promise<Mod> => import(/* @vite-ignore */ path.join(ROOT, file));
const get = async (file: string, name: string) => (await load(file))[name] as z.ZodType;
const make = async <A extends unknown[]>(file: string, name: string, ...a: A) => ((await load(file))[name] as (...a: A) => z.ZodType)(...a);

const TODAY = "2026-12-02";
const ROLES = ["therapist", "preceptor", "educator", "manager", "admin"] as const;
const PERSON_BASE = { name: "Ana Reyes", email: "ana@kestrelvalley.test", hireDate: "2024-03-12" };

const COVERAGE: Record<string, () => Promise<void>> = {
  // ── Admin ──
  "app/routes/admin/schemas.ts#createOrganisationSchema": async () => {
    const zones = ["America/Chicago", "Europe/London", "Pacific/Auckland"];
    const s = await make("app/routes/admin/schemas.ts", "createOrganisationSchema", zones);
    await checkForm(s, { name: "Kestrel Valley", timeZone: "America/Chicago" }, [
      { kind: "text", field: "name", min: 1, max: 120 },
      { kind: "text", field: "educationLeadName", min: 0, max: 120, out: (v) => v || null },
      { kind: "enum", field: "timeZone", values: zones },
    ]);
    await fc.assert(fc.asyncProperty(fc.constantFrom("not-an-address", "a@", "@b.test", "<script>@x.test"), async (e) => expectFieldError(await parse(s, { name: "K", timeZone: zones[0], contactEmail: e }), "contactEmail")), RUNS);
    expect(expectOk(await parse(s, { name: "K", timeZone: zones[0], contactEmail: "  Edu@Hospital.ORG " })).contactEmail).toBe("edu@hospital.org");
  },
  "app/routes/admin/schemas.ts#createUnitSchema": async () => {
    const s = await make("app/routes/admin/schemas.ts", "createUnitSchema");
    await checkForm(s, { name: "Adult ICU", code: "AICU" }, [{ kind: "text", field: "name", min: 1, max: 60 }]);
    const code = fc.stringMatching(/^[a-zA-Z0-9-]{1,12}$/);
    await fc.assert(fc.asyncProperty(code, async (c) => void expect(expectOk(await parse(s, { name: "U", code: ` ${c} ` })).code).toBe(c.toUpperCase())), RUNS);
    await fc.assert(fc.asyncProperty(fc.constantFrom("A ICU", "<b>", "ICU;", "'--", "É", "\u202EICU", "ABCDEFGHIJKLM"), async (c) => expectFieldError(await parse(s, { name: "U", code: c }), "code")), RUNS);
  },
  "app/routes/admin/schemas.ts#createPersonSchema": async () => {
    const s = await make("app/routes/admin/schemas.ts", "createPersonSchema");
    await checkPerson(s, PERSON_BASE);
  },
  "app/routes/admin/schemas.ts#createNewPersonSchema": async () => {
    const s = await make("app/routes/admin/schemas.ts", "createNewPersonSchema");
    await checkPerson(s, PERSON_BASE);
    await checkForm(s, { ...PERSON_BASE, firstRole: "therapist" }, [{ kind: "enum", field: "firstRole", values: ["therapist", "preceptor", "educator", "manager"] }]);
  },
  "app/routes/admin/schemas.ts#RoleSchema": async () => checkForm(await get("app/routes/admin/schemas.ts", "RoleSchema"), { role: "therapist" }, [{ kind: "enum", field: "role", values: ROLES }]),
  "app/routes/admin/schemas.ts#ManagedUnitSchema": async () => {
    const s = await get("app/routes/admin/schemas.ts", "ManagedUnitSchema");
    await fc.assert(fc.asyncProperty(textWithin(1, 100, false), async (id) => void expect(expectOk(await parse(s, { unitId: id })).unitId).toBe(id)), RUNS);
    expectFieldError(await parse(s, { unitId: "" }), "unitId");
    expectFieldError(await parse(s, {}), "unitId");
  },
  "app/routes/admin/schemas.ts#ConfirmSchema": async () => checkForm(await get("app/routes/admin/schemas.ts", "ConfirmSchema"), { confirm: "yes" }, [{ kind: "enum", field: "confirm", values: ["yes"] }]),
  "app/routes/admin/schemas.ts#PeopleFilterSchema": async () =>
    checkLenient(await get("app/routes/admin/schemas.ts", "PeopleFilterSchema"), ["q", "unit", "role", "status", "page"], (o) => {
      expect((o.q as string).length).toBeLessThanOrEqual(100);
      expect(["", ...ROLES]).toContain(o.role);
      expect(["active", "inactive", "all"]).toContain(o.status);
      expect(Number.isInteger(o.page) && (o.page as number) >= 1 && (o.page as number) <= 10_000).toBe(true);
    }),
  "app/routes/admin/reference-schema.ts#referenceSchema": async () =>
    checkForm(await get("app/routes/admin/reference-schema.ts", "referenceSchema"), { referenceId: "r1", code: "PC.01.02.03", title: "Competence" }, [
      { kind: "text", field: "code", min: 1, max: 80 },
      { kind: "text", field: "title", min: 1, max: 200 },
      { kind: "text", field: "body", min: 0, max: 4000 },
      { kind: "date", field: "lastVerifiedOn", optional: true },
    ]),
  "app/routes/admin/reminder-policy-schema.ts#reminderPolicySchema": async () => {
    const s = await get("app/routes/admin/reminder-policy-schema.ts", "reminderPolicySchema");
    const days = fc.uniqueArray(fc.integer({ min: 1, max: 365 }), { minLength: 1, maxLength: 10 });
    await fc.assert(
      fc.asyncProperty(days, fc.constantFrom(", ", ",", " ", "; "), async (list, sep) => {
        const out = expectOk(await parse(s, { daysBefore: list.join(sep), onTheDay: "on" }));
        expect(out.daysBefore).toEqual([...list].sort((a, b) => b - a));
        expect(out.onTheDay).toBe(true);
        expect(out.weeklyWhileLapsed).toBe(false);
      }),
      RUNS,
    );
    const bad = fc.oneof(
      fc.integer({ min: 366, max: 1e6 }).map(String),
      fc.constantFrom("0", "-5", "1.5", "thirty", "30, 30", "=1+1", "<script>", "1e3"),
      fc.uniqueArray(fc.integer({ min: 1, max: 365 }), { minLength: 11, maxLength: 15 }).map((l) => l.join(", ")),
    );
    await fc.assert(fc.asyncProperty(bad, async (v) => expectFieldError(await parse(s, { daysBefore: v }), "daysBefore")), RUNS);
    expectFieldError(await parse(s, {}), "daysBefore");
    await fc.assert(fc.asyncProperty(fc.integer({ min: 25, max: 1000 }).map(String), async (v) => expectFieldError(await parse(s, { daysBefore: "30", boardMonthsBefore: v }), "boardMonthsBefore")), RUNS);
  },
  "app/routes/admin/reminder-policy-schema.ts#reminderDeliverySchema": async () =>
    checkForm(await get("app/routes/admin/reminder-policy-schema.ts", "reminderDeliverySchema"), { delivery: "each" }, [{ kind: "enum", field: "delivery", values: ["each", "digest"] }]),
  "app/api/token-form.ts#createTokenSchema": async () => {
    const s = await get("app/api/token-form.ts", "createTokenSchema");
    const base = { intent: "create-token", name: "Staffing system", scopes: ["read"] };
    await checkForm(s, base, [
      { kind: "text", field: "name", min: 2, max: 80 },
      { kind: "date", field: "expiresOn", optional: true },
    ]);
    expectFieldError(await parse(s, { ...base, scopes: [] }), "scopes");
    await fc.assert(fc.asyncProperty(notOneOf(["read", "write"]), async (sc) => expectFieldError(await parse(s, { ...base, scopes: [sc] }), "scopes.0", false)), RUNS);
  },
  "app/api/token-form.ts#revokeTokenSchema": async () =>
    checkForm(await get("app/api/token-form.ts", "revokeTokenSchema"), { intent: "revoke-token", tokenId: "t1", confirm: "yes" }, [{ kind: "enum", field: "confirm", values: ["yes"] }]),

  // ── Sign-in ──
  "app/routes/auth/schemas.ts#EmailSchema": async () => {
    const s = await get("app/routes/auth/schemas.ts", "EmailSchema");
    await fc.assert(fc.asyncProperty(fc.emailAddress().filter((e) => e.length <= 254 && z.email().safeParse(e).success), async (e) => void expect(expectOk(await parse(s, { email: ` ${e} ` })).email).toBe(e)), RUNS);
    const bad = fc.oneof(blank, tooLong(254).map((s) => `${s}@x.test`), fc.constantFrom("ana", "ana@", "@x.test", "<script>alert(1)</script>", "'; DROP TABLE people; --", "ana@x.test\u202E", "a b@x.test"));
    await fc.assert(fc.asyncProperty(bad, async (e) => expectFieldError(await parse(s, { email: e }), "email")), RUNS);
    expectFieldError(await parse(s, {}), "email");
  },
  "app/routes/auth/schemas.ts#CodeSchema": async () => {
    const s = await get("app/routes/auth/schemas.ts", "CodeSchema");
    await fc.assert(fc.asyncProperty(fc.stringMatching(/^\d{6}$/), async (c) => void expect(expectOk(await parse(s, { code: ` ${c.slice(0, 3)} ${c.slice(3)} ` })).code).toBe(c)), RUNS);
    const bad = fc.oneof(fc.stringMatching(/^\d{1,5}$/), fc.stringMatching(/^\d{7,12}$/), fc.constantFrom("abcdef", "12345x", "١٢٣٤٥٦", "<b>1</b>"));
    await fc.assert(fc.asyncProperty(bad, async (c) => expectFieldError(await parse(s, { code: c }), "code")), RUNS);
  },

  // ── Check-offs ──
  "app/routes/checkoffs/schemas.ts#markStepSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "markStepSchema");
    // The action parses raw form data: a blank step must be refused, not read as step 0 (Number("") is 0).
    for (const blankStep of ["", " ", "\t"]) expectFieldError(await parse(s, { stepIndex: blankStep, result: "met" }), "stepIndex");
    await checkForm(await get("app/routes/checkoffs/schemas.ts", "markStepSchema"), { stepIndex: "0", result: "met" }, [
      // Typed as digits (a blank field is not step 0); a step beyond the checklist is refused by the action.
      { kind: "int", field: "stepIndex", min: 0, max: 9999, coerce: true },
      { kind: "enum", field: "result", values: ["met", "not-met", "not-applicable"] },
      { kind: "text", field: "comment", min: 0, max: 2000 },
    ]);
  },
  "app/routes/checkoffs/schemas.ts#outcomeSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "outcomeSchema");
    await checkForm(s, { outcome: "needs-practice", practicePlan: "Practise circuit change.", practiceBy: "2026-12-20" }, [
      { kind: "enum", field: "outcome", values: ["competent", "needs-practice"] },
      { kind: "text", field: "practicePlan", min: 1, max: 2000, optional: true },
      { kind: "date", field: "practiceBy", optional: true },
    ]);
    expectFieldError(await parse(s, { outcome: "needs-practice" }), "practicePlan");
    expectFieldError(await parse(s, { outcome: "needs-practice" }), "practiceBy");
  },
  "app/routes/checkoffs/schemas.ts#signSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "signSchema");
    await checkPin(s, {}, "pin");
    await fc.assert(fc.asyncProperty(fc.constantFrom("x", "a@", "<script>@x", "'; --"), async (e) => expectFieldError(await parse(s, { pin: "123456", email: e }), "email")), RUNS);
  },
  "app/routes/checkoffs/schemas.ts#addendumSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "addendumSchema");
    await checkForm(s, { text: "Correction: the cuff was checked.", pin: "123456" }, [{ kind: "text", field: "text", min: 1, max: 4000 }]);
    await checkPin(s, { text: "Correction" }, "pin");
  },
  "app/routes/checkoffs/schemas.ts#setPinSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "setPinSchema");
    await fc.assert(fc.asyncProperty(fc.stringMatching(/^\d{6,12}$/), async (p) => void expect(expectOk(await parse(s, { pin: p, confirm: p })).pin).toBe(p)), RUNS);
    await fc.assert(fc.asyncProperty(fc.stringMatching(/^\d{6,12}$/), fc.stringMatching(/^\d{6,12}$/), async (p, q) => {
      fc.pre(p !== q);
      expectFieldError(await parse(s, { pin: p, confirm: q }), "confirm");
    }), RUNS);
    await fc.assert(fc.asyncProperty(badPin, async (p) => expectFieldError(await parse(s, { pin: p, confirm: p }), "pin")), RUNS);
  },
  "app/routes/checkoffs/schemas.ts#requestSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "requestSchema");
    expectOk(await parse(s, { checklistId: "c1" }));
    expectFieldError(await parse(s, { checklistId: "" }), "checklistId");
    expectFieldError(await parse(s, {}), "checklistId");
  },
  "app/routes/checkoffs/schemas.ts#startForSchema": async () => {
    const s = await get("app/routes/checkoffs/schemas.ts", "startForSchema");
    expectOk(await parse(s, { personId: "p", checklistId: "c" }));
    expectFieldError(await parse(s, { checklistId: "c" }), "personId");
    expectFieldError(await parse(s, { personId: "p", checklistId: "" }), "checklistId");
  },
  "app/routes/checkoffs/schemas.ts#checklistSchema": async () => {
    const mod = await load("app/routes/checkoffs/schemas.ts");
    const s = mod.checklistSchema as z.ZodType;
    const { METHODS } = await import("~/domain/checkoffs/methods");
    await checkForm(s, { title: "Circuit change", skill: "Circuit change", method: METHODS[0], steps: "Wash hands\n! Check the circuit" }, [
      { kind: "text", field: "title", min: 3, max: 200 },
      { kind: "text", field: "skill", min: 2, max: 120 },
      { kind: "enum", field: "method", values: METHODS },
      { kind: "text", field: "references", min: 0, max: 4000 },
    ]);
    const step = textWithin(1, 500).filter((t) => !/[\r\n]/.test(t) && !t.trim().startsWith("!") && t.trim().length > 0);
    await fc.assert(
      fc.asyncProperty(fc.array(fc.record({ text: step, critical: fc.boolean() }), { minLength: 1, maxLength: 60 }), async (steps) => {
        const typed = steps.map((x) => ({ text: x.text.trim(), critical: x.critical }));
        const out = expectOk(await parse(s, { title: "T t t", skill: "Sk", method: METHODS[0], steps: (mod.stepLines as (x: typeof typed) => string)(typed) }));
        expect((mod.parseStepLines as (t: string) => unknown)(out.steps as string)).toEqual(typed);
      }),
      { numRuns: 25 },
    );
    const badSteps = fc.oneof(blank, fc.constant(Array.from({ length: 61 }, (_, i) => `Step ${i}`).join("\n")), tooLong(500), fc.constant("!"));
    await fc.assert(fc.asyncProperty(badSteps, async (v) => expectFieldError(await parse(s, { title: "T t t", skill: "Sk", method: METHODS[0], steps: v }), "steps")), RUNS);
  },

  // ── Credentials and certificates ──
  "app/routes/credentials/schemas.ts#recordCredentialSchema": async () => {
    const s = await get("app/routes/credentials/schemas.ts", "recordCredentialSchema");
    const base = { intent: "record-credential", personId: "p", credentialTypeId: "t", issuedOn: "2026-03-12" };
    await checkForm(s, base, [
      { kind: "text", field: "number", min: 0, max: 60, out: (v) => v || null },
      { kind: "text", field: "issuer", min: 0, max: 120, out: (v) => v || null },
      { kind: "date", field: "issuedOn" },
      { kind: "date", field: "validThrough", optional: true, min: "2026-03-12" },
    ]);
    await fc.assert(
      fc.asyncProperty(validDate, validDate, async (a, b) => {
        fc.pre(b < a);
        expectFieldError(await parse(s, { ...base, issuedOn: a, validThrough: b }), "validThrough");
      }),
      RUNS,
    );
    expectFieldError(await parse(s, { ...base, credentialTypeId: "" }), "credentialTypeId");
  },
  "app/routes/credentials/schemas.ts#verifyCredentialSchema": async () =>
    checkForm(await get("app/routes/credentials/schemas.ts", "verifyCredentialSchema"), { intent: "verify-credential", credentialId: "c", method: "Online lookup" }, [
      { kind: "text", field: "method", min: 3, max: 200, human: false },
    ]),
  "app/routes/credentials/certificate-schemas.ts#revokeCertificateSchema": async () =>
    checkForm(await get("app/routes/credentials/certificate-schemas.ts", "revokeCertificateSchema"), { reason: "Issued in error", confirm: "yes" }, [
      { kind: "text", field: "reason", min: 1, max: 500 },
      { kind: "enum", field: "confirm", values: ["yes"] },
    ]),

  // ── Team ──
  "app/routes/team/accommodation-schema.ts#grantAccommodationSchema": async () => {
    const s = await make("app/routes/team/accommodation-schema.ts", "grantAccommodationSchema", TODAY);
    const base = { intent: "grant-accommodation", personId: "p", kind: "multiplier", multiplier: 1.5, reason: "Documented need for extra time" };
    await checkForm(s, base, [
      { kind: "text", field: "reason", min: 5, max: 500 },
      { kind: "date", field: "endsOn", optional: true, min: TODAY },
    ]);
    await fc.assert(fc.asyncProperty(fc.double({ min: 1.1, max: 10, noNaN: true }), async (m) => void expect(expectOk(await parse(s, { ...base, multiplier: m })).multiplier).toBe(m)), RUNS);
    const badMultiplier = fc.oneof(fc.double({ min: -1e6, max: 1.0999, noNaN: true }), fc.double({ min: 10.0001, max: 1e9, noNaN: true }), fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY, "1.5", null));
    await fc.assert(fc.asyncProperty(badMultiplier, async (m) => expectFieldError(await parse(s, { ...base, multiplier: m }), "multiplier", typeof m === "number" && Number.isFinite(m))), RUNS);
    await fc.assert(fc.asyncProperty(validDate.filter((d) => d < TODAY), async (d) => expectFieldError(await parse(s, { ...base, endsOn: d }), "endsOn")), RUNS);
    expect(expectOk(await parse(s, { ...base, kind: "untimed", multiplier: "junk" })).multiplier).toBeNull();
    await fc.assert(fc.asyncProperty(notOneOf(["multiplier", "untimed"]), async (k) => expectFieldError(await parse(s, { ...base, kind: k }), "kind")), RUNS);
  },
  "app/routes/team/accommodation-schema.ts#revokeAccommodationSchema": async () =>
    checkForm(await get("app/routes/team/accommodation-schema.ts", "revokeAccommodationSchema"), { intent: "revoke-accommodation", accommodationId: "a", confirm: "yes" }, [
      { kind: "enum", field: "confirm", values: ["yes"] },
    ]),
  "app/routes/team/cell-schemas.ts#waiverSchema": async () => {
    const s = await make("app/routes/team/cell-schemas.ts", "waiverSchema", TODAY);
    await checkForm(s, { intent: "grant-waiver", reason: "On leave", endsOn: TODAY }, [
      { kind: "text", field: "reason", min: 3, max: 500 },
      { kind: "date", field: "endsOn", min: TODAY },
    ]);
    await fc.assert(fc.asyncProperty(validDate.filter((d) => d < TODAY), async (d) => expectFieldError(await parse(s, { intent: "grant-waiver", reason: "On leave", endsOn: d }), "endsOn")), RUNS);
  },
  "app/routes/team/cell-schemas.ts#extensionSchema": async () => {
    const due = "2027-01-31";
    const s = await make("app/routes/team/cell-schemas.ts", "extensionSchema", TODAY, due);
    await checkForm(s, { intent: "grant-extension", reason: "Course full", newDueOn: "2027-02-28" }, [
      { kind: "text", field: "reason", min: 3, max: 500 },
      { kind: "date", field: "newDueOn", min: "2027-02-01" },
    ]);
    await fc.assert(fc.asyncProperty(validDate.filter((d) => d <= due), async (d) => expectFieldError(await parse(s, { intent: "grant-extension", reason: "Course full", newDueOn: d }), "newDueOn")), RUNS);
  },
  "app/routes/team/cell-schemas.ts#verifySchema": async () =>
    checkForm(await get("app/routes/team/cell-schemas.ts", "verifySchema"), { intent: "verify-credential", credentialId: "c", method: "Online lookup" }, [
      // No custom message: the method is chosen from a list on the page (zod's default wording).
      { kind: "text", field: "method", min: 3, max: 200, human: false },
    ]),
  "app/routes/team/cell-schemas.ts#revokeSchema": async () =>
    checkForm(await get("app/routes/team/cell-schemas.ts", "revokeSchema"), { intent: "revoke-waiver", waiverId: "w", reason: "Back from leave" }, [{ kind: "text", field: "reason", min: 3, max: 500 }]),
  "app/routes/team/requirement-schema.ts#requirementCreateSchema": async () => {
    const s = await get("app/routes/team/requirement-schema.ts", "requirementCreateSchema");
    const base = { intent: "create-requirement", name: "Annual ventilator exam", kind: "exam", examId: "e1", recurrence: "every-12-months", graceDays: "0", lapseLeaves: "supervised" };
    await checkForm(s, base, [
      { kind: "text", field: "name", min: 3, max: 120 },
      { kind: "int", field: "graceDays", min: 0, max: 365, coerce: true },
      { kind: "enum", field: "recurrence", values: ["at-hire", "every-12-months", "every-24-months", "once"] },
      { kind: "enum", field: "lapseLeaves", values: ["supervised", "not-cleared"] },
    ]);
    expectFieldError(await parse(s, { ...base, examId: undefined }), "examId");
    expectFieldError(await parse(s, { ...base, checklistId: "c1" }), "checklistId");
    expectFieldError(await parse(s, { ...base, kind: "credential", examId: undefined, credentialTypeId: "t" }), "recurrence");
  },
  "app/routes/team/requirement-schema.ts#requirementEditSchema": async () =>
    checkForm(await get("app/routes/team/requirement-schema.ts", "requirementEditSchema"), { intent: "update-requirement", requirementId: "r", graceDays: "7", lapseLeaves: "supervised" }, [
      { kind: "int", field: "graceDays", min: 0, max: 365, coerce: true },
      { kind: "enum", field: "role", values: ["therapist", "preceptor", "educator", "manager"] },
    ]),
  "app/routes/team/requirement-schema.ts#requirementRetireSchema": async () =>
    checkForm(await get("app/routes/team/requirement-schema.ts", "requirementRetireSchema"), { intent: "retire-requirement", requirementId: "r", confirm: "yes" }, [{ kind: "enum", field: "confirm", values: ["yes"] }]),
  "app/routes/team/requirement-schema.ts#requirementRestoreSchema": async () => {
    const s = await get("app/routes/team/requirement-schema.ts", "requirementRestoreSchema");
    expectOk(await parse(s, { intent: "restore-requirement", requirementId: "r" }));
    expectFieldError(await parse(s, { intent: "restore-requirement", requirementId: "" }), "requirementId", false);
    expectFieldError(await parse(s, { intent: "retire-requirement", requirementId: "r" }), "intent", false);
  },
  "app/routes/team/search-params.ts#TeamSearchSchema": async () =>
    checkLenient(await get("app/routes/team/search-params.ts", "TeamSearchSchema"), ["q", "sort", "dir", "page"], (o) => {
      expect((o.q as string).length).toBeLessThanOrEqual(100);
      expect(["name", "unit", "hire", "lapsed"]).toContain(o.sort);
      expect([undefined, "asc", "desc"]).toContain(o.dir);
      expect(Number.isInteger(o.page) && (o.page as number) >= 1).toBe(true);
    }),
  "app/routes/clearance/search-params.ts#ClearanceSearchSchema": async () =>
    checkLenient(await get("app/routes/clearance/search-params.ts", "ClearanceSearchSchema"), ["unit", "skill"], (o) => {
      expect((o.unit as string).length).toBeLessThanOrEqual(100);
      expect((o.skill as string).length).toBeLessThanOrEqual(100);
    }),
  ...matrixFieldEntries(),

  // ── Bank ──
  "app/routes/bank/item-form.ts#itemFormSchema": async () => {
    const s = await get("app/routes/bank/item-form.ts", "itemFormSchema");
    const base = { kind: "single", stem: "Which variable ends inspiration?", topics: ["cycle-variables"], rationale: "Cycle variable.", reference: "Chatburn 2014", options: "Time\nPressure", correct: "1" };
    await checkForm(s, base, [
      { kind: "text", field: "stem", min: 1, max: 2000 },
      { kind: "text", field: "rationale", min: 1, max: 3000 },
      { kind: "text", field: "reference", min: 1, max: 500 },
    ]);
    await fc.assert(fc.asyncProperty(fc.oneof(fc.integer({ min: 3, max: 1000 }), fc.integer({ min: -1000, max: 0 })).map(String), async (c) => expectFieldError(await parse(s, { ...base, correct: c }), "correct")), RUNS);
    await fc.assert(fc.asyncProperty(fc.constantFrom("1.5", "one", "1, 2", ""), async (c) => expectFieldError(await parse(s, { ...base, correct: c }), "correct")), RUNS);
    const numeric = { ...base, kind: "numeric", answer: "7.5", unit: "cmH2O/(L/s)", tolerance: "0.1", decimals: "1" };
    expect(expectOk(await parse(s, numeric)).body).toEqual({ kind: "numeric", answer: 7.5, unit: "cmH2O/(L/s)", tolerance: 0.1, decimals: 1 });
    await fc.assert(fc.asyncProperty(fc.constantFrom("abc", "Infinity", "", "1e400", "--1"), async (v) => expectFieldError(await parse(s, { ...numeric, answer: v }), "answer")), RUNS);
    await fc.assert(fc.asyncProperty(fc.double({ max: -0.0001, noNaN: true, min: -1e9 }).map(String), async (v) => expectFieldError(await parse(s, { ...numeric, tolerance: v }), "tolerance")), RUNS);
    await fc.assert(fc.asyncProperty(fc.oneof(fc.integer({ min: 4, max: 99 }), fc.integer({ min: -99, max: -1 })).map(String), async (v) => expectFieldError(await parse(s, { ...numeric, decimals: v }), "decimals")), RUNS);
    expectFieldError(await parse(s, { ...base, options: "Same\nsame" }), "options");
    await fc.assert(fc.asyncProperty(notOneOf(["single", "multiple", "numeric", "waveform-point", "ordering", "scenario"]), async (k) => expectFieldError(await parse(s, { ...base, kind: k }), "kind")), RUNS);
  },
  "app/routes/bank/exam-form.ts#examFormSchema": async () => {
    const s = await make("app/routes/bank/exam-form.ts", "examFormSchema");
    const base = { title: "Ventilator basics", topics: { "cycle-variables": "5" }, passMarkPercent: "80", attemptsAllowed: "2", reviewPolicy: "score-and-topics", multipleResponseScoring: "all-or-nothing", orderingScoring: "exact" };
    await fc.assert(
      fc.asyncProperty(textWithin(1, 200), textWithin(0, 2000), async (title, description) => {
        const out = expectOk(await parse(s, { ...base, title, description }));
        expect(out.title).toBe(title.trim());
        expect(out.description).toBe(description.trim() ? description.trim() : null);
      }),
      RUNS,
    );
    await fc.assert(fc.asyncProperty(tooLong(200), async (t) => expectFieldError(await parse(s, { ...base, title: t }), "title")), RUNS);
    await fc.assert(fc.asyncProperty(tooLong(2000), async (t) => expectFieldError(await parse(s, { ...base, description: t }), "description")), { numRuns: 10 });
    await fc.assert(fc.asyncProperty(fc.integer({ min: 1, max: 480 }), async (n) => void expect(expectOk(await parse(s, { ...base, timeLimitMinutes: String(n) })).timeLimitMinutes).toBe(n)), RUNS);
    const badMinutes = fc.oneof(fc.integer({ min: 481, max: 1e7 }).map(String), fc.integer({ min: -1e6, max: 0 }).map(String), fc.constantFrom("1.5", "abc", "NaN", "Infinity"));
    await fc.assert(fc.asyncProperty(badMinutes, async (v) => expectFieldError(await parse(s, { ...base, timeLimitMinutes: v }), "timeLimitMinutes")), RUNS);
    await fc.assert(fc.asyncProperty(fc.oneof(fc.double({ min: 100.001, max: 1e9, noNaN: true }), fc.double({ min: -1e9, max: 0.999, noNaN: true })).map(String), async (v) => expectFieldError(await parse(s, { ...base, passMarkPercent: v }), "passMarkPercent")), RUNS);
    await fc.assert(fc.asyncProperty(fc.integer({ min: 11, max: 1e6 }).map(String), async (v) => expectFieldError(await parse(s, { ...base, attemptsAllowed: v }), "attemptsAllowed")), RUNS);
    await fc.assert(fc.asyncProperty(impossibleDate, async (d) => expectFieldError(await parse(s, { ...base, availableFrom: d }), "availableFrom")), RUNS);
    await fc.assert(fc.asyncProperty(validDate, validDate, async (a, b) => {
      fc.pre(b < a);
      expectFieldError(await parse(s, { ...base, availableFrom: a, availableUntil: b }), "availableUntil");
    }), RUNS);
    await fc.assert(fc.asyncProperty(fc.integer({ min: 101, max: 1e6 }).map(String), async (v) => expectFieldError(await parse(s, { ...base, topics: { "cycle-variables": v } }), "topics.cycle-variables")), RUNS);
    expectFieldError(await parse(s, { ...base, topics: { "<script>": "1" } }), "topics.<script>");
  },
  "app/routes/bank/exam-form.ts#assignFormSchema": async () => {
    const s = await make("app/routes/bank/exam-form.ts", "assignFormSchema", TODAY);
    await fc.assert(fc.asyncProperty(dateFrom(TODAY), async (d) => void expect(expectOk(await parse(s, { to: "unit", unitId: "u", dueOn: d })).dueOn).toBe(d)), RUNS);
    await fc.assert(fc.asyncProperty(fc.oneof(impossibleDate, validDate.filter((d) => d < TODAY)), async (d) => expectFieldError(await parse(s, { to: "unit", unitId: "u", dueOn: d }), "dueOn")), RUNS);
    expectFieldError(await parse(s, { to: "people", dueOn: TODAY }), "personIds");
    expectFieldError(await parse(s, { to: "people", personIds: Array.from({ length: 501 }, (_, i) => `p${i}`), dueOn: TODAY }), "personIds");
    expectFieldError(await parse(s, { to: "role", role: "admin", dueOn: TODAY }), "role");
    expectFieldError(await parse(s, { to: "unit", dueOn: TODAY }), "unitId");
    await fc.assert(fc.asyncProperty(notOneOf(["people", "unit", "role"]), async (t) => expectFieldError(await parse(s, { to: t, dueOn: TODAY }), "to")), RUNS);
  },
  "app/routes/bank/angoff-form.ts#ratingFormSchema": async () => {
    const s = await get("app/routes/bank/angoff-form.ts", "ratingFormSchema");
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 0, max: 1000 }).map((n) => n / 10), async (p) => {
        const out = expectOk(await parse(s, { round: "1", rating: { i1: `${p} %` } }));
        expect((out.ratings as Record<string, number>).i1).toBeCloseTo(p / 100, 12);
      }),
      RUNS,
    );
    const bad = fc.oneof(fc.double({ min: 100.01, max: 1e6, noNaN: true }).map(String), fc.double({ min: -1e6, max: -0.01, noNaN: true }).map(String), fc.constantFrom("abc", "=1+1", "<b>5</b>", "5 5", "Infinity"));
    await fc.assert(fc.asyncProperty(bad, async (v) => expectFieldError(await parse(s, { round: "2", rating: { i1: v } }), "rating.i1")), RUNS);
    await fc.assert(fc.asyncProperty(notOneOf(["1", "2"]), async (r) => expectFieldError(await parse(s, { round: r }), "round")), RUNS);
  },

  // ── Domain schemas behind the bank's import and the bench ──
  "app/domain/bank/item-content.ts#itemContent": async () => {
    const s = await get("app/domain/bank/item-content.ts", "itemContent");
    const base = { type: "single", stem: "Stem", topics: ["modes"], body: { kind: "single", options: ["A", "B"], correct: 0 }, scenario: null, rationale: "R", reference: "Ref" };
    await checkForm(s, base, [
      { kind: "text", field: "stem", min: 1, max: 2000 },
      { kind: "text", field: "rationale", min: 1, max: 3000 },
      { kind: "text", field: "reference", min: 1, max: 500 },
    ]);
    expectFieldError(await parse(s, { ...base, topics: [] }), "topics");
    expectFieldError(await parse(s, { ...base, topics: ["modes", "modes"] }), "topics");
    expectFieldError(await parse(s, { ...base, type: "numeric" }), "type");
    expectFieldError(await parse(s, { ...base, extra: 1 }), "", false);
  },
  "app/domain/bank/item-content.ts#singleBody": async () => checkBody("singleBody", { kind: "single", options: ["A", "B"], correct: 1 }, { correct: -1 }, "correct"),
  "app/domain/bank/item-content.ts#multipleBody": async () => checkBody("multipleBody", { kind: "multiple", options: ["A", "B", "C"], correct: [0, 2] }, { correct: [] }, "correct"),
  "app/domain/bank/item-content.ts#numericBody": async () => checkBody("numericBody", { kind: "numeric", answer: 7.5, unit: "mL", tolerance: 0.1, decimals: 1 }, { tolerance: -1 }, "tolerance"),
  "app/domain/bank/item-content.ts#waveformPointBody": async () =>
    checkBody("waveformPointBody", { kind: "waveform-point", bench: { mode: "x" }, viewFromS: 0, viewToS: 4, window: { fromS: 1, toS: 2 } }, { viewToS: 0 }, "viewToS"),
  "app/domain/bank/item-content.ts#orderingBody": async () => checkBody("orderingBody", { kind: "ordering", steps: ["a", "b", "c"] }, { steps: ["a", "b"] }, "steps"),
  "app/domain/bank/item-content.ts#scenarioBody": async () => checkBody("scenarioBody", { kind: "scenario" }, { extra: 1 }, ""),
  "app/domain/bank/item-content.ts#itemBody": async () => {
    const s = await get("app/domain/bank/item-content.ts", "itemBody");
    expectOk(await parse(s, { kind: "scenario" }));
    await fc.assert(fc.asyncProperty(notOneOf(["single", "multiple", "numeric", "waveform-point", "ordering", "scenario"]), async (k) => expectFieldError(await parse(s, { kind: k }), "kind")), RUNS);
  },
  "app/domain/bank/item-content.ts#scenarioConfig": async () => {
    const s = await get("app/domain/bank/item-content.ts", "scenarioConfig");
    const { TEMPLATE_IDS } = await import("~/domain/bench");
    await fc.assert(fc.asyncProperty(fc.constantFrom(...TEMPLATE_IDS), fc.array(fc.nat(), { minLength: 1, maxLength: 6 }), async (t, seeds) => void expect(expectOk(await parse(s, { templateId: t, previewSeeds: seeds }))).toEqual({ templateId: t, previewSeeds: seeds })), RUNS);
    await fc.assert(fc.asyncProperty(notOneOf(TEMPLATE_IDS), async (t) => expectFieldError(await parse(s, { templateId: t, previewSeeds: [1] }), "templateId")), RUNS);
    expectFieldError(await parse(s, { templateId: TEMPLATE_IDS[0], previewSeeds: [1, 2, 3, 4, 5, 6, 7] }), "previewSeeds", false);
  },
  "app/domain/exams/blueprint.ts#blueprintSchema": async () => {
    const s = await get("app/domain/exams/blueprint.ts", "blueprintSchema");
    await fc.assert(fc.asyncProperty(fc.integer({ min: 1, max: 100 }), async (n) => void expect(expectOk(await parse(s, { topics: { modes: n } }))).toEqual({ topics: { modes: n } })), RUNS);
    await fc.assert(fc.asyncProperty(fc.oneof(fc.integer({ min: 101, max: 1e6 }), fc.integer({ min: -1e6, max: -1 }), fc.constant(1.5)), async (n) => expectFieldError(await parse(s, { topics: { modes: n } }), "topics.modes")), RUNS);
    expectFieldError(await parse(s, { topics: { modes: 0 } }), "topics");
    expectFieldError(await parse(s, { topics: { modes: 100, "lung-mechanics": 100, "cycle-variables": 1 } }), "topics");
    expectFieldError(await parse(s, { topics: { modes: 2 }, fixed: ["a", "a"] }), "fixed");
  },
  "app/domain/bench/schema.ts#changeSetSchema": async () => {
    const s = await get("app/domain/bench/schema.ts", "changeSetSchema");
    const { SETTINGS_RANGES, LIMITS_RANGES, PATIENT_RANGES } = await import("~/domain/bench/field-ranges");
    const ranges = Object.entries({ ...SETTINGS_RANGES, ...LIMITS_RANGES, ...PATIENT_RANGES }) as [string, { min: number; max: number; integer?: boolean }][];
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...ranges), fc.double({ min: 0, max: 1, noNaN: true }), async ([field, r], t) => {
        const v = r.integer ? Math.round(r.min + t * (r.max - r.min)) : r.min + t * (r.max - r.min);
        expect(expectOk(await parse(s, { [field]: v }))[field]).toBe(v);
        expectFieldError(await parse(s, { [field]: r.max + 1 + t }), field, false);
        expectFieldError(await parse(s, { [field]: r.min - 1 - t }), field, false);
        expectFieldError(await parse(s, { [field]: String(v) }), field, false);
      }),
      RUNS,
    );
    expectFieldError(await parse(s, { notAField: 1 }), "", false);
  },
  "app/domain/bench/schema.ts#scenarioSchema": async () => {
    const s = await get("app/domain/bench/schema.ts", "scenarioSchema");
    const { WAVEFORM_PRESETS } = await import("~/domain/bank/waveform-presets");
    for (const preset of WAVEFORM_PRESETS) expectOk(await parse(s, preset.bench));
    const bench = WAVEFORM_PRESETS[0].bench as { patient: Record<string, unknown> };
    await fc.assert(
      fc.asyncProperty(fc.oneof(fc.double({ min: 200.01, max: 1e9, noNaN: true }), fc.double({ min: -1e9, max: 0.99, noNaN: true })), async (c) =>
        expectFieldError(await parse(s, { ...bench, patient: { ...bench.patient, complianceMlPerCmH2O: c } }), "patient.complianceMlPerCmH2O", false),
      ),
      RUNS,
    );
  },

  // ── JSON API ──
  "app/api/schemas.ts#PageQuery": async () => checkPageQuery("PageQuery"),
  "app/api/schemas.ts#ExamResultsQuery": async () => checkPageQuery("ExamResultsQuery", ["examId", "personId"]),
  "app/api/schemas.ts#ClearancesQuery": async () => checkPageQuery("ClearancesQuery", ["unitId", "checklistId"]),
  "app/api/schemas.ts#CredentialsQuery": async () => checkPageQuery("CredentialsQuery", ["personId"]),
  "app/api/schemas.ts#TeamMatrixQuery": async () => {
    await checkPageQuery("TeamMatrixQuery");
    const s = await get("app/api/schemas.ts", "TeamMatrixQuery");
    await checkForm(s, {}, [
      { kind: "text", field: "q", min: 0, max: 100 },
      { kind: "enum", field: "role", values: ROLES },
      { kind: "enum", field: "sort", values: ["name", "unit", "lapsed"] },
      { kind: "enum", field: "dir", values: ["asc", "desc"] },
    ]);
  },
  "app/api/schemas.ts#credentialBodyJsonSchema": async () => {
    // Not a zod schema but the JSON Schema of the credential POST/PATCH body, built from the page's.
    const make = (await load("app/api/schemas.ts")).credentialBodyJsonSchema as (m: "create" | "update") => { properties: Record<string, unknown>; required?: string[] };
    const create = make("create");
    expect(Object.keys(create.properties).sort()).toEqual(["credentialTypeId", "issuedOn", "issuer", "number", "personId", "validThrough"]);
    expect(create.required).toEqual(expect.arrayContaining(["personId", "credentialTypeId", "issuedOn"]));
    expect(Object.keys(make("update").properties).sort()).toEqual(["issuedOn", "issuer", "number", "validThrough"]);
  },
  ...Object.fromEntries(
    ["ErrorSchema", "PersonSchema", "UnitSchema", "RequirementSchema", "StatusRowSchema", "PersonStatusSchema", "ExamResultSchema", "ClearanceSchema", "CredentialSchema", "PersonPage", "UnitPage", "RequirementPage", "ExamResultPage", "ClearancePage", "CredentialPage", "MatrixCellSchema", "TeamMatrixPage", "ExamAttemptSchema"].map((name) => [
      `app/api/schemas.ts#${name}`,
      async () => checkOutputOnly(await get("app/api/schemas.ts", name)),
    ]),
  ),
};

// ── Helpers used by several entries ─────────────────────────────────────────────────────────

async function checkPerson(s: z.ZodType, base: Record<string, unknown>) {
  await checkForm(s, base, [
    { kind: "text", field: "name", min: 1, max: 120 },
    { kind: "text", field: "employeeId", min: 0, max: 40, out: (v) => v || null },
    { kind: "text", field: "title", min: 0, max: 120, out: (v) => v || null },
    { kind: "date", field: "hireDate" },
    { kind: "int", field: "birthMonth", min: 1, max: 12 },
  ]);
  await fc.assert(fc.asyncProperty(fc.emailAddress().filter((e) => e.length <= 254 && z.email().safeParse(e).success), async (e) => void expect(expectOk(await parse(s, { ...base, email: e.toUpperCase() })).email).toBe(e.toLowerCase())), RUNS);
  await fc.assert(fc.asyncProperty(fc.constantFrom("ana", "<script>alert(1)</script>", "'; DROP TABLE people; --@", "a@b", ""), async (e) => expectFieldError(await parse(s, { ...base, email: e }), "email")), RUNS);
  await fc.assert(fc.asyncProperty(fc.constantFrom("RRT<script>", "=1+1", "RRT;", "R\u202ET"), async (c) => expectFieldError(await parse(s, { ...base, credentialLetters: c }), "credentialLetters")), RUNS);
}

const badPin = fc.oneof(fc.stringMatching(/^\d{0,5}$/), fc.stringMatching(/^\d{13,20}$/), fc.constantFrom("12345a", "١٢٣٤٥٦", "' OR 1=1 --", "123 456"));
async function checkPin(s: z.ZodType, base: Record<string, unknown>, field: string) {
  await fc.assert(fc.asyncProperty(fc.stringMatching(/^\d{6,12}$/), async (p) => void expect(expectOk(await parse(s, { ...base, [field]: p }))[field]).toBe(p)), RUNS);
  await fc.assert(fc.asyncProperty(badPin, async (p) => expectFieldError(await parse(s, { ...base, [field]: p }), field)), RUNS);
  expectFieldError(await parse(s, base), field);
}

async function checkBody(name: string, valid: Record<string, unknown>, broken: Record<string, unknown>, field: string) {
  const s = await get("app/domain/bank/item-content.ts", name);
  expect(expectOk(await parse(s, valid))).toEqual(valid);
  expectFieldError(await parse(s, { ...valid, ...broken }), field, false);
  expectFieldError(await parse(s, { ...valid, kind: "something-else" }), "kind", false);
}

async function checkPageQuery(name: string, ids: string[] = []) {
  const s = await get("app/api/schemas.ts", name);
  await fc.assert(fc.asyncProperty(fc.integer({ min: 1, max: 200 }), async (n) => void expect(expectOk(await parse(s, { limit: String(n) })).limit).toBe(n)), RUNS);
  expect(expectOk(await parse(s, {})).limit).toBe(50);
  const bad = fc.oneof(fc.integer({ min: 201, max: 1e9 }).map(String), fc.integer({ min: -1e9, max: 0 }).map(String), fc.constantFrom("1.5", "ten", "1e999", "NaN"));
  await fc.assert(fc.asyncProperty(bad, async (v) => expectFieldError(await parse(s, { limit: v }), "limit")), RUNS);
  expectFieldError(await parse(s, { cursor: "" }), "cursor");
  for (const id of ids) {
    await fc.assert(fc.asyncProperty(textWithin(1, 100, false), async (v) => void expect(expectOk(await parse(s, { [id]: v }))[id]).toBe(v)), { numRuns: 10 });
    expectFieldError(await parse(s, { [id]: "" }), id, false);
  }
}

function matrixFieldEntries(): Record<string, () => Promise<void>> {
  const file = "app/routes/team/matrix-params.ts";
  const field = async (name: string) => ((await load(file)).MATRIX_FILTER_FIELDS as Record<string, z.ZodType>)[name];
  const wrap = async (name: string) => z.object({ [name]: await field(name) });
  const { STATUSES } = { STATUSES: ["current", "due-soon", "lapsed", "not-started", "waived"] as const };
  return {
    [`${file}#MATRIX_FILTER_FIELDS.q`]: async () => checkForm(await wrap("q"), { q: "" }, [{ kind: "text", field: "q", min: 0, max: 100 }]),
    [`${file}#MATRIX_FILTER_FIELDS.unit`]: async () => {
      const s = await wrap("unit");
      await fc.assert(fc.asyncProperty(textWithin(0, 100, false), async (v) => void expect(expectOk(await parse(s, { unit: v })).unit).toBe(v)), RUNS);
      await fc.assert(fc.asyncProperty(tooLong(100), async (v) => expectFieldError(await parse(s, { unit: v }), "unit")), RUNS);
    },
    [`${file}#MATRIX_FILTER_FIELDS.role`]: async () => checkForm(await wrap("role"), { role: "therapist" }, [{ kind: "enum", field: "role", values: ROLES }]),
    [`${file}#MATRIX_FILTER_FIELDS.status`]: async () => checkForm(await wrap("status"), { status: "current" }, [{ kind: "enum", field: "status", values: STATUSES }]),
    [`${file}#MATRIX_FILTER_FIELDS.sort`]: async () => checkForm(await wrap("sort"), { sort: "name" }, [{ kind: "enum", field: "sort", values: ["name", "unit", "lapsed"] }]),
    [`${file}#MATRIX_FILTER_FIELDS.dir`]: async () => checkForm(await wrap("dir"), { dir: "asc" }, [{ kind: "enum", field: "dir", values: ["asc", "desc"] }]),
  };
}

// ── The tests ───────────────────────────────────────────────────────────────────────────────

describe("every exported zod schema of the app's form and API modules is covered here", () => {
  it("finds the schema modules and has a property entry for each exported schema (and no stale entry)", async () => {
    expect(SCHEMA_MODULES).toContain("app/routes/admin/schemas.ts");
    expect(SCHEMA_MODULES).toContain("app/api/schemas.ts");
    const found = await exportedSchemas();
    expect(found.length).toBeGreaterThan(60);
    const missing = found.filter((k) => !(k in COVERAGE));
    const stale = Object.keys(COVERAGE).filter((k) => !found.includes(k));
    console.info(`hostile-input-schemas: ${found.length} exported schemas in ${SCHEMA_MODULES.length} modules`);
    expect(missing, "exported schemas without properties in hostile-input-schemas.test.ts").toEqual([]);
    expect(stale, "entries for schemas that no longer exist").toEqual([]);
  });
});

describe("properties of each schema (valid input round-trips; invalid input is refused on its field)", () => {
  for (const [key, run] of Object.entries(COVERAGE)) it(key, run, 60_000);
});
