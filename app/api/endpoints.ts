/**
 * The API's route table: one row per path and method, with the scope it needs and the schemas
 * of its query, body and answer. The OpenAPI document (app/api/openapi.ts) and the reference on
 * Admin → API are both drawn from this table, so they cannot disagree; the tests check every
 * /api/v1 route in app/routes.ts appears here.
 */
import type { z } from "zod";
import {
  ClearancePage,
  ClearancesQuery,
  CredentialPage,
  CredentialSchema,
  CredentialsQuery,
  ExamResultPage,
  ExamResultsQuery,
  ExamAttemptSchema,
  PageQuery,
  PersonPage,
  PersonStatusSchema,
  RequirementPage,
  TeamMatrixPage,
  TeamMatrixQuery,
  UnitPage,
} from "./schemas";

export type ApiMethod = "get" | "post" | "patch";
export type Endpoint = {
  method: ApiMethod;
  /** The route's pattern as in app/routes.ts and ROUTE_ACCESS, e.g. /api/v1/credentials/:credentialId. */
  route: string;
  /** null: public (the OpenAPI document itself). */
  scope: "read" | "write" | null;
  summary: string;
  description: string;
  pathParams?: { name: string; description: string }[];
  query?: z.ZodObject;
  body?: "create-credential" | "update-credential";
  response: z.ZodType | "openapi";
  status: 200 | 201;
};

const PAGING = "Pages with ?limit= (1–200, default 50) and ?cursor= (the previous page's nextCursor).";

export const API_ENDPOINTS: Endpoint[] = [
  {
    method: "get",
    route: "/api/v1/openapi.json",
    scope: null,
    summary: "This API's OpenAPI 3.1 document",
    description: "Public: no token needed.",
    response: "openapi",
    status: 200,
  },
  { method: "get", route: "/api/v1/people", scope: "read", summary: "List people", description: `Everyone in the organisation, active or not, with their roles and units. ${PAGING}`, query: PageQuery, response: PersonPage, status: 200 },
  {
    method: "get",
    route: "/api/v1/people/:personId/status",
    scope: "read",
    summary: "A person's status per requirement",
    description: "The status engine's answer, as on the person's plan: per requirement the status word, its date, the day it next changes and the evidence.",
    pathParams: [{ name: "personId", description: "The person's id" }],
    response: PersonStatusSchema,
    status: 200,
  },
  { method: "get", route: "/api/v1/units", scope: "read", summary: "List units", description: `The organisation's units. ${PAGING}`, query: PageQuery, response: UnitPage, status: 200 },
  { method: "get", route: "/api/v1/requirements", scope: "read", summary: "List requirements", description: `What people must hold or complete, and whom each applies to. ${PAGING}`, query: PageQuery, response: RequirementPage, status: 200 },
  {
    method: "get",
    route: "/api/v1/exam-results",
    scope: "read",
    summary: "List exam results",
    description: `Closed exam attempts (submitted or closed at the deadline) with score and pass. Filter with ?examId= and ?personId=. ${PAGING}`,
    query: ExamResultsQuery,
    response: ExamResultPage,
    status: 200,
  },
  {
    method: "get",
    route: "/api/v1/exam-attempts/:attemptId",
    scope: "read",
    summary: "Where an exam attempt stands",
    description:
      "Open or closed, the server's deadline, questions answered and flagged, when the latest answer was saved, and the score once graded — the same figures the exam page's save reply carries. An attempt past its deadline is closed and graded first. Never the answers or the keys.",
    pathParams: [{ name: "attemptId", description: "The attempt's id" }],
    response: ExamAttemptSchema,
    status: 200,
  },
  {
    method: "get",
    route: "/api/v1/team-matrix",
    scope: "read",
    summary: "The Team matrix: people × requirements",
    description: `Every person of the organisation with one cell per requirement that applies to them, judged on the organisation's today by the same function as the Team matrix page, with the page's filters: ?q= (name or employee id), ?unitId=, ?role=, ?status= (people with at least one requirement in that status), ?sort= (name, unit, lapsed) and ?dir= (asc, desc). ${PAGING}`,
    query: TeamMatrixQuery,
    response: TeamMatrixPage,
    status: 200,
  },
  {
    method: "get",
    route: "/api/v1/clearances",
    scope: "read",
    summary: "List clearances",
    description: `What each person may do today on each unit they work on, per skill: independent, supervised or not cleared, with the reason — derived from the current records, exactly as the Clearance board shows it. Filter with ?unitId= and ?checklistId=. ${PAGING}`,
    query: ClearancesQuery,
    response: ClearancePage,
    status: 200,
  },
  { method: "get", route: "/api/v1/credentials", scope: "read", summary: "List credentials", description: `Cards and licences held. Filter with ?personId=. ${PAGING}`, query: CredentialsQuery, response: CredentialPage, status: 200 },
  {
    method: "post",
    route: "/api/v1/credentials",
    scope: "write",
    summary: "Record a credential",
    description: "Validated as on the Credentials page: dates YYYY-MM-DD that exist, valid-through not before issue. Leave validThrough out to take the type's rule. Audited with the token as the actor.",
    body: "create-credential",
    response: CredentialSchema,
    status: 201,
  },
  {
    method: "get",
    route: "/api/v1/credentials/:credentialId",
    scope: "read",
    summary: "One credential",
    description: "A credential by id.",
    pathParams: [{ name: "credentialId", description: "The credential's id" }],
    response: CredentialSchema,
    status: 200,
  },
  {
    method: "patch",
    route: "/api/v1/credentials/:credentialId",
    scope: "write",
    summary: "Change a credential",
    description: "Change number, issuer, issuedOn or validThrough (null clears). Validated as on the Credentials page. A change to a verified credential clears its verification. Audited with the token as the actor.",
    pathParams: [{ name: "credentialId", description: "The credential's id" }],
    body: "update-credential",
    response: CredentialSchema,
    status: 200,
  },
];

/** /api/v1/people/:personId/status → /api/v1/people/{personId}/status */
export function openApiPath(route: string): string {
  return route.replace(/:(\w+)/g, "{$1}");
}
