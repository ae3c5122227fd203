/**
 * What a loader or action answered, whichever way it answered: a returned value, a returned
 * `data(…, { status })`, or a thrown redirect / `data(…)` (403, 404, 400). Keeps the admin tests
 * to one line per call.
 */

/** React Router's `data()` result; its class is not exported, so it is recognised by its tag. */
type DataWithInit = { type: "DataWithResponseInit"; data: unknown; init: ResponseInit | null };
function isDataWithInit(value: unknown): value is DataWithInit {
  return !!value && typeof value === "object" && (value as { type?: unknown }).type === "DataWithResponseInit";
}

export type Outcome = { status: number; location: string | null; body: unknown };

function fromValue(value: unknown): Outcome {
  if (value instanceof Response) return { status: value.status, location: value.headers.get("Location"), body: null };
  if (isDataWithInit(value)) return { status: value.init?.status ?? 200, location: null, body: value.data };
  return { status: 200, location: null, body: value };
}

export async function outcome(run: unknown): Promise<Outcome> {
  try {
    return fromValue(await run);
  } catch (error) {
    if (error instanceof Response || isDataWithInit(error)) return fromValue(error);
    throw error;
  }
}

/** A conform reply's errors for one field ("" is the form's own errors). */
export function fieldErrors(body: unknown, field: string): string[] {
  const error = (body as { error?: Record<string, string[] | null> } | null)?.error;
  return error?.[field] ?? [];
}

/** What the form will show again in its fields after a refused submission. */
export function keptValue(body: unknown, field: string): unknown {
  return (body as { initialValue?: Record<string, unknown> } | null)?.initialValue?.[field];
}

/** The argument type of a route module's loader or action (generated route types resolve only relatively). */
// `any[]`: the parameter list of any loader or action (a narrower type rejects their own args).
export type ArgsOf<F extends (...a: any[]) => unknown> = Parameters<F>[0];
