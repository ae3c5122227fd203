/**
 * The authorisation table (app/auth/route-access.ts) and the route list (app/routes.ts) name
 * the same addresses: a new route without a row, or a row left behind by a removed route,
 * fails here in a second, before the browser suite (tests/e2e/authorisation.spec.ts) checks
 * what each row allows. OWASP ASVS 4.0.3 V4.1.3 (least privilege) needs every route decided.
 */
import { describe, expect, it } from "vitest";
import { mayUse, opensRecord, RECORD_KINDS, rolesFor, ROUTE_ACCESS, type RecordRule } from "~/auth/route-access";
import { PERMISSIONS, ROLES } from "~/auth/roles";
import { routePatterns } from "../fixtures/route-patterns";

describe("authorisation table", () => {
  const patterns = routePatterns().map((r) => r.pattern);

  it("flattens app/routes.ts into the addresses a visitor can open", () => {
    // A sample that must be there whatever else is added: the sign-in page, a nested admin
    // page with a parameter, and the catch-all 404.
    expect(patterns).toEqual(expect.arrayContaining(["/", "/login", "/today", "/admin/people/:personId", "*"]));
    expect(new Set(patterns).size).toBe(patterns.length);
  });

  it("has a row for every route in app/routes.ts", () => {
    const missing = patterns.filter((p) => !(p in ROUTE_ACCESS));
    expect(missing, "routes without a row in ROUTE_ACCESS").toEqual([]);
  });

  it("has no row for a route that app/routes.ts does not have", () => {
    const stale = Object.keys(ROUTE_ACCESS).filter((p) => !patterns.includes(p));
    expect(stale, "ROUTE_ACCESS rows without a route").toEqual([]);
  });

  it("opens every /api/v1 route but the OpenAPI document with a bearer token only, and nothing else with one", () => {
    for (const [pattern, access] of Object.entries(ROUTE_ACCESS)) {
      const isApi = pattern.startsWith("/api/v1/") && pattern !== "/api/v1/openapi.json";
      expect(access.who === "token", pattern).toBe(isApi);
      // No role opens a token route: a session never stands in for a token.
      if (access.who === "token") {
        expect(["read", "write"], pattern).toContain(access.scope);
        expect(rolesFor(access), pattern).toEqual([]);
        for (const role of ROLES) expect(mayUse(access, [role]), `${pattern} as ${role}`).toBe(false);
        expect(mayUse(access, null), `${pattern} anonymous`).toBe(false);
      }
    }
    expect(ROUTE_ACCESS["/api/v1/openapi.json"]?.who).toBe("public");
  });

  it("names only permissions that exist", () => {
    for (const [pattern, access] of Object.entries(ROUTE_ACCESS)) {
      if (access.who === "permission") expect(PERMISSIONS, pattern).toContain(access.permission);
    }
  });

  const recordRows = () =>
    Object.entries(ROUTE_ACCESS).flatMap(([pattern, access]) => (access.who === "permission" && access.recordScoped ? [{ pattern, access }] : []));

  it("states who opens the record of every record-scoped route, and only of those", () => {
    const rows = recordRows();
    // The record routes issue 11 names: attempts, check-offs (and their evidence), scans, certificates.
    expect(rows.map((r) => r.pattern)).toEqual(
      expect.arrayContaining([
        "/exams/attempts/:attemptId",
        "/exams/attempts/:attemptId/result",
        "/checkoffs/:checkoffId",
        "/checkoffs/:checkoffId/evidence/:evidenceId",
        "/credentials/:credentialId/scan",
        "/credentials/certificates/:certificateId",
      ]),
    );
    for (const { pattern, access } of rows) {
      expect(access.record, `${pattern}: record-scoped without a record rule`).toBeDefined();
      expect(RECORD_KINDS, pattern).toContain(access.record?.record);
      const others = access.record?.others;
      if (others?.who === "organisation") for (const p of others.anyOf) expect(PERMISSIONS, pattern).toContain(p);
      if (others?.who === "managed-units") expect(PERMISSIONS, pattern).toContain(others.permission);
    }
    for (const [pattern, access] of Object.entries(ROUTE_ACCESS)) {
      if (!(access.who === "permission" && access.recordScoped)) expect("record" in access && access.record !== undefined, `${pattern}: a record rule on a route that is not record-scoped`).toBe(false);
    }
  });

  it("never opens another organisation's record, whatever the roles", () => {
    for (const { pattern, access } of recordRows()) {
      const rule = access.record as RecordRule;
      for (const isOwner of [true, false]) {
        for (const managesOwner of [true, false]) {
          expect(opensRecord(rule, { roles: [...ROLES], sameOrganisation: false, isOwner, managesOwner }), pattern).toBe(false);
        }
      }
    }
  });

  it("decides the record routes as their loaders do (spot checks of the rules)", () => {
    const rule = (pattern: string) => {
      const access = ROUTE_ACCESS[pattern];
      if (access?.who !== "permission" || !access.record) throw new Error(`${pattern} has no record rule`);
      return access.record;
    };
    const viewer = (roles: (typeof ROLES)[number][], isOwner: boolean, managesOwner = false) => ({ roles, sameOrganisation: true, isOwner, managesOwner });
    // resultView: the examinee, or an educator (bank:write) of the organisation; a manager is not.
    expect(opensRecord(rule("/exams/attempts/:attemptId/result"), viewer(["therapist"], true))).toBe(true);
    expect(opensRecord(rule("/exams/attempts/:attemptId/result"), viewer(["therapist", "educator"], false))).toBe(true);
    expect(opensRecord(rule("/exams/attempts/:attemptId/result"), viewer(["manager"], false, true))).toBe(false);
    // takingView / ownAttempt: only the examinee; the answers route takes POST only.
    expect(opensRecord(rule("/exams/attempts/:attemptId"), viewer(["therapist", "educator"], false))).toBe(false);
    expect(opensRecord(rule("/exams/attempts/:attemptId/answers"), viewer(["therapist"], true))).toBe(false);
    // mayActFor: the holder, or a manager of one of their units; an educator is neither.
    expect(opensRecord(rule("/credentials/:credentialId/scan"), viewer(["manager"], false, true))).toBe(true);
    expect(opensRecord(rule("/credentials/:credentialId/scan"), viewer(["manager"], false, false))).toBe(false);
    expect(opensRecord(rule("/credentials/certificates/:certificateId"), viewer(["therapist", "educator"], false))).toBe(false);
    // canViewCheckoff: own, preceptors, educators, managers — not another plain therapist.
    expect(opensRecord(rule("/checkoffs/:checkoffId"), viewer(["therapist", "preceptor"], false))).toBe(true);
    expect(opensRecord(rule("/checkoffs/:checkoffId"), viewer(["therapist"], false))).toBe(false);
    // matrixScopeFor: educators the whole organisation, managers the units they manage — themselves included only so.
    expect(opensRecord(rule("/team/people/:personId/requirements/:requirementId"), viewer(["therapist", "educator"], false))).toBe(true);
    expect(opensRecord(rule("/reports/packet.pdf"), viewer(["manager"], true, false))).toBe(false);
    expect(opensRecord(rule("/reports/packet.pdf"), viewer(["manager"], false, true))).toBe(true);
  });
});
