/**
 * The API's shapes, as zod schemas: the routes validate queries and bodies with them, the
 * OpenAPI document (app/api/openapi.ts) is generated from them with `z.toJSONSchema`, and the
 * tests check answers against them. The credential body is the /credentials page's own schema
 * (`recordCredentialSchema`), so the API refuses exactly what the page refuses.
 */
import { z } from "zod";
import { CREDENTIAL_INTENTS, recordCredentialSchema } from "~/routes/credentials/schemas";
import { STATUSES } from "~/domain/status";
import { CLEARANCE_LEVELS } from "~/domain/clearance";
import { MATRIX_FILTER_FIELDS } from "~/routes/team/matrix-params";

/** Every named shape of the API, for the OpenAPI document's components. */
export const API_SCHEMAS = z.registry<{ id: string }>();

export const API_ERROR_CODES = [
  "missing_token",
  "invalid_token",
  "token_revoked",
  "token_expired",
  "token_in_query",
  "insufficient_scope",
  "rate_limited",
  "validation_failed",
  "invalid_json",
  "not_found",
  "method_not_allowed",
] as const;
export type ApiErrorCode = (typeof API_ERROR_CODES)[number];

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/).describe("A calendar date, YYYY-MM-DD, in the organisation's time zone");
const instant = z.iso.datetime().describe("A UTC instant, ISO 8601");

export const ErrorSchema = z
  .object({
    error: z.object({
      code: z.enum(API_ERROR_CODES),
      message: z.string(),
      field: z.string().optional().describe("The first field at fault, for validation errors"),
      fields: z.array(z.object({ field: z.string(), message: z.string() })).optional(),
    }),
  })
  .register(API_SCHEMAS, { id: "Error" });

// ── Queries ───────────────────────────────────────────────────────────────────────────────
export const MAX_PAGE = 200;
export const DEFAULT_PAGE = 50;

export const PageQuery = z.object({
  cursor: z.string().min(1, "The cursor is empty; leave it out for the first page.").optional().describe("nextCursor from the previous page"),
  limit: z.coerce
    .number({ error: `The limit is a whole number from 1 to ${MAX_PAGE}.` })
    .int(`The limit is a whole number from 1 to ${MAX_PAGE}.`)
    .min(1, `The limit is a whole number from 1 to ${MAX_PAGE}.`)
    .max(MAX_PAGE, `The limit is at most ${MAX_PAGE}.`)
    .default(DEFAULT_PAGE),
});
export const ExamResultsQuery = PageQuery.extend({
  examId: z.string().min(1).optional().describe("Only this exam's results"),
  personId: z.string().min(1).optional().describe("Only this person's results"),
});
export const ClearancesQuery = PageQuery.extend({
  unitId: z.string().min(1).optional().describe("Only this unit's people"),
  checklistId: z.string().min(1).optional().describe("Only this skill (a checklist id)"),
});
export const CredentialsQuery = PageQuery.extend({
  personId: z.string().min(1).optional().describe("Only this person's credentials"),
});

// ── Records ───────────────────────────────────────────────────────────────────────────────
export const PersonSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    email: z.string(),
    employeeId: z.string().nullable(),
    active: z.boolean(),
    roles: z.array(z.string()),
    units: z.array(z.object({ id: z.string(), name: z.string(), relation: z.enum(["home", "member", "manages"]) })),
  })
  .register(API_SCHEMAS, { id: "Person" });

export const UnitSchema = z.object({ id: z.string(), name: z.string(), code: z.string(), active: z.boolean() }).register(API_SCHEMAS, { id: "Unit" });

export const RequirementSchema = z
  .object({
    id: z.string(),
    name: z.string(),
    kind: z.enum(["exam", "checklist", "credential"]),
    examId: z.string().nullable(),
    checklistId: z.string().nullable(),
    credentialTypeId: z.string().nullable(),
    recurrence: z.string().nullable(),
    graceDays: z.number().int(),
    unitId: z.string().nullable().describe("Applies to this unit's people; null with role null = everyone"),
    role: z.string().nullable(),
    active: z.boolean(),
  })
  .register(API_SCHEMAS, { id: "Requirement" });

