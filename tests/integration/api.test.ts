/**
 * The JSON API (issue 10, item 1): bearer tokens with scopes, refusals as JSON with stable codes,
 * organisation isolation, cursor paging, credential writes validated as on the page, and the
 * OpenAPI 3.1 document checked by an independent validator.
 * Sources: RFC 6750 "The OAuth 2.0 Authorization Framework: Bearer Token Usage" (IETF, 2012) —
 * §2.1 the Authorization header, §2.3 and §5.3 on tokens in the address, §3 the
 * WWW-Authenticate challenge, §3.1 invalid_token / insufficient_scope; RFC 6585 §4 (IETF, 2012)
 * and RFC 9110 §10.2.3 (IETF, 2022) for 429 with Retry-After; OWASP ASVS 4.0.3 V4.1.5 (deny by
 * default); "OpenAPI Specification v3.1.0" (OpenAPI Initiative, 2021).
 */
import { createHash } from "node:crypto";
import { Validator } from "@seriousme/openapi-schema-validator";
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { ROUTE_ACCESS } from "~/auth/route-access";
import { API_ENDPOINTS, openApiPath } from "~/api/endpoints";
import { API_RATE_LIMIT, createToken, endOfDayIn, revokeToken, type ApiScope } from "~/api/token.server";
import { ClearancePage, CredentialPage, CredentialSchema, ErrorSchema, ExamResultPage, PersonPage, PersonStatusSchema, RequirementPage, UnitPage } from "~/api/schemas";
import type { Database } from "~/db/client.server";
import { apiTokens, auditEvents, credentials, credentialTypes, people } from "~/db/schema";
import * as clearancesRoute from "~/routes/api/v1/clearances";
import * as credentialRoute from "~/routes/api/v1/credential";
import * as credentialsRoute from "~/routes/api/v1/credentials";
import * as examResultsRoute from "~/routes/api/v1/exam-results";
import * as openapiRoute from "~/routes/api/v1/openapi";
import * as peopleRoute from "~/routes/api/v1/people";
import * as statusRoute from "~/routes/api/v1/person-status";
import * as requirementsRoute from "~/routes/api/v1/requirements";
import * as unitsRoute from "~/routes/api/v1/units";
import { routePatterns } from "../fixtures/route-patterns";
import { useSeededDatabase } from "../setup/db";
import { args, TEST_ORIGIN, viewerFor } from "../setup/request";

type Handler = (a: never) => Promise<Response>;

let db: Database;
let kvAdmin: Viewer;
let abAdmin: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  kvAdmin = await viewerFor("admin@kestrelvalley.test");
  abAdmin = await viewerFor("admin@alderbay.test");
});

async function tokenFor(viewer: Viewer, scopes: ApiScope[], expiresOn: string | null = null): Promise<{ id: string; token: string }> {
  const made = await createToken(viewer.org.id, viewer.person.id, { name: `test ${scopes.join("+")} ${Math.random()}`, scopes, expiresOn });
  return { id: made.id, token: made.token };
}

function apiRequest(path: string, init: { token?: string; method?: string; body?: unknown; headers?: Record<string, string> } = {}): Request {
  const headers: Record<string, string> = { ...(init.headers ?? {}) };
  if (init.token) headers.Authorization = `Bearer ${init.token}`;
  if (init.body !== undefined) headers["Content-Type"] = "application/json";
  return new Request(new URL(path, TEST_ORIGIN), { method: init.method ?? "GET", headers, body: init.body === undefined ? undefined : JSON.stringify(init.body) });
}

async function call(handler: Handler, request: Request, params: Record<string, string> = {}, viewer: Viewer | null = null) {
  const response = await handler(args<never>(request, viewer, params));
  expect(response).toBeInstanceOf(Response);
  const text = await response.text();
  return { status: response.status, headers: response.headers, body: text ? (JSON.parse(text) as Record<string, unknown>) : null };
}

function errorCode(body: unknown): string | undefined {
  return ErrorSchema.parse(body).error.code;
}

const GET_ROUTES: [string, Handler, string, Record<string, string>?][] = [
  ["people", peopleRoute.loader as Handler, "/api/v1/people"],
  ["units", unitsRoute.loader as Handler, "/api/v1/units"],
  ["requirements", requirementsRoute.loader as Handler, "/api/v1/requirements"],
  ["exam results", examResultsRoute.loader as Handler, "/api/v1/exam-results"],
  ["clearances", clearancesRoute.loader as Handler, "/api/v1/clearances"],
  ["credentials", credentialsRoute.loader as Handler, "/api/v1/credentials"],
];

