/**
 * The authorisation table, proven against the running production build: every route pattern
 * of app/routes.ts is requested as an anonymous visitor and as each of the five roles of each of
 * the two demo organisations (Kestrel Valley's demo accounts; Alder Bay's admin and the first
 * holder of each other role) — as a document, and as a client data request for each route of its
 * match alone (`<path>.data?_routes=<id>`; "/" is "/_root.data"), because a check in a parent
 * layout's loader would not protect a child requested alone (shared/STACK.md, "Auth gates").
 *
 * A route with parameters is asked for the identity's organisation's rows and for the other
 * organisation's (a permitted viewer gets 404 for the latter). A record-scoped route is asked
 * for the identity's own record (where they have one), another person's of their organisation
 * and another organisation's, and the exact answer — opened or 404 — follows the route's
 * `record` rule (app/auth/route-access.ts, opensRecord). The answers must agree with
 * ROUTE_ACCESS; every disagreement is one line of one failure report per identity.
 * OWASP ASVS 4.0.3 V4.1.1 (access enforced on the server), V4.1.3 (least privilege), V4.1.5
 * (deny by default), V4.2.1 (insecure direct object references).
 */
import { request as playwrightRequest, type APIRequestContext } from "@playwright/test";
import { opensRecord, ROUTE_ACCESS, type Access } from "../../app/auth/route-access";
import { can, isRole, ROLES, type Role } from "../../app/auth/roles";
import { seededChecklistId, seededCheckoffId, seededEvidenceId } from "../fixtures/checkoffs";
import { seededItemId } from "../fixtures/bank";
import { seededAttemptId, seededExamId } from "../fixtures/exams";
import { seededCertificateCode, seededCertificateId } from "../fixtures/certificates";
import { seededCredentialId, seededRequirementId } from "../fixtures/credentials";
import { firstPersonId, insertSession, one, rolesOf } from "../fixtures/e2e-db";
import { APP_URL } from "../fixtures/e2e-env";
import { managesPerson, ORGS, otherOrg, ownRecord, roleHolder, someoneElsesRecord, type OrgSlug, type RecordRef } from "../fixtures/records";
import { builtRouteManifest } from "../fixtures/route-manifest";
import { routePatterns, type RoutePattern } from "../fixtures/route-patterns";
import { SESSION_COOKIE, signedSessionValue } from "../fixtures/session-cookie";
import { expect, test } from "../fixtures/test";

type Identity = { label: string; org: OrgSlug; roles: Role[] | null; personId: string | null; cookie?: string };

/**
 * A real seeded value for each route parameter, from an organisation. A new parameter without a
 * row here fails the test, so a later route cannot go unchecked.
 */
const PARAMS: Record<string, (org: OrgSlug) => Promise<string>> = {
  personId: (org) => firstPersonId(org),
  checkoffId: (org) => seededCheckoffId(org),
  checklistId: (org) => seededChecklistId(org),
  evidenceId: (org) => seededEvidenceId(org),
  itemId: (org) => seededItemId(org),
  version: async () => "1",
  credentialId: (org) => seededCredentialId(org),
  requirementId: (org) => seededRequirementId(org),
  examId: (org) => seededExamId(org),
  // A made-up calendar address: the feed answers 404 to anyone (the real ones are tested in vitest).
  token: async () => "no-such-calendar-token",
  attemptId: (org) => seededAttemptId(org),
  certificateId: (org) => seededCertificateId(org),
  code: (org) => seededCertificateCode(org),
};

/** A catch-all segment that no route claims. */
const UNMATCHED = "no-such-page-e2e";

const paramNames = (pattern: string) => pattern.split("/").filter((s) => s.startsWith(":")).map((s) => s.replace(/^:/, "").replace(/\?$/, ""));

/** The pattern with its parameters filled from `values` (or PARAMS for the organisation). */
async function concretePath(pattern: string, org: OrgSlug, values: Record<string, string> = {}): Promise<string> {
  if (pattern === "*") return `/${UNMATCHED}`;
  const parts = await Promise.all(
    pattern.split("/").map(async (segment) => {
      if (segment === "*") return UNMATCHED;
      if (!segment.startsWith(":")) return segment;
      const name = segment.replace(/^:/, "").replace(/\?$/, "");
      if (values[name] !== undefined) return encodeURIComponent(values[name]);
      const resolve = PARAMS[name];
      if (!resolve) throw new Error(`No seeded value for the route parameter :${name} of ${pattern}: add one to PARAMS`);
      return encodeURIComponent(await resolve(org));
    }),
  );
  return parts.join("/") || "/";
}

