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
  /**
   * The JSON API: a bearer token with this scope (app/api/token.server.ts), never the session.
   * Without a token every visitor, signed in or not, gets 401 with a JSON error; no role grants
   * it. POST/PATCH on a read route need the write scope (see the note).
   */
  | { who: "token"; scope: "read" | "write"; note?: string }
  /** Signed in and holding this permission; 403 otherwise. */
  | {
      who: "permission";
      permission: Permission;
      note?: string;
      /**
       * The route opens one person's record (an attempt, a check-off, a scan, a certificate…):
       * a permitted person whom `record` does not let open it gets the same 404 as for a record
       * that does not exist (no probing of ids). Every record-scoped row states its `record` rule.
       */
      recordScoped?: true;
      record?: RecordRule;
    };

/** The kinds of record a record-scoped route opens (the e2e matrix looks them up by kind). */
export const RECORD_KINDS = ["attempt", "checkoff", "checkoff-evidence", "credential-scan", "certificate", "person-requirement", "person"] as const;
export type RecordKind = (typeof RECORD_KINDS)[number];

/**
 * Who opens a record-scoped route's record. A record of another organisation is never opened:
 * every permitted viewer gets 404, as for a record that does not exist (OWASP ASVS 4.0.3 V4.2.1,
 * insecure direct object references).
 */
export type RecordRule = {
  record: RecordKind;
  /**
   * The person the record belongs to: "opens" it (200; the taking page of a closed attempt sends
   * its owner to the result instead); "post-only" — a GET answers 404 to everyone, the route
   * only takes POST; "like-others" — the owner is judged by `others` like anyone else.
   */
  owner: "opens" | "post-only" | "like-others";
  /** Who opens the record of another person of the viewer's organisation. */
  others: OthersRule;
};

export type OthersRule =
  /** Nobody but the owner. */
  | { who: "nobody" }
  /** Anyone of the organisation holding one of these permissions. */
  | { who: "organisation"; anyOf: readonly Permission[] }
  /**
   * Holders of `permission` for the people on a unit they manage (home or member unit);
   * holders of a `wholeOrganisation` role (with the permission) for everyone of the organisation.
   */
  | { who: "managed-units"; permission: Permission; wholeOrganisation?: readonly Role[] };

/** The record rules used by several rows. */
const OWN_ONLY: OthersRule = { who: "nobody" };
/** mayActFor (app/db/queries/credentials.server.ts): the holder, or a manager of one of their units. */
const HOLDER_OR_MANAGER: OthersRule = { who: "managed-units", permission: "credentials:verify" };
/** matrixScopeFor (app/db/queries/team-matrix.server.ts): educators the whole organisation, managers their units. */
const TEAM_SCOPE = (permission: Permission): OthersRule => ({ who: "managed-units", permission, wholeOrganisation: ["educator"] });
/** canViewCheckoff (app/auth/checkoff-policy.ts): own, preceptors, educators and managers. */
const CHECKOFF_READERS: OthersRule = { who: "organisation", anyOf: ["checkoffs:observe", "checklists:write", "team:read"] };