describe("without a bearer token", () => {
  it("answers every API route 401 with a JSON error and a Bearer challenge, signed in or not (RFC 6750 §3)", async () => {
    for (const viewer of [null, kvAdmin]) {
      for (const [label, handler, path] of GET_ROUTES) {
        const answer = await call(handler, apiRequest(path), {}, viewer);
        expect(answer.status, `${label} as ${viewer ? "a signed-in admin" : "anonymous"}`).toBe(401);
        expect(errorCode(answer.body)).toBe("missing_token");
        expect(answer.headers.get("WWW-Authenticate")).toMatch(/^Bearer /);
      }
    }
  });

  it("does not let a session cookie's viewer write: POST and PATCH need a token", async () => {
    const post = await call(credentialsRoute.action as Handler, apiRequest("/api/v1/credentials", { method: "POST", body: { personId: kvAdmin.person.id } }), {}, kvAdmin);
    expect(post.status).toBe(401);
    expect(errorCode(post.body)).toBe("missing_token");
    const patch = await call(credentialRoute.action as Handler, apiRequest("/api/v1/credentials/x", { method: "PATCH", body: { number: "1" } }), { credentialId: "x" }, kvAdmin);
    expect(patch.status).toBe(401);
  });

  it("leaves the OpenAPI document public", async () => {
    const answer = await call(openapiRoute.loader as Handler, apiRequest("/api/v1/openapi.json"));
    expect(answer.status).toBe(200);
    expect(answer.body?.openapi).toBe("3.1.0");
  });
});