export const StatusRowSchema = z
  .object({
    requirementId: z.string().nullable(),
    kind: z.string(),
    title: z.string(),
    status: z.enum(STATUSES).describe("The status word"),
    date: isoDate.nullable().describe("The date the status was judged on (due or valid through)"),
    dateMeaning: z.enum(["due", "valid-through"]),
    nextChangeOn: isoDate.nullable().describe("The first day the status changes on its own"),
    nextStatus: z.enum(STATUSES).nullable(),
    evidence: z.array(z.string()).describe("One line per piece of evidence"),
  })
  .register(API_SCHEMAS, { id: "StatusRow" });

export const PersonStatusSchema = z
  .object({ personId: z.string(), today: isoDate, rows: z.array(StatusRowSchema) })
  .register(API_SCHEMAS, { id: "PersonStatus" });

export const ExamResultSchema = z
  .object({
    id: z.string(),
    person: z.object({ id: z.string(), name: z.string() }),
    exam: z.object({ id: z.string(), title: z.string() }),
    version: z.number().int(),
    scorePercent: z.number().nullable(),
    passed: z.boolean().nullable(),
    submittedAt: instant,
    closedReason: z.enum(["submitted", "deadline"]).nullable(),
  })
  .register(API_SCHEMAS, { id: "ExamResult" });

export const ClearanceSchema = z
  .object({
    id: z.string().describe("Stable for one person, unit and skill"),
    personId: z.string(),
    unitId: z.string(),
    checklistId: z.string().describe("The skill: a published checklist"),
    level: z.enum(CLEARANCE_LEVELS).describe("What the person may do on this unit today: the same derivation as the Clearance board"),
    reason: z.string().describe("Why, in words, e.g. the requirement that lapsed and what its lapse leaves"),
    requirementId: z.string().nullable().describe("The requirement that decided the level, when one did"),
    derivedAt: instant.describe("When the level was derived from the records"),
  })
  .register(API_SCHEMAS, { id: "Clearance" });

export const CredentialSchema = z
  .object({
    id: z.string(),
    personId: z.string(),
    personName: z.string(),
    credentialTypeId: z.string(),
    typeName: z.string(),
    number: z.string().nullable(),
    issuer: z.string().nullable(),
    issuedOn: isoDate,
    validThrough: isoDate.nullable(),
    verified: z.boolean(),
    verifiedAt: instant.nullable(),
  })
  .register(API_SCHEMAS, { id: "Credential" });

function pageOf<T extends z.ZodType>(item: T, id: string) {
  return z
    .object({ data: z.array(item), nextCursor: z.string().nullable().describe("Pass as ?cursor= for the next page; null on the last") })
    .register(API_SCHEMAS, { id });
}
export const PersonPage = pageOf(PersonSchema, "PersonPage");
export const UnitPage = pageOf(UnitSchema, "UnitPage");
export const RequirementPage = pageOf(RequirementSchema, "RequirementPage");
export const ExamResultPage = pageOf(ExamResultSchema, "ExamResultPage");
export const ClearancePage = pageOf(ClearanceSchema, "ClearancePage");
export const CredentialPage = pageOf(CredentialSchema, "CredentialPage");

// ── Credential writes: the page's schema ──────────────────────────────────────────────────
/** Validates a POST body exactly as the /credentials page validates its form. */
export function parseCredentialBody(body: Record<string, unknown>) {
  return recordCredentialSchema.safeParse({ ...body, intent: CREDENTIAL_INTENTS.record });
}

export const CREDENTIAL_PATCHABLE = ["number", "issuer", "issuedOn", "validThrough"] as const;

