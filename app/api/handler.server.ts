/** The plumbing every API route shares: thrown JSON answers, queries, cursors and bodies. */
import type { z } from "zod";
import { decodeCursor, type PageArgs } from "./data.server";
import type { MiddlewareFunction } from "react-router";
import { apiError, methodNotAllowed, validationError } from "./respond.server";
import { bearerTokenOf } from "./token.server";

/**
 * Route middleware of every token route: a request without a bearer token is refused with the
 * JSON 401 before any loader runs — also a client data request that names only the root route,
 * which would otherwise answer with the root's (empty) data.
 */
export const requireBearer: MiddlewareFunction<Response> = async ({ request }, next) => {
  try {
    bearerTokenOf(request);
  } catch (thrown) {
    if (thrown instanceof Response) return thrown;
    throw thrown;
  }
  return next();
};

/** Runs a route's work; a JSON answer thrown on the way (401, 400…) is returned as the answer. */
export async function handle(work: () => Promise<Response>): Promise<Response> {
  try {
    return await work();
  } catch (thrown) {
    if (thrown instanceof Response) return thrown;
    throw thrown;
  }
}

export function parseQuery<T extends z.ZodObject>(request: Request, schema: T): z.infer<T> {
  const params = Object.fromEntries(new URL(request.url).searchParams);
  const parsed = schema.safeParse(params);
  if (!parsed.success) throw validationError(parsed.error.issues);
  return parsed.data;
}

export function pageArgs(query: { cursor?: string; limit: number }): PageArgs {
  if (query.cursor === undefined) return { after: null, limit: query.limit };
  const after = decodeCursor(query.cursor);
  if (after === null) throw apiError(400, "validation_failed", "This cursor is not one we issued. Pass nextCursor from the previous page as it is.", { field: "cursor", fields: [{ field: "cursor", message: "Not a cursor we issued." }] });
  return { after, limit: query.limit };
}

/** The request's JSON object body, or a 400 saying why not. */
export async function readJsonObject(request: Request): Promise<Record<string, unknown>> {
  const type = request.headers.get("Content-Type") ?? "";
  if (!/^application\/json\b/i.test(type)) throw apiError(400, "invalid_json", 'Send the body as JSON with "Content-Type: application/json".', { field: "body" });
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw apiError(400, "invalid_json", "The body is not valid JSON.", { field: "body" });
  }
  if (!body || typeof body !== "object" || Array.isArray(body)) throw apiError(400, "invalid_json", "The body must be a JSON object.", { field: "body" });
  return body as Record<string, unknown>;
}

/** For routes that answer only some methods. */
export function refuseOtherMethods(request: Request, allowed: string[]): void {
  if (!allowed.includes(request.method.toUpperCase())) throw methodNotAllowed(allowed);
}
