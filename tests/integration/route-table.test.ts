/**
 * The authorisation table (app/auth/route-access.ts) and the route list (app/routes.ts) name
 * the same addresses: a new route without a row, or a row left behind by a removed route,
 * fails here in a second, before the browser suite (tests/e2e/authorisation.spec.ts) checks
 * what each row allows. OWASP ASVS 4.0.3 V4.1.3 (least privilege) needs every route decided.
 */
import { describe, expect, it } from "vitest";
import { mayUse, rolesFor, ROUTE_ACCESS } from "~/auth/route-access";
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
});
