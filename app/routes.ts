import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

/**
 * Every address of Tidemark, grouped by section. Each route here must also have a row in
 * app/auth/route-access.ts (the authorisation table); a test fails when one is missing.
 */
export default [
  index("routes/home.tsx"),
  route("healthz", "routes/api/healthz.ts"),

  // Sign-in and sign-out
  route("login", "routes/auth/login.tsx"),
  route("login/code", "routes/auth/login-code.tsx"),
  route("login/magic", "routes/auth/login-magic.tsx"),
  route("logout", "routes/auth/logout.ts"),

  // Demo mode only: the local e-mail fake's messages
  route("dev/outbox", "routes/dev/outbox.tsx"),

  // The signed-in product: the shell (top bar, section strip), each section gated in its layout
  layout("routes/shell.tsx", [
    route("today", "routes/today/index.tsx"),
    layout("routes/plan/layout.tsx", [route("plan", "routes/plan/index.tsx")]),
    layout("routes/bench/layout.tsx", [route("bench", "routes/bench/index.tsx")]),
    layout("routes/team/layout.tsx", [route("team", "routes/team/index.tsx")]),
    ...prefix("admin", [
      layout("routes/admin/layout.tsx", [
        index("routes/admin/index.tsx"),
        route("units", "routes/admin/units.tsx"),
        route("people", "routes/admin/people.tsx"),
        route("people/new", "routes/admin/person-new.tsx"),
        route("people/:personId", "routes/admin/person.tsx"),
      ]),
    ]),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