function dataUrl(path: string, routeId: string, search = ""): string {
  const base = path === "/" ? "/_root.data" : `${path.replace(/\/$/, "")}.data`;
  const extra = search ? `&${search.replace(/^\?/, "")}` : "";
  return `${base}?_routes=${encodeURIComponent(routeId)}${extra}`;
}

type Expected =
  | { kind: "any-but-denied" }
  | { kind: "ok" }
  | { kind: "not-found" }
  | { kind: "redirect"; to: string }
  | { kind: "forbidden" }
  | { kind: "sign-in" }
  | { kind: "token" };

/** What the table says before any record is looked up. */
function expectedFor(access: Access, roles: Role[] | null): Expected {
  switch (access.who) {
    case "public":
      return { kind: "any-but-denied" };
    case "demo":
      // The suite's servers run in demo mode (TIDEMARK_DEMO=1), so the page is open to all.
      return { kind: "ok" };
    case "signed-in":
      return roles ? { kind: "ok" } : { kind: "sign-in" };
    case "token":
      // The JSON API: no session opens it, so anonymous and every role alike get 401 without a
      // bearer token (the suite sends none; tests/integration/api.test.ts covers the tokens).
      return { kind: "token" };
    case "permission":
      if (!roles) return { kind: "sign-in" };
      return can(roles, access.permission) ? { kind: "ok" } : { kind: "forbidden" };
  }
}

type Answer = { status: number; location: string | null; body: string };

/** One mismatch as a line of the failure report, or null when the answer is right. */
function judge(expected: Expected, answer: Answer, asData: boolean, path: string, loadedId: string | null): string | null {
  const { status, location, body } = answer;
  const signInTarget = `/login?next=${encodeURIComponent(path)}`;
  const got = `got ${status}${location ? ` → ${location}` : ""}`;
  switch (expected.kind) {
    case "any-but-denied":
      if (status === 401 || status === 403) return `expected public, got ${status}`;
      if (status >= 500) return `expected public, got a server error ${status}`;
      return null;
    case "ok":
      if (status !== 200) return `expected 200, ${got}`;
      // A data request that loaded nothing would pass vacuously: the route's own data must be in it.
      if (asData && loadedId && !body.includes(JSON.stringify(loadedId))) return `200 without the data of ${loadedId}`;
      return null;
    case "not-found":
      return status === 404 ? null : `expected 404, ${got}`;
    case "redirect":
      if (asData) return status === 202 && body.includes(JSON.stringify(expected.to)) ? null : `expected a redirect to ${expected.to}, ${got} ${body.slice(0, 120)}`;
      return status === 302 && location === expected.to ? null : `expected 302 → ${expected.to}, ${got}`;
    case "forbidden":
      return status === 403 ? null : `expected 403, ${got}`;
    case "token":
      return tokenRefusal(status, body, asData);
    case "sign-in":
      if (asData) {
        // Single fetch answers a redirect with 202 and the target in the body.
        return status === 202 && body.includes(JSON.stringify(signInTarget)) ? null : `expected a redirect to ${signInTarget}, got ${status} ${body.slice(0, 120)}`;
      }
      return status === 302 && location === signInTarget ? null : `expected 302 → ${signInTarget}, ${got}`;
  }
}

/**
 * A token route asked without a bearer token: 401 with the stable code missing_token. A document
 * request gets the JSON error itself; a data request gets the same object in React Router's
 * single-fetch encoding (turbo-stream), still with status 401 and the code in the body.
 */
function tokenRefusal(status: number, body: string, asData: boolean): string | null {
  if (status !== 401) return `expected 401 (no bearer token), got ${status} ${body.slice(0, 120)}`;
  if (!asData) {
    try {
      const parsed = JSON.parse(body) as { error?: { code?: string } };
      return parsed.error?.code === "missing_token" ? null : `401 without the JSON error code missing_token: ${body.slice(0, 120)}`;
    } catch {
      return `401 whose body is not JSON: ${body.slice(0, 120)}`;
    }
  }
  return body.includes('"missing_token"') ? null : `401 without the code missing_token: ${body.slice(0, 120)}`;
}