describe("tokens", () => {
  it("stores only a SHA-256 hash and a short prefix, never the token (OWASP ASVS 4.0.3 V2.10.4)", async () => {
    const { id, token } = await tokenFor(kvAdmin, ["read"]);
    const [row] = await db.db.select().from(apiTokens).where(eq(apiTokens.id, id));
    // Hashed here with Node's own crypto, independently of the module under test.
    expect(row.tokenHash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(token.startsWith(row.prefix)).toBe(true);
    expect(row.prefix.length).toBeLessThan(token.length / 2);
    // Nowhere in the token table or the audit trail does the whole token appear.
    const everything = JSON.stringify(await db.db.select().from(apiTokens)) + JSON.stringify(await db.db.select().from(auditEvents));
    expect(everything).not.toContain(token);
    const [created] = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "api-token.created"), eq(auditEvents.entityId, id)));
    expect(created.actorId).toBe(kvAdmin.person.id);
  });

  it("allows each scope what it covers and refuses the rest with 403 insufficient_scope (RFC 6750 §3.1)", async () => {
    const read = await tokenFor(kvAdmin, ["read"]);
    const write = await tokenFor(kvAdmin, ["write"]);
    const both = await tokenFor(kvAdmin, ["read", "write"]);
    for (const [label, handler, path] of GET_ROUTES) {
      expect((await call(handler, apiRequest(path, { token: read.token }))).status, `${label} with read`).toBe(200);
      const refused = await call(handler, apiRequest(path, { token: write.token }));
      expect(refused.status, `${label} with write only`).toBe(403);
      expect(errorCode(refused.body)).toBe("insufficient_scope");
    }
    const [type] = await db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, kvAdmin.org.id));
    const body = { personId: kvAdmin.person.id, credentialTypeId: type.id, issuedOn: "2026-01-15", validThrough: "2028-01-31" };
    const byRead = await call(credentialsRoute.action as Handler, apiRequest("/api/v1/credentials", { method: "POST", token: read.token, body }));
    expect(byRead.status).toBe(403);
    expect(errorCode(byRead.body)).toBe("insufficient_scope");
    const byBoth = await call(credentialsRoute.action as Handler, apiRequest("/api/v1/credentials", { method: "POST", token: both.token, body }));
    expect(byBoth.status).toBe(201);
  });

  it("refuses a revoked token and an expired one with 401", async () => {
    const gone = await tokenFor(kvAdmin, ["read"]);
    expect(await revokeToken(kvAdmin.org.id, kvAdmin.person.id, gone.id)).toBe("revoked");
    const revoked = await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people", { token: gone.token }));
    expect(revoked.status).toBe(401);
    expect(errorCode(revoked.body)).toBe("token_revoked");
    const [event] = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "api-token.revoked"), eq(auditEvents.entityId, gone.id)));
    expect(event).toBeDefined();

    const old = await tokenFor(kvAdmin, ["read"], "2020-01-31");
    const expired = await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people", { token: old.token }));
    expect(expired.status).toBe(401);
    expect(errorCode(expired.body)).toBe("token_expired");

    const future = await tokenFor(kvAdmin, ["read"], "2099-12-31");
    expect((await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people", { token: future.token }))).status).toBe(200);

    const unknown = await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people", { token: "tmk_not-a-real-token" }));
    expect(unknown.status).toBe(401);
    expect(errorCode(unknown.body)).toBe("invalid_token");
  });

  it("ends an expiry date at midnight after it in the organisation's time zone", () => {
    // US daylight saving starts on the second Sunday of March (Energy Policy Act of 2005, §110):
    // 8 March 2026; Chicago is then UTC−5, so the day after the 8th begins at 05:00 UTC.
    expect(endOfDayIn("America/Chicago", "2026-03-08").toISOString()).toBe("2026-03-09T05:00:00.000Z");
    // In winter Chicago is UTC−6 (IANA tz database, America/Chicago).
    expect(endOfDayIn("America/Chicago", "2026-01-15").toISOString()).toBe("2026-01-16T06:00:00.000Z");
    expect(endOfDayIn("UTC", "2026-02-28").toISOString()).toBe("2026-03-01T00:00:00.000Z");
  });

  it("refuses a token in the address, even with a good header (RFC 6750 §5.3: don't pass tokens in page URLs)", async () => {
    const good = await tokenFor(kvAdmin, ["read"]);
    for (const name of ["token", "access_token"]) {
      const answer = await call(peopleRoute.loader as Handler, apiRequest(`/api/v1/people?${name}=${good.token}`, { token: good.token }));
      expect(answer.status).toBe(400);
      expect(errorCode(answer.body)).toBe("token_in_query");
      expect((answer.body as { error: { field?: string } }).error.field).toBe(name);
    }
  });

  it(`answers 429 with Retry-After past ${API_RATE_LIMIT.limit} calls a minute per token (RFC 6585 §4)`, async () => {
    const busy = await tokenFor(kvAdmin, ["read"]);
    const other = await tokenFor(kvAdmin, ["read"]);
    let lastOk = 0;
    for (let i = 1; i <= API_RATE_LIMIT.limit; i++) {
      const answer = await unitsRoute.loader(args<never>(apiRequest("/api/v1/units?limit=1", { token: busy.token }), null));
      if (answer.status === 200) lastOk = i;
    }
    // A fixed window may roll over during the loop; then fewer were counted in the new one.
    const over = await call(unitsRoute.loader as Handler, apiRequest("/api/v1/units", { token: busy.token }));
    if (lastOk === API_RATE_LIMIT.limit && over.status === 200) return; // the minute turned exactly here; nothing to judge
    expect(over.status).toBe(429);
    expect(errorCode(over.body)).toBe("rate_limited");
    const retry = Number(over.headers.get("Retry-After"));
    expect(retry).toBeGreaterThanOrEqual(1);
    expect(retry).toBeLessThanOrEqual(60);
    // The limit is per token: another token of the same organisation is still served.
    expect((await call(unitsRoute.loader as Handler, apiRequest("/api/v1/units", { token: other.token }))).status).toBe(200);
  });
});