export const ROUTE_ACCESS: Record<string, Access> = {
  "/": { who: "public", note: "redirects to /today or /login" },
  "/healthz": { who: "public" },
  "/api/v1/openapi.json": { who: "public", note: "the OpenAPI 3.1 document" },
  "/api/v1/people": { who: "token", scope: "read", note: "API (app/api): 401 JSON without a bearer token, whatever the session" },
  "/api/v1/people/:personId/status": { who: "token", scope: "read", note: "the status engine's rows for one person of the token's organisation" },
  "/api/v1/units": { who: "token", scope: "read" },
  "/api/v1/requirements": { who: "token", scope: "read" },
  "/api/v1/exam-results": { who: "token", scope: "read" },
  "/api/v1/exam-attempts/:attemptId": { who: "token", scope: "read", note: "an attempt's progress, as the exam page's save reply says it; never answers or keys" },
  "/api/v1/team-matrix": { who: "token", scope: "read", note: "the Team matrix of the organisation, filtered as the page filters" },
  "/api/v1/clearances": { who: "token", scope: "read" },
  "/api/v1/credentials": { who: "token", scope: "read", note: "GET needs read; POST needs the write scope" },
  "/api/v1/credentials/:credentialId": { who: "token", scope: "read", note: "GET needs read; PATCH needs the write scope" },
  "/calendar/:token": { who: "public", note: "iCalendar feed; the unguessable token in the address is the key; unknown token 404" },
  "/verify/:code": { who: "public", note: "name, what was met, dates and valid / expired / revoked only; an unknown code is a bare 404" },
  "/login": { who: "public" },
  "/login/code": { who: "public" },
  "/login/magic": { who: "public" },
  "/logout": { who: "public", note: "POST only; GET redirects" },
  "/dev/outbox": { who: "demo" },
  "/dev/fault": { who: "demo", note: "?raise=1 answers a deliberate 500 (the error page and its headers)" },
  "/today": { who: "signed-in" },
  "/plan": { who: "permission", permission: "section:plan" },
  "/plan/calendar": { who: "permission", permission: "section:plan", note: "the person's private calendar address; managers also their units' expiries feed" },
  "/plan/reminders": { who: "permission", permission: "section:plan", note: "the person's own choice: separate reminder e-mails or one daily digest" },
  "/clearance": { who: "permission", permission: "section:clearance", note: "who is independent, supervised or not cleared for each skill today, per unit" },
  "/reports": { who: "permission", permission: "reports:read", note: "the list of reports and the 12-month compliance trend" },
  "/reports/compliance": { who: "permission", permission: "reports:read", note: "compliance by unit as recorded by the end of a chosen day" },
  "/reports/compliance.csv": { who: "permission", permission: "reports:read" },
  "/reports/compliance.pdf": { who: "permission", permission: "reports:read" },
  "/reports/expiries": { who: "permission", permission: "reports:read", note: "credentials and requirements ending in a date range" },
  "/reports/expiries.csv": { who: "permission", permission: "reports:read" },
  "/reports/expiries.pdf": { who: "permission", permission: "reports:read" },
  "/reports/completions": { who: "permission", permission: "reports:read", note: "completions by exam or checklist in a date range" },
  "/reports/completions.csv": { who: "permission", permission: "reports:read" },
  "/reports/completions.pdf": { who: "permission", permission: "reports:read" },
  "/reports/packet": { who: "permission", permission: "reports:read", note: "choose one person or a unit for the survey evidence packet" },
  "/reports/packet.pdf": { who: "permission", permission: "reports:read", recordScoped: true, record: { record: "person", owner: "like-others", others: TEAM_SCOPE("reports:read") }, note: "the survey evidence packet; ?person= or ?unit=; 404 without one, or for a person or unit outside the viewer's organisation" },
  "/exams": { who: "permission", permission: "section:exams", note: "own assignments, exams open to take and own history" },
  "/exams/:examId/start": { who: "permission", permission: "section:exams", note: "404 for an exam not published in the viewer's organisation" },
  "/exams/attempts/:attemptId": { who: "permission", permission: "section:exams", recordScoped: true, record: { record: "attempt", owner: "opens", others: OWN_ONLY }, note: "404 unless the viewer's own attempt; a closed one sends its owner to the result" },
  "/exams/attempts/:attemptId/answers": { who: "permission", permission: "section:exams", recordScoped: true, record: { record: "attempt", owner: "post-only", others: OWN_ONLY }, note: "POST only: saves one answer of the viewer's own open attempt" },
  "/exams/attempts/:attemptId/result": { who: "permission", permission: "section:exams", recordScoped: true, record: { record: "attempt", owner: "opens", others: { who: "organisation", anyOf: ["bank:write"] } }, note: "404 unless the viewer's own attempt, or an educator of the organisation" },
  "/bench": { who: "permission", permission: "section:bench" },
  "/team": { who: "permission", permission: "section:team" },
  "/team/requirements": { who: "permission", permission: "team:read" },
  "/team/matrix": { who: "permission", permission: "team:read" },
  "/team/matrix/export": { who: "permission", permission: "team:read" },
  "/team/people/:personId/requirements/:requirementId": {
    who: "permission",
    permission: "team:read",
    recordScoped: true,
    record: { record: "person-requirement", owner: "like-others", others: TEAM_SCOPE("team:read") },
    note: "404 outside the viewer's units or when the requirement does not apply; waivers and extensions need team:manage",
  },
  "/team/accommodations": { who: "permission", permission: "exams:accommodate", note: "educators and managers: extra time or an untimed sitting" },
  "/credentials": { who: "permission", permission: "section:credentials" },
  "/credentials/certificates/:certificateId": {
    who: "permission",
    permission: "section:credentials",
    recordScoped: true,
    record: { record: "certificate", owner: "opens", others: HOLDER_OR_MANAGER },
    note: "404 unless the holder or a manager of their unit; managers revoke (credentials:verify)",
  },
  "/credentials/certificates/:certificateId/certificate.pdf": { who: "permission", permission: "section:credentials", recordScoped: true, record: { record: "certificate", owner: "opens", others: HOLDER_OR_MANAGER }, note: "404 unless the holder or a manager of their unit" },
  "/credentials/:credentialId/scan": { who: "permission", permission: "section:credentials", recordScoped: true, record: { record: "credential-scan", owner: "opens", others: HOLDER_OR_MANAGER }, note: "404 unless the holder or a manager of their unit" },
  "/bank": { who: "permission", permission: "section:bank" },
  "/bank/items/new": { who: "permission", permission: "section:bank" },
  "/bank/items/:itemId": { who: "permission", permission: "section:bank", note: "unpublished items too: educators only" },
  "/bank/items/:itemId/edit": { who: "permission", permission: "section:bank" },
  "/bank/items/:itemId/versions/:version": { who: "permission", permission: "section:bank" },
  "/bank/import": { who: "permission", permission: "section:bank" },
  "/bank/export": { who: "permission", permission: "section:bank", note: "CSV or JSON file" },
  "/bank/exams": { who: "permission", permission: "section:bank" },
  "/bank/exams/new": { who: "permission", permission: "section:bank" },
  "/bank/exams/:examId": { who: "permission", permission: "section:bank", note: "versions, assignments and attempts of one exam" },
  "/bank/exams/:examId/edit": { who: "permission", permission: "section:bank", note: "saves a new version" },
  "/bank/exams/:examId/analysis": { who: "permission", permission: "section:bank", note: "item analysis of the exam's graded attempts" },
  "/bank/exams/:examId/analysis.csv": { who: "permission", permission: "section:bank", note: "the item analysis as a CSV file" },
  "/bank/exams/:examId/analysis.pdf": { who: "permission", permission: "section:bank", note: "the item analysis on one page, for the education committee" },
  "/bank/exams/:examId/cut-score": { who: "permission", permission: "section:bank", note: "modified Angoff panel; rating and adopting need bank:write" },
  "/checkoffs": { who: "permission", permission: "section:checkoffs", note: "own check-offs; preceptors also those to observe; educators and managers read" },
  "/checkoffs/signing-pin": { who: "permission", permission: "section:checkoffs" },
  "/checkoffs/orientation": { who: "permission", permission: "section:checkoffs", note: "own plan; a preceptor's orientees; managers and educators all" },
  "/checkoffs/checklists": { who: "permission", permission: "section:checkoffs", note: "educators write (checklists:write); others read" },
  "/checkoffs/checklists/:checklistId": { who: "permission", permission: "section:checkoffs", note: "educators write (checklists:write); others read" },
  "/checkoffs/:checkoffId": { who: "permission", permission: "section:checkoffs", recordScoped: true, record: { record: "checkoff", owner: "opens", others: CHECKOFF_READERS }, note: "404 unless canViewCheckoff (own, preceptor, educator, manager)" },
  "/checkoffs/:checkoffId/print": { who: "permission", permission: "section:checkoffs", recordScoped: true, record: { record: "checkoff", owner: "opens", others: CHECKOFF_READERS }, note: "404 unless canViewCheckoff" },
  "/checkoffs/:checkoffId/record.pdf": { who: "permission", permission: "section:checkoffs", recordScoped: true, record: { record: "checkoff", owner: "opens", others: CHECKOFF_READERS }, note: "404 unless canViewCheckoff" },
  "/checkoffs/:checkoffId/evidence/:evidenceId": { who: "permission", permission: "section:checkoffs", recordScoped: true, record: { record: "checkoff-evidence", owner: "opens", others: CHECKOFF_READERS }, note: "404 unless canViewCheckoff" },
  "/admin": { who: "permission", permission: "section:admin" },
  "/admin/units": { who: "permission", permission: "section:admin" },
  "/admin/people": { who: "permission", permission: "section:admin" },
  "/admin/people/new": { who: "permission", permission: "section:admin" },
  "/admin/people/:personId": { who: "permission", permission: "section:admin" },
  "/admin/references": { who: "permission", permission: "org:settings" },
  "/admin/api": { who: "permission", permission: "api-tokens:manage", note: "API tokens (created shown once, revoked) and the API's reference" },
  "/admin/roster": { who: "permission", permission: "people:manage", note: "HR roster import: preview, then apply on confirmation" },
  "/admin/reminders": { who: "permission", permission: "org:settings", note: "the organisation's reminder policy and the last runs of the reminder job" },
  "/admin/audit": { who: "permission", permission: "section:admin", note: "the audit chain's state and a check-off's history" },
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
    case "token":
      // A session never opens the API: only a bearer token does, whatever the roles.
      return false;
    case "permission":
      return roles !== null && can(roles, access.permission);
  }
}