async function ask(api: APIRequestContext, url: string, cookie?: string): Promise<Answer> {
  const response = await api.get(url, { maxRedirects: 0, headers: cookie ? { Cookie: `${SESSION_COOKIE}=${cookie}` } : {} });
  return { status: response.status(), location: response.headers()["location"] ?? null, body: await response.text() };
}

async function personById(id: string) {
  const person = await one<{ id: string; email: string; name: string }>("SELECT id, email, name FROM people WHERE id = ?", [id]);
  if (!person) throw new Error(`No person ${id}`);
  return person;
}

type Who = { org: OrgSlug; role: Role | "anonymous" };

async function identity({ org, role }: Who): Promise<Identity> {
  if (role === "anonymous") return { label: `anonymous (with ${org}'s ids)`, org, roles: null, personId: null };
  const holder = await roleHolder(org, role);
  const { sessionId, person } = await insertSession(holder.email);
  const roles = (await rolesOf(person.id)).filter(isRole);
  return { label: `${org} ${role} (${person.email}: ${roles.join(", ")})`, org, roles, personId: person.id, cookie: await signedSessionValue(sessionId) };
}

/** One address to request for a route, with the answer the table gives a permitted viewer. */
type Probe = { what: string; path: string; search: string; permitted: Expected };

/**
 * The addresses a route is asked at by one identity. Record-scoped: the identity's own record,
 * another person's of the same organisation, another organisation's — each with the exact answer
 * of the route's record rule. Other routes with parameters: the organisation's rows (open) and the
 * other organisation's (404). Without parameters: the one address.
 */
async function probesFor(route: RoutePattern, access: Access, me: Identity): Promise<Probe[] | string> {
  const names = paramNames(route.pattern);
  if (access.who === "permission" && access.recordScoped) {
    const rule = access.record;
    if (!rule) return `${route.pattern}: record-scoped without a record rule in ROUTE_ACCESS`;
    const cases: { what: string; record: RecordRef | null; sameOrganisation: boolean }[] = [
      { what: "own record", record: me.personId ? await ownRecord(rule.record, me.personId) : null, sameOrganisation: true },
      { what: "another person's record", record: await someoneElsesRecord(rule.record, me.org, me.personId), sameOrganisation: true },
      { what: "another organisation's record", record: await someoneElsesRecord(rule.record, otherOrg(me.org), null), sameOrganisation: false },
    ];
    const probes: Probe[] = [];
    for (const c of cases) {
      if (!c.record) continue;
      const isOwner = c.record.ownerId === me.personId;
      const viewer = {
        roles: me.roles ?? [],
        sameOrganisation: c.sameOrganisation,
        isOwner,
        managesOwner: me.personId !== null && c.sameOrganisation && (await managesPerson(me.personId, c.record.ownerId)),
      };
      const path = await concretePath(route.pattern, me.org, c.record.params);
      const opens = opensRecord(rule, viewer);
      // The taking page of a closed (graded) attempt sends its owner to the result.
      const closedAttempt = opens && isOwner && route.pattern === "/exams/attempts/:attemptId";
      const permitted: Expected = closedAttempt ? { kind: "redirect", to: `${path}/result` } : opens ? { kind: "ok" } : { kind: "not-found" };
      probes.push({ what: c.what, path, search: c.record.search, permitted });
    }
    return probes;
  }
  // Public, demo and token routes with parameters (a certificate code, a calendar token, the
  // API's ids) answer as their row says whatever the ids: one address is enough.
  if (names.length === 0 || access.who !== "permission") {
    return [{ what: "", path: await concretePath(route.pattern, me.org), search: "", permitted: { kind: "ok" } }];
  }
  return [
    { what: "own organisation's ids", path: await concretePath(route.pattern, me.org), search: "", permitted: { kind: "ok" } },
    { what: "another organisation's ids", path: await concretePath(route.pattern, otherOrg(me.org)), search: "", permitted: { kind: "not-found" } },
  ];
}