describe("reads", () => {
  it("answers each list in the shape the OpenAPI document declares", async () => {
    const { token } = await tokenFor(kvAdmin, ["read"]);
    const shapes = { people: PersonPage, units: UnitPage, requirements: RequirementPage, "exam results": ExamResultPage, clearances: ClearancePage, credentials: CredentialPage };
    for (const [label, handler, path] of GET_ROUTES) {
      const answer = await call(handler, apiRequest(`${path}?limit=200`, { token }));
      expect(answer.status, label).toBe(200);
      expect(() => shapes[label as keyof typeof shapes].parse(answer.body), label).not.toThrow();
    }
    const units = UnitPage.parse((await call(unitsRoute.loader as Handler, apiRequest("/api/v1/units?limit=200", { token }))).body);
    expect(units.data.length).toBeGreaterThan(0);
  });

  it("pages people with an opaque cursor, every person exactly once", async () => {
    const { token } = await tokenFor(kvAdmin, ["read"]);
    const expected = await db.db.select({ id: people.id }).from(people).where(eq(people.orgId, kvAdmin.org.id));
    expect(expected.length).toBeGreaterThan(6);
    const seen: string[] = [];
    let cursor: string | null = null;
    let pages = 0;
    do {
      const q: string = cursor ? `?limit=4&cursor=${encodeURIComponent(cursor)}` : "?limit=4";
      const page = PersonPage.parse((await call(peopleRoute.loader as Handler, apiRequest(`/api/v1/people${q}`, { token }))).body);
      expect(page.data.length).toBeLessThanOrEqual(4);
      seen.push(...page.data.map((p) => p.id));
      cursor = page.nextCursor;
      pages++;
    } while (cursor && pages < 1000);
    expect(seen.length).toBe(expected.length);
    expect(new Set(seen).size).toBe(seen.length);
    expect([...seen].sort()).toEqual(expected.map((p) => p.id).sort());
    // The last page says so (nextCursor null) rather than leaving an empty page to fetch.
    expect(pages).toBe(Math.ceil(expected.length / 4));
  });

  it("names the field of a bad cursor or limit", async () => {
    const { token } = await tokenFor(kvAdmin, ["read"]);
    for (const [q, field] of [["?cursor=garbage", "cursor"], ["?limit=0", "limit"], ["?limit=5000", "limit"], ["?limit=abc", "limit"]]) {
      const answer = await call(peopleRoute.loader as Handler, apiRequest(`/api/v1/people${q}`, { token }));
      expect(answer.status, q).toBe(400);
      expect(errorCode(answer.body)).toBe("validation_failed");
      expect((answer.body as { error: { field?: string } }).error.field, q).toBe(field);
    }
  });

  it("keeps an organisation's token inside its organisation", async () => {
    const kv = await tokenFor(kvAdmin, ["read", "write"]);
    const abPeople = await db.db.select({ id: people.id }).from(people).where(eq(people.orgId, abAdmin.org.id));
    expect(abPeople.length).toBeGreaterThan(0);
    const listed = PersonPage.parse((await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people?limit=200", { token: kv.token }))).body);
    const abIds = new Set(abPeople.map((p) => p.id));
    expect(listed.data.length).toBeGreaterThan(0);
    expect(listed.data.filter((p) => abIds.has(p.id))).toEqual([]);
    expect(listed.data.every((p) => !p.email.endsWith("@alderbay.test"))).toBe(true);

    const status = await call(statusRoute.loader as Handler, apiRequest(`/api/v1/people/${abAdmin.person.id}/status`, { token: kv.token }), { personId: abAdmin.person.id });
    expect(status.status).toBe(404);
    expect(errorCode(status.body)).toBe("not_found");

    const [abCredential] = await db.db.select({ id: credentials.id }).from(credentials).where(eq(credentials.orgId, abAdmin.org.id));
    if (abCredential) {
      const one = await call(credentialRoute.loader as Handler, apiRequest(`/api/v1/credentials/${abCredential.id}`, { token: kv.token }), { credentialId: abCredential.id });
      expect(one.status).toBe(404);
      const patched = await call(credentialRoute.action as Handler, apiRequest(`/api/v1/credentials/${abCredential.id}`, { method: "PATCH", token: kv.token, body: { number: "X" } }), { credentialId: abCredential.id });
      expect(patched.status).toBe(404);
    }
    const filtered = CredentialPage.parse((await call(credentialsRoute.loader as Handler, apiRequest(`/api/v1/credentials?personId=${abAdmin.person.id}`, { token: kv.token }))).body);
    expect(filtered.data).toEqual([]);

    const [kvType] = await db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, kvAdmin.org.id));
    const cross = await call(credentialsRoute.action as Handler, apiRequest("/api/v1/credentials", { method: "POST", token: kv.token, body: { personId: abAdmin.person.id, credentialTypeId: kvType.id, issuedOn: "2026-01-15" } }));
    expect(cross.status).toBe(400);
    expect((cross.body as { error: { field?: string } }).error.field).toBe("personId");
  });

  it("answers a person's status with the status engine's rows", async () => {
    const { token } = await tokenFor(kvAdmin, ["read"]);
    const therapist = await viewerFor("therapist@kestrelvalley.test");
    const answer = await call(statusRoute.loader as Handler, apiRequest(`/api/v1/people/${therapist.person.id}/status`, { token }), { personId: therapist.person.id });
    expect(answer.status).toBe(200);
    const status = PersonStatusSchema.parse(answer.body);
    expect(status.personId).toBe(therapist.person.id);
    expect(status.rows.length).toBeGreaterThan(0);
    for (const row of status.rows) {
      // The day it next changes lies after today (it is a future change), when there is one.
      if (row.nextChangeOn) expect(row.nextChangeOn > status.today, row.title).toBe(true);
    }
  });

  it("filters exam results by person and lists only closed attempts", async () => {
    const { token } = await tokenFor(kvAdmin, ["read"]);
    const all = ExamResultPage.parse((await call(examResultsRoute.loader as Handler, apiRequest("/api/v1/exam-results?limit=200", { token }))).body);
    // The demo seed has graded sittings (item analysis needs them).
    expect(all.data.length).toBeGreaterThan(0);
    expect(all.data.every((r) => r.submittedAt.length > 0)).toBe(true);
    const someone = all.data[0].person.id;
    const mine = ExamResultPage.parse((await call(examResultsRoute.loader as Handler, apiRequest(`/api/v1/exam-results?limit=200&personId=${someone}`, { token }))).body);
    expect(mine.data.length).toBe(all.data.filter((r) => r.person.id === someone).length);
    expect(mine.data.every((r) => r.person.id === someone)).toBe(true);
    const exam = all.data[0].exam.id;
    const byExam = ExamResultPage.parse((await call(examResultsRoute.loader as Handler, apiRequest(`/api/v1/exam-results?limit=200&examId=${exam}`, { token }))).body);
    expect(byExam.data.every((r) => r.exam.id === exam)).toBe(true);
  });
});