/** The JSON Schema of the page's form (the request body), without the form's own intent field. */
export function credentialBodyJsonSchema(mode: "create" | "update"): Record<string, unknown> {
  const schema = z.toJSONSchema(recordCredentialSchema, { io: "input", unrepresentable: "any", target: "draft-2020-12" }) as {
    properties: Record<string, Record<string, unknown>>;
    required?: string[];
    [k: string]: unknown;
  };
  const { $schema: _drop, ...rest } = schema;
  const properties = { ...schema.properties };
  delete properties.intent;
  // An API client may send null for "none" (the form sends an empty field).
  for (const k of ["number", "issuer", "validThrough"]) if (properties[k]) properties[k] = { anyOf: [properties[k], { type: "null" }] };
  if (mode === "update") {
    for (const k of Object.keys(properties)) if (!(CREDENTIAL_PATCHABLE as readonly string[]).includes(k)) delete properties[k];
    return { ...rest, properties, required: undefined, additionalProperties: false, minProperties: 1 };
  }
  return { ...rest, properties, required: (schema.required ?? []).filter((r) => r !== "intent") };
}

// ── Views the pages fetch in place, from the same server functions ────────────────────────
/** The Team matrix's filters, by the page's own field rules (MATRIX_FILTER_FIELDS). */
export const TeamMatrixQuery = PageQuery.extend({
  q: MATRIX_FILTER_FIELDS.q.optional().describe("Name or employee id contains this (any case)"),
  unitId: MATRIX_FILTER_FIELDS.unit.optional().describe("Only people on this unit"),
  role: MATRIX_FILTER_FIELDS.role.optional().describe("Only people with this role"),
  status: MATRIX_FILTER_FIELDS.status.optional().describe("Only people with at least one requirement in this status"),
  sort: MATRIX_FILTER_FIELDS.sort.default("name").describe("name, unit (home unit) or lapsed (number of lapsed requirements)"),
  dir: MATRIX_FILTER_FIELDS.dir.default("asc"),
});

export const MatrixCellSchema = z
  .object({
    requirementId: z.string(),
    status: z.enum(STATUSES),
    date: isoDate.nullable().describe("Due date (after any extension) or valid-through date"),
    dateMeaning: z.enum(["due", "valid-through"]),
    waivedThrough: isoDate.nullable(),
  })
  .register(API_SCHEMAS, { id: "MatrixCell" });

export const TeamMatrixPage = z
  .object({
    today: isoDate.describe("The organisation's calendar day the statuses are judged on"),
    requirements: z.array(z.object({ id: z.string(), name: z.string(), kind: z.enum(["exam", "checklist", "credential"]) })),
    matching: z.number().int().describe("People matching the filters, across all pages"),
    data: z.array(
      z.object({
        person: z.object({ id: z.string(), name: z.string(), employeeId: z.string().nullable(), homeUnit: z.string().nullable() }),
        cells: z.array(MatrixCellSchema).describe("One per requirement that applies to the person"),
      }),
    ),
    nextCursor: z.string().nullable().describe("Pass as ?cursor= for the next page; null on the last"),
  })
  .register(API_SCHEMAS, { id: "TeamMatrixPage" });

export const ExamAttemptSchema = z
  .object({
    attemptId: z.string(),
    personId: z.string(),
    examId: z.string(),
    examTitle: z.string(),
    version: z.number().int(),
    attemptNumber: z.number().int(),
    state: z.enum(["open", "closed"]),
    startedAt: instant,
    deadlineAt: instant.nullable().describe("The server's deadline; null for an untimed sitting"),
    total: z.number().int().describe("Questions on the attempt's form"),
    answered: z.number().int().describe("Questions with a saved answer"),
    flagged: z.number().int().describe("Questions flagged for review"),
    lastSavedAt: instant.nullable().describe("When the latest answer or flag reached the server"),
    closedReason: z.enum(["submitted", "deadline"]).nullable(),
    scorePercent: z.number().nullable(),
    passed: z.boolean().nullable(),
  })
  .register(API_SCHEMAS, { id: "ExamAttempt" });