/** Runs `jobs` with at most `width` in flight (the CI machine has two cores). */
async function inParallel<T>(jobs: (() => Promise<T>)[], width: number): Promise<T[]> {
  const results: T[] = new Array(jobs.length);
  let next = 0;
  await Promise.all(
    Array.from({ length: Math.min(width, jobs.length) }, async () => {
      while (next < jobs.length) {
        const i = next++;
        results[i] = await jobs[i]();
      }
    }),
  );
  return results;
}

const patterns = routePatterns();
const manifest = builtRouteManifest();

test("every route in app/routes.ts has a row in the authorisation table", () => {
  const missing = patterns.map((r) => r.pattern).filter((p) => !(p in ROUTE_ACCESS));
  expect(missing, "routes missing from ROUTE_ACCESS (app/auth/route-access.ts)").toEqual([]);
});

test("the flattened routes are the ones the production build serves", () => {
  // Ids and parents as React Router built them, so the data requests below name real routes.
  for (const { pattern, chain } of patterns) {
    for (let i = 0; i < chain.length; i++) {
      const route = manifest[chain[i]];
      expect(route, `${pattern}: route id ${chain[i]} in the build`).toBeDefined();
      if (i > 0) expect(route.parentId, `${pattern}: parent of ${chain[i]}`).toBe(chain[i - 1]);
    }
  }
  const built = Object.keys(manifest).filter((id) => id !== "root");
  const flattened = new Set(patterns.flatMap((p) => p.chain));
  expect(built.filter((id) => !flattened.has(id)), "built routes the flattening missed").toEqual([]);
});

/** 2 organisations × (anonymous + the five roles). */
const WHO: Who[] = ORGS.flatMap((org) => [{ org, role: "anonymous" as const }, ...ROLES.map((role) => ({ org, role }))]);

/** Requests in flight at once per identity: enough to overlap waiting, few enough for two cores. */
const WIDTH = 6;

for (const who of WHO) {
  test(`every route answers ${who.org} ${who.role} as the table says, on own, another person's and another organisation's records`, async () => {
    test.setTimeout(180_000);
    const me = await identity(who);
    const api = await playwrightRequest.newContext({ baseURL: APP_URL });
    const wrong: string[] = [];
    const seen = new Set<string>();
    let checked = 0;
    /** Record probes by the answer expected, so a run shows the matrix is not vacuous. */
    const tally: Record<string, number> = {};
    try {
      const jobs: (() => Promise<void>)[] = [];
      for (const route of patterns) {
        const access = ROUTE_ACCESS[route.pattern];
        if (!access) {
          wrong.push(`${route.pattern}: no row in ROUTE_ACCESS`);
          continue;
        }
        const base = expectedFor(access, me.roles);
        const probes = await probesFor(route, access, me);
        if (typeof probes === "string") {
          wrong.push(probes);
          continue;
        }
        if (probes.length === 0) wrong.push(`${route.pattern}: no address to ask`);
        seen.add(route.pattern);
        for (const probe of probes) {
          const permitted = base.kind === "ok";
          // The table's verdict for the route decides first; the record's only for a permitted viewer.
          const leaf = permitted ? probe.permitted : base;
          const label = `${route.pattern}${probe.what ? ` (${probe.what})` : ""}`;
          if (probe.what) tally[`${probe.what}: ${leaf.kind}`] = (tally[`${probe.what}: ${leaf.kind}`] ?? 0) + 1;
          const url = `${probe.path}${probe.search}`;
          jobs.push(async () => {
            const verdict = judge(leaf, await ask(api, url, me.cookie), false, url, null);
            if (verdict) wrong.push(`${label} document ${url}: ${verdict}`);
            checked++;
          });
          for (const id of route.chain) {
            // A layout asked alone knows nothing of the record: it answers as the route's gate does.
            const expected = id === route.id ? leaf : base;
            const data = dataUrl(probe.path, id, probe.search);
            const loadedId = manifest[id]?.hasLoader ? id : null;
            jobs.push(async () => {
              const verdict = judge(expected, await ask(api, data, me.cookie), true, url, loadedId);
              if (verdict) wrong.push(`${label} data ${data}: ${verdict}`);
              checked++;
            });
          }
        }
      }
      await inParallel(jobs, WIDTH);
    } finally {
      await api.dispose();
    }
    const kinds = Object.entries(tally).sort().map(([k, n]) => `${k} ×${n}`).join("; ");
    console.log(`authorisation matrix: ${me.label}: ${checked} requests (${kinds})`);
    expect(seen.size, "every route was asked").toBe(patterns.length);
    expect(checked).toBeGreaterThanOrEqual(patterns.length * 2);
    expect(wrong.sort(), `answers to ${me.label} that disagree with ROUTE_ACCESS`).toEqual([]);
  });
}