describe("credential writes", () => {
  let token: string;
  let tokenId: string;
  let typeId: string;
  let personId: string;
  beforeAll(async () => {
    ({ token, id: tokenId } = await tokenFor(kvAdmin, ["read", "write"]));
    const [type] = await db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, kvAdmin.org.id));
    typeId = type.id;
    personId = (await viewerFor("therapist@kestrelvalley.test")).person.id;
  });

  const post = (body: unknown) => call(credentialsRoute.action as Handler, apiRequest("/api/v1/credentials", { method: "POST", token, body }));

  it("refuses an impossible date and names the field, as the page does", async () => {
    const bad = await post({ personId, credentialTypeId: typeId, issuedOn: "2026-02-30" });
    expect(bad.status).toBe(400);
    expect(errorCode(bad.body)).toBe("validation_failed");
    const error = (bad.body as { error: { field: string; message: string } }).error;
    expect(error.field).toBe("issuedOn");
    expect(error.message).toMatch(/no such day/i);

    const backwards = await post({ personId, credentialTypeId: typeId, issuedOn: "2026-03-01", validThrough: "2025-03-01" });
    expect(backwards.status).toBe(400);
    expect((backwards.body as { error: { field: string } }).error.field).toBe("validThrough");

    const missing = await post({ personId, issuedOn: "2026-03-01" });
    expect((missing.body as { error: { field: string } }).error.field).toBe("credentialTypeId");

    const notJson = await call(credentialsRoute.action as Handler, new Request(new URL("/api/v1/credentials", TEST_ORIGIN), { method: "POST", headers: { Authorization: `Bearer ${token}`, "Content-Type": "application/json" }, body: "{nope" }));
    expect(notJson.status).toBe(400);
    expect(errorCode(notJson.body)).toBe("invalid_json");
  });

  it("records a credential audited with the token as the actor", async () => {
    const made = await post({ personId, credentialTypeId: typeId, number: "API-1", issuedOn: "2026-01-15", validThrough: "2028-01-31" });
    expect(made.status).toBe(201);
    const credential = CredentialSchema.parse(made.body);
    expect(credential).toMatchObject({ personId, credentialTypeId: typeId, number: "API-1", issuedOn: "2026-01-15", validThrough: "2028-01-31", verified: false });
    expect(made.headers.get("Location")).toBe(`/api/v1/credentials/${credential.id}`);
    const [event] = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "credential.recorded"), eq(auditEvents.entityId, credential.id)));
    expect(event.actorId).toBeNull();
    expect(JSON.parse(event.detail as unknown as string)).toMatchObject({ tokenId, via: "api" });

    const read = await call(credentialRoute.loader as Handler, apiRequest(`/api/v1/credentials/${credential.id}`, { token }), { credentialId: credential.id });
    expect(read.body).toEqual(made.body);
  });

  it("changes a credential with PATCH, validated against the stored dates, audited", async () => {
    const made = CredentialSchema.parse((await post({ personId, credentialTypeId: typeId, issuedOn: "2026-01-15", validThrough: "2028-01-31" })).body);
    const patch = (body: unknown) => call(credentialRoute.action as Handler, apiRequest(`/api/v1/credentials/${made.id}`, { method: "PATCH", token, body }), { credentialId: made.id });

    const impossible = await patch({ validThrough: "2027-02-29" });
    expect(impossible.status).toBe(400);
    expect((impossible.body as { error: { field: string } }).error.field).toBe("validThrough");
    // Before the stored issue date: refused although the date itself exists.
    const early = await patch({ validThrough: "2025-12-31" });
    expect((early.body as { error: { field: string } }).error.field).toBe("validThrough");
    const fixed = await patch({ personId: "someone-else" });
    expect((fixed.body as { error: { field: string } }).error.field).toBe("personId");

    const changed = await patch({ number: "NEW-2", validThrough: "2028-02-29" });
    expect(changed.status).toBe(200);
    expect(CredentialSchema.parse(changed.body)).toMatchObject({ number: "NEW-2", issuedOn: "2026-01-15", validThrough: "2028-02-29" });
    const [event] = await db.db.select().from(auditEvents).where(and(eq(auditEvents.action, "credential.updated"), eq(auditEvents.entityId, made.id)));
    expect(event.actorId).toBeNull();
    expect(JSON.parse(event.detail as unknown as string)).toMatchObject({ tokenId, changes: { number: { from: null, to: "NEW-2" }, validThrough: { from: "2028-01-31", to: "2028-02-29" } } });
  });
});

