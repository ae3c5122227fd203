import { can, ROLES, type Permission, type Role } from "./roles";

/**
 * The authorisation table: every route in app/routes.ts, by its path pattern, with who may use
 * it. tests/e2e/authorisation.spec.ts requests each route as an anonymous visitor and as each
 * role (as a document and as a client data request) and compares the answer with this table;
 * a route missing here fails that test.
 */
export type Access =
  /** Anyone, signed in or not (sign-in pages, health check, public verification). */
  | { who: "public"; note?: string }
  /** Only in demo mode (404 otherwise); no sign-in, so a newcomer can read the sign-in code. */
  | { who: "demo"; note?: string }
  /** Any signed-in person. */
  | { who: "signed-in"; note?: string }
  /** Signed in and holding this permission; 403 otherwise. */
  | { who: "permission"; permission: Permission; note?: string };

export const ROUTE_ACCESS: Record<string, Access> = {
  "/": { who: "public", note: "redirects to /today or /login" },
  "/healthz": { who: "public" },
  "/login": { who: "public" },
  "/login/code": { who: "public" },
  "/login/magic": { who: "public" },
  "/logout": { who: "public", note: "POST only; GET redirects" },
  "/dev/outbox": { who: "demo" },
  "/today": { who: "signed-in" },
  "/plan": { who: "permission", permission: "section:plan" },
  "/bench": { who: "permission", permission: "section:bench" },
  "/team": { who: "permission", permission: "section:team" },
  "/admin": { who: "permission", permission: "section:admin" },
  "/admin/units": { who: "permission", permission: "section:admin" },
  "/admin/people": { who: "permission", permission: "section:admin" },
  "/admin/people/new": { who: "permission", permission: "section:admin" },
  "/admin/people/:personId": { who: "permission", permission: "section:admin" },
  "*": { who: "public", note: "our own 404 page" },
};

/** May a person with these roles (none = anonymous) use the route? */
export function mayUse(access: Access, roles: readonly Role[] | null): boolean {
  switch (access.who) {
    case "public":
    case "demo":
      return true;
    case "signed-in":
      return roles !== null;
    case "permission":
      return roles !== null && can(roles, access.permission);
  }
}

/** Roles that may use a route, for the README and reports. */
export function rolesFor(access: Access): Role[] {
  return ROLES.filter((r) => mayUse(access, [r]));
}