/** Roles that may use a route, for the README and reports (none for a token route: a token, not a role, opens it). */
export function rolesFor(access: Access): Role[] {
  return ROLES.filter((r) => mayUse(access, [r]));
}

/** What a viewer is to one record of a record-scoped route. */
export type RecordViewer = {
  roles: readonly Role[];
  /** The record belongs to the viewer's organisation. */
  sameOrganisation: boolean;
  /** The record is the viewer's own. */
  isOwner: boolean;
  /** The record's person is on a unit the viewer manages (home or member unit). */
  managesOwner: boolean;
};

/**
 * Does a GET of the record open it (true) or answer 404 (false)? Only for viewers `mayUse`
 * already lets through; the others are refused before any record is looked up.
 */
export function opensRecord(rule: RecordRule, viewer: RecordViewer): boolean {
  if (!viewer.sameOrganisation || rule.owner === "post-only") return false;
  if (viewer.isOwner && rule.owner === "opens") return true;
  const others = rule.others;
  switch (others.who) {
    case "nobody":
      return false;
    case "organisation":
      return others.anyOf.some((permission) => can(viewer.roles, permission));
    case "managed-units":
      if (!can(viewer.roles, others.permission)) return false;
      return viewer.roles.some((role) => others.wholeOrganisation?.includes(role)) || viewer.managesOwner;
  }
}
