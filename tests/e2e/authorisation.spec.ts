/**
 * The authorisation table, proven against the running production build: every route pattern
 * of app/routes.ts is requested as an anonymous visitor, as each of the five Kestrel Valley
 * demo roles and as Alder Bay's admin — as a document, and as a client data request for each
 * route of its match alone (`<path>.data?_routes=<id>`; "/" is "/_root.data"), because a check
 * in a parent layout's loader would not protect a child requested alone (shared/STACK.md,
 * "Auth gates"). The answer must agree with ROUTE_ACCESS (app/auth/route-access.ts).
 * OWASP ASVS 4.0.3 V4.1.1 (access enforced on the server), V4.1.3 (least privilege), V4.1.5
 * (deny by default).
 */
import { request as playwrightRequest, type APIRequestContext } from "@playwright/test";
import { ROUTE_ACCESS, type Access } from "../../app/auth/route-access";
import { can, isRole, type Role } from "../../app/auth/roles";
import { seededChecklistId, seededCheckoffId, seededEvidenceId } from "../fixtures/checkoffs";
import { seededItemId } from "../fixtures/bank";
import { seededAttemptId, seededExamId } from "../fixtures/exams";
import { seededCertificateCode, seededCertificateId } from "../fixtures/certificates";
import { seededCredentialId, seededRequirementId } from "../fixtures/credentials";
import { firstPersonId, insertSession, one, rolesOf } from "../fixtures/e2e-db";
import { APP_URL, DEMO, type DemoKey } from "../fixtures/e2e-env";
import { builtRouteManifest } from "../fixtures/route-manifest";
import { routePatterns, type RoutePattern } from "../fixtures/route-patterns";
import { SESSION_COOKIE, signedSessionValue } from "../fixtures/session-cookie";
import { expect, test } from "../fixtures/test";

type Identity = { label: string; org: "kestrel-valley" | "alder-bay"; roles: Role[] | null; cookie?: string };

/**
 * A real seeded value for each route parameter, from the identity's own organisation. A new
 * parameter without a row here fails the test, so a later route cannot go unchecked.
 */
const PARAMS: Record<string, (org: Identity["org"]) => Promise<string>> = {
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

async function concretePath(pattern: string, org: Identity["org"]): Promise<string> {
  if (pattern === "*") return `/${UNMATCHED}`;
  const parts = await Promise.all(
    pattern.split("/").map(async (segment) => {
      if (segment === "*") return UNMATCHED;
      if (!segment.startsWith(":")) return segment;
      const name = segment.replace(/^:/, "").replace(/\?$/, "");
      const resolve = PARAMS[name];
      if (!resolve) throw new Error(`No seeded value for the route parameter :${name} of ${pattern}: add one to PARAMS`);
      return encodeURIComponent(await resolve(org));
    }),
  );
  return parts.join("/") || "/";
}

function dataUrl(path: string, routeId: string): string {
  const base = path === "/" ? "/_root.data" : `${path.replace(/\/$/, "")}.data`;
  return `${base}?_routes=${encodeURIComponent(routeId)}`;
}

type Expected = { kind: "any-but-denied" } | { kind: "ok" } | { kind: "ok-or-not-found" } | { kind: "forbidden" } | { kind: "sign-in" } | { kind: "token" };

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
      if (!can(roles, access.permission)) return { kind: "forbidden" };
      // A record-scoped route answers a permitted person who is not its owner (or their manager) with 404.
      return access.recordScoped ? { kind: "ok-or-not-found" } : { kind: "ok" };
  }
}

type Answer = { status: number; location: string | null; body: string };

/** One mismatch as a line of the failure report, or null when the answer is right. */
function judge(expected: Expected, answer: Answer, asData: boolean, path: string, loadedId: string | null): string | null {
  const { status, location, body } = answer;
  const signInTarget = `/login?next=${encodeURIComponent(path)}`;
  switch (expected.kind) {
    case "any-but-denied":
      if (status === 401 || status === 403) return `expected public, got ${status}`;
      if (status >= 500) return `expected public, got a server error ${status}`;
      return null;
    case "ok":
      if (status !== 200) return `expected 200, got ${status}${location ? ` → ${location}` : ""}`;
      // A data request that loaded nothing would pass vacuously: the route's own data must be in it.
      if (asData && loadedId && !body.includes(JSON.stringify(loadedId))) return `200 without the data of ${loadedId}`;
      return null;
    case "ok-or-not-found":
      if (status === 404) return null;
      if (status !== 200) return `expected 200 or 404, got ${status}${location ? ` → ${location}` : ""}`;
      if (asData && loadedId && !body.includes(JSON.stringify(loadedId))) return `200 without the data of ${loadedId}`;
      return null;
    case "forbidden":
      return status === 403 ? null : `expected 403, got ${status}${location ? ` → ${location}` : ""}`;
    case "token":
      return tokenRefusal(status, body, asData);
    case "sign-in":
      if (asData) {
        // Single fetch answers a redirect with 202 and the target in the body.
        return status === 202 && body.includes(JSON.stringify(signInTarget)) ? null : `expected a redirect to ${signInTarget}, got ${status} ${body.slice(0, 120)}`;
      }
      return status === 302 && location === signInTarget ? null : `expected 302 → ${signInTarget}, got ${status}${location ? ` → ${location}` : ""}`;
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

async function identity(key: DemoKey | "anonymous"): Promise<Identity> {
  if (key === "anonymous") return { label: "anonymous", org: "kestrel-valley", roles: null };
  const { sessionId, person } = await insertSession(DEMO[key]);
  const roles = (await rolesOf(person.id)).filter(isRole);
  return {
    label: `${key} (${DEMO[key]}: ${roles.join(", ")})`,
    org: key === "alderBayAdmin" ? "alder-bay" : "kestrel-valley",
    roles,
    cookie: await signedSessionValue(sessionId),
  };
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

const WHO: (DemoKey | "anonymous")[] = ["anonymous", "therapist", "preceptor", "educator", "manager", "admin", "alderBayAdmin"];

for (const who of WHO) {
  test(`every route answers ${who} as the table says, as a document and as data`, async () => {
    const me = await identity(who);
    const api = await playwrightRequest.newContext({ baseURL: APP_URL });
    const wrong: string[] = [];
    let checked = 0;
    try {
      for (const route of patterns as RoutePattern[]) {
        const access = ROUTE_ACCESS[route.pattern];
        if (!access) {
          wrong.push(`${route.pattern}: no row in ROUTE_ACCESS`);
          continue;
        }
        const expected = expectedFor(access, me.roles);
        const path = await concretePath(route.pattern, me.org);

        const doc = judge(expected, await ask(api, path, me.cookie), false, path, null);
        if (doc) wrong.push(`${route.pattern} document ${path}: ${doc}`);
        checked++;

        for (const id of route.chain) {
          const url = dataUrl(path, id);
          const loadedId = manifest[id]?.hasLoader ? id : null;
          const verdict = judge(expected, await ask(api, url, me.cookie), true, path, loadedId);
          if (verdict) wrong.push(`${route.pattern} data ${url}: ${verdict}`);
          checked++;
        }
      }
    } finally {
      await api.dispose();
    }
    expect(checked).toBeGreaterThanOrEqual(patterns.length * 2);
    expect(wrong, `answers to ${me.label} that disagree with ROUTE_ACCESS`).toEqual([]);
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
      [await identity("admin"), await personById(await firstPersonId("alder-bay"))],
      [await identity("alderBayAdmin"), await personById(await firstPersonId("kestrel-valley"))],
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