/**
 * Issue 2, item 4: "every action checks again". Each route with an action (per the build's
 * manifest) is sent a same-origin POST by every identity the table denies: anonymous visitors
 * are sent to sign-in, signed-in people without the permission get 403 — as a document POST
 * and as the client's data POST. Allowed identities are not sent writes here.
 */
test("every action refuses the identities the table denies", async () => {
  const api = await playwrightRequest.newContext({ baseURL: APP_URL });
  const wrong: string[] = [];
  let checked = 0;
  try {
    const identities = await Promise.all(WHO.map((who) => identity(who)));
    test.setTimeout(120_000);
    for (const route of patterns) {
      const access = ROUTE_ACCESS[route.pattern];
      if (!access || !manifest[route.id]?.hasAction) continue;
      for (const me of identities) {
        const expected = expectedFor(access, me.roles);
        if (expected.kind !== "forbidden" && expected.kind !== "sign-in" && expected.kind !== "token") continue;
        const path = await concretePath(route.pattern, me.org);
        // An index route's action is addressed with ?index (React Router's convention).
        const index = manifest[route.id]?.index ? "?index" : "";
        const base = path === "/" ? "/_root.data" : `${path}.data`;
        for (const [kind, url] of [
          ["document", `${path}${index}`],
          ["data", `${base}${index}`],
        ] as const) {
          const response = await api.post(url, {
            maxRedirects: 0,
            headers: { Origin: APP_URL, ...(me.cookie ? { Cookie: `${SESSION_COOKIE}=${me.cookie}` } : {}) },
            form: { intent: "probe" },
          });
          const status = response.status();
          const body = await response.text();
          const location = response.headers()["location"] ?? "";
          const ok =
            expected.kind === "token"
              ? tokenRefusal(status, body, kind === "data") === null
              : expected.kind === "forbidden"
              ? status === 403
              : kind === "document"
                ? status === 302 && location.startsWith("/login?next=")
                : (status === 202 || status === 204) && (body.includes('"/login?next=') || (response.headers()["x-remix-redirect"] ?? "").startsWith("/login"));
          if (!ok) wrong.push(`${me.label} POST ${url}: expected ${expected.kind}, got ${status} ${location} ${body.slice(0, 100)}`);
          checked++;
        }
      }
    }
  } finally {
    await api.dispose();
  }
  expect(checked, "routes with actions were probed").toBeGreaterThan(0);
  expect(wrong).toEqual([]);
});

test("an admin cannot open a person of another organisation by id", async () => {
  // Organisation isolation through the URL: each admin is refused the other hospital's
  // person (404 — or 403 — and nothing of the person in the answer).
  const api = await playwrightRequest.newContext({ baseURL: APP_URL });
  try {
    const pairs = [
      [await identity({ org: "kestrel-valley", role: "admin" }), await personById(await firstPersonId("alder-bay"))],
      [await identity({ org: "alder-bay", role: "admin" }), await personById(await firstPersonId("kestrel-valley"))],
    ] as const;
    for (const [who, other] of pairs) {
      const path = `/admin/people/${other.id}`;
      for (const [label, url] of [
        ["document", path],
        ["data", dataUrl(path, "routes/admin/person")],
      ] as const) {
        const answer = await ask(api, url, who.cookie);
        expect([403, 404], `${who.label} opening ${url} (${label})`).toContain(answer.status);
        expect(answer.body).not.toContain(other.email);
        expect(answer.body).not.toContain(other.name);
      }
    }
  } finally {
    await api.dispose();
  }
});
