/**
 * Saves one answer (or its review flag) of the signed-in person's own open attempt, the moment
 * it is given. POST, form-encoded: `position` (the place on the form), `answer` (JSON of the
 * answer as the page sends it; empty clears it) and/or `flagged` ("true" | "false").
 * Answers with JSON: `{ ok: true, position, savedAt, progress }` — progress is the attempt as the
 * server now holds it, from the same attemptProgress() the API's /api/v1/exam-attempts/:id
 * answers with — or `{ ok: false, message }` with 404 (not
 * the person's attempt), 409 (closed, or arrived after the deadline) or 422 (not a valid answer).
 * Cross-site posts are refused by the root middleware (403) before this runs.
 */
import { data } from "react-router";
import { z } from "zod";
import { notFound, requireViewer } from "~/auth/gate.server";
import { attemptProgress, saveAnswer, type SubmittedAnswer } from "~/db/queries/exam-attempts.server";
import type { Route } from "./+types/answers";

const answerSchema: z.ZodType<SubmittedAnswer> = z.discriminatedUnion("kind", [
  z.strictObject({ kind: z.literal("single"), choice: z.number().int() }),
  z.strictObject({ kind: z.literal("multiple"), choices: z.array(z.number().int()).max(20) }),
  z.strictObject({ kind: z.literal("numeric"), text: z.string().max(60, "Keep the answer to a number and its unit.") }),
  z.strictObject({ kind: z.literal("ordering"), order: z.array(z.number().int()).max(20) }),
  z.strictObject({ kind: z.literal("waveform-point"), timeS: z.number().finite() }),
]);

const saveSchema = z.object({
  // A blank position must not read as the first question (Number("") is 0).
  position: z
    .string({ error: "Say which question this answer is for." })
    .regex(/^\d{1,4}$/, "Say which question this answer is for.")
    .transform(Number),
  answer: z.string().max(2000).optional(),
  flagged: z.enum(["true", "false"]).optional(),
});

/** Nothing to read here: answers are only ever written (a GET is a 404, like an unknown attempt). */
export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "section:exams");
  notFound("Answers are saved with POST; there is nothing to read here.", true);
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:exams");
  if (request.method !== "POST") return data({ ok: false, message: "Answers are saved with POST." }, { status: 405, headers: { Allow: "POST" } });
  const form = saveSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!form.success) return data({ ok: false, message: form.error.issues[0]?.message ?? "This save was not understood." }, { status: 422 });
  let answer: SubmittedAnswer | null | undefined;
  if (form.data.answer !== undefined) {
    if (form.data.answer === "" || form.data.answer === "null") answer = null;
    else {
      let raw: unknown;
      try {
        raw = JSON.parse(form.data.answer);
      } catch {
        return data({ ok: false, message: "This answer was not understood." }, { status: 422 });
      }
      const parsed = answerSchema.safeParse(raw);
      if (!parsed.success) return data({ ok: false, message: "This answer does not fit the question." }, { status: 422 });
      answer = parsed.data;
    }
  }
  if (answer === undefined && form.data.flagged === undefined) return data({ ok: false, message: "Nothing to save: send an answer or a flag." }, { status: 422 });
  const result = await saveAnswer(
    { orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone },
    params.attemptId,
    form.data.position,
    { answer, flagged: form.data.flagged === undefined ? undefined : form.data.flagged === "true" },
  );
  if (result.ok) return data({ ...result, progress: await attemptProgress(viewer.org.id, params.attemptId) }, { headers: { "Cache-Control": "no-store" } });
  return data({ ok: false, message: result.message, closed: result.closed ?? false }, { status: result.status, headers: { "Cache-Control": "no-store" } });
}