describe("the OpenAPI document", () => {
  it("validates against the OpenAPI 3.1 schema with an independent validator", async () => {
    const doc = (await call(openapiRoute.loader as Handler, apiRequest("/api/v1/openapi.json"))).body!;
    const validator = new Validator();
    const result = await validator.validate(doc);
    expect(result.errors ?? [], JSON.stringify(result.errors)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(validator.version).toBe("3.1");
  });

  it("has every /api/v1 route of app/routes.ts with each method, a bearer scheme, and a security per operation", async () => {
    const doc = (await call(openapiRoute.loader as Handler, apiRequest("/api/v1/openapi.json"))).body as {
      paths: Record<string, Record<string, { security: unknown[]; responses: Record<string, unknown> }>>;
      components: { securitySchemes: Record<string, { type: string; scheme: string }>; schemas: Record<string, unknown> };
    };
    const apiRoutes = routePatterns().map((r) => r.pattern).filter((p) => p.startsWith("/api/v1/"));
    expect(apiRoutes.length).toBeGreaterThanOrEqual(9);
    const documented = Object.keys(doc.paths).map((p) => `/api/v1${p.replace(/^\/api\/v1/, "")}`);
    for (const route of apiRoutes) expect(documented, route).toContain(openApiPath(route));
    expect(doc.components.securitySchemes.bearer).toEqual(expect.objectContaining({ type: "http", scheme: "bearer" }));
    expect(Object.keys(doc.paths["/api/v1/credentials"]).sort()).toEqual(["get", "post"]);
    expect(Object.keys(doc.paths["/api/v1/credentials/{credentialId}"]).sort()).toEqual(["get", "patch"]);
    for (const e of API_ENDPOINTS) {
      const op = doc.paths[openApiPath(e.route)][e.method];
      expect(op.security.length > 0, `${e.method} ${e.route}`).toBe(ROUTE_ACCESS[e.route]?.who === "token");
      if (e.scope) expect(Object.keys(op.responses)).toEqual(expect.arrayContaining(["401", "403", "429"]));
    }
    for (const name of ["Person", "Unit", "Requirement", "PersonStatus", "ExamResult", "Clearance", "Credential", "CredentialCreate", "CredentialUpdate", "Error"]) {
      expect(doc.components.schemas, name).toHaveProperty(name);
    }
  });
});


describe("Admin → API", () => {
  it("creates a token shown once, lists it by prefix, and revokes it only when confirmed", async () => {
    const adminApi = await import("~/routes/admin/api");
    const { postForm } = await import("../setup/request");
    const created = (await adminApi.action(args<never>(postForm("/admin/api", { intent: "create-token", name: "Staffing system", scopes: ["read", "write"], expiresOn: "2099-06-30" }), kvAdmin))) as {
      created: { token: string; prefix: string } | null;
    };
    expect(created.created?.token).toMatch(/^tmk_/);
    const token = created.created!.token;
    // The token works, and the list shows only its prefix (never the token) with its scopes.
    expect((await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people?limit=1", { token }))).status).toBe(200);
    const listed = await adminApi.loader(args<never>(new Request(new URL("/admin/api", TEST_ORIGIN)), kvAdmin));
    const row = listed.tokens.find((t) => t.name === "Staffing system")!;
    expect(row).toMatchObject({ prefix: created.created!.prefix, scopes: ["read", "write"], state: "active", createdByName: kvAdmin.person.name });
    expect(JSON.stringify(listed)).not.toContain(token);
    expect(listed.endpoints.map((e) => `${e.method} ${e.path}`)).toEqual(API_ENDPOINTS.map((e) => `${e.method.toUpperCase()} ${openApiPath(e.route)}`));

    // A past expiry date and no scope are refused with the field named.
    const refused = await adminApi.action(args<never>(postForm("/admin/api", { intent: "create-token", name: "Old", scopes: [], expiresOn: "2020-01-01" }), kvAdmin));
    expect(JSON.stringify(refused)).toContain("scopes");

    // Without confirm=yes nothing is revoked; with it, the token stops working.
    await adminApi.action(args<never>(postForm("/admin/api", { intent: "revoke-token", tokenId: row.id }), kvAdmin));
    expect((await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people?limit=1", { token }))).status).toBe(200);
    await adminApi.action(args<never>(postForm("/admin/api", { intent: "revoke-token", tokenId: row.id, confirm: "yes" }), kvAdmin));
    const after = await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people?limit=1", { token }));
    expect(errorCode(after.body)).toBe("token_revoked");

    // Another organisation's admin cannot revoke it (the id is not theirs).
    const other = await tokenFor(kvAdmin, ["read"]);
    const cross = await adminApi.action(args<never>(postForm("/admin/api", { intent: "revoke-token", tokenId: other.id, confirm: "yes" }), abAdmin));
    expect(JSON.stringify(cross)).toContain("already revoked or is not one of your organisation");
    expect((await call(peopleRoute.loader as Handler, apiRequest("/api/v1/people?limit=1", { token: other.token }))).status).toBe(200);
  });

  it("refuses a signed-in person without api-tokens:manage", async () => {
    const adminApi = await import("~/routes/admin/api");
    const manager = await viewerFor("manager@kestrelvalley.test");
    await expect(adminApi.loader(args<never>(new Request(new URL("/admin/api", TEST_ORIGIN)), manager))).rejects.toMatchObject({ init: { status: 403 } });
  });
});

describe("the root middleware and the API", () => {
  it("lets a cross-site token call without our session cookie through, and still refuses a cross-site write carrying the cookie", async () => {
    const { sessionMiddleware } = await import("~/auth/gate.server");
    const { SESSION_COOKIE_NAME } = await import("~/auth/session.server");
    const { contextFor } = await import("../setup/request");
    const { token } = await tokenFor(kvAdmin, ["read", "write"]);
    const reached: string[] = [];
    const next = async () => {
      reached.push("route");
      return new Response("{}", { status: 200 });
    };
    // A server-to-server client: Authorization header, a foreign Origin, no cookie.
    const tokenOnly = new Request(new URL("/api/v1/credentials", TEST_ORIGIN), { method: "POST", headers: { Authorization: `Bearer ${token}`, Origin: "https://hr.example.org" } });
    const passed = await sessionMiddleware({ request: tokenOnly, context: contextFor(null), params: {}, unstable_pattern: "" } as never, next as never);
    expect((passed as Response).status).toBe(200);
    expect(reached).toEqual(["route"]);
    // The same call from another site carrying our session cookie is refused before the route (CSRF, OWASP ASVS 4.0.3 V4.2.2).
    const both = new Request(new URL("/api/v1/credentials", TEST_ORIGIN), {
      method: "POST",
      headers: { Authorization: `Bearer ${token}`, Origin: "https://evil.example", Cookie: `${SESSION_COOKIE_NAME}=anything` },
    });
    await expect(sessionMiddleware({ request: both, context: contextFor(null), params: {}, unstable_pattern: "" } as never, next as never)).rejects.toMatchObject({ init: { status: 403 } });
    expect(reached).toEqual(["route"]);
  });
});
