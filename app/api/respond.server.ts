/**
 * JSON answers of the API: every error is `{ error: { code, message, field?, fields? } }` with a
 * stable machine-readable code (the words may change; the codes do not), and lists are
 * `{ data, nextCursor }`. API routes throw these Responses; React Router sends a thrown Response
 * from a resource route as it is.
 */
import type { z } from "zod";
import type { ApiErrorCode } from "./schemas";

export type FieldError = { field: string; message: string };

const NO_STORE = { "Cache-Control": "no-store", "Content-Type": "application/json; charset=utf-8" };

export function json(body: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(body), { status, headers: { ...NO_STORE, ...headers } });
}

export function apiError(
  status: number,
  code: ApiErrorCode,
  message: string,
  extra: { field?: string; fields?: FieldError[]; headers?: Record<string, string> } = {},
): Response {
  const error: Record<string, unknown> = { code, message };
  if (extra.field) error.field = extra.field;
  if (extra.fields) error.fields = extra.fields;
  return json({ error }, status, extra.headers);
}

/** A zod failure as a 400 naming every field (the first one also as `field`). */
export function validationError(issues: z.core.$ZodIssue[], message = "Some values are not valid; see fields."): Response {
  const fields = issues.map((i) => ({ field: i.path.length ? i.path.join(".") : "body", message: i.message }));
  return apiError(400, "validation_failed", fields.length === 1 ? fields[0].message : message, { field: fields[0]?.field, fields });
}

export function notFoundError(what: string): Response {
  return apiError(404, "not_found", `No ${what} with that id in your organisation.`);
}

export function methodNotAllowed(allowed: string[]): Response {
  return apiError(405, "method_not_allowed", `Use ${allowed.join(" or ")} here.`, { headers: { Allow: allowed.join(", ") } });
}
