/**
 * The start page: the rules of the sitting (time, questions, pass mark, attempts, what is shown
 * afterwards) and the therapist's choice of one question at a time or all on one page.
 */
import { data, Form, redirect, useActionData, useLoaderData, useNavigation } from "react-router";
import { z } from "zod";
import { notFound, requireViewer } from "~/auth/gate.server";
import { Button } from "~/components/ui/button";
import { database } from "~/db/client.server";
import { activeAccommodationFor } from "~/db/queries/accommodations.server";
import { eligibility, liveExamVersion, startAttempt } from "~/db/queries/exam-attempts.server";
import { allowedSeconds, blueprintSchema, blueprintTotal, formatDuration, WARNINGS_S } from "~/domain/exams";
import { calendarDateIn } from "~/domain/status";
import type { Route } from "./+types/start";

const REVIEW_WORDS = {
  "score-only": "your score and whether you passed",
  "score-and-topics": "your score, whether you passed, and your score in each topic",
  "full-rationale": "your score, each topic's score, and every question with the right answer and why",
} as const;

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:exams");
  const { db } = await database();
  const now = new Date();
  const live = await liveExamVersion(db, viewer.org.id, params.examId);
  if (!live) notFound("This exam is not open to take.", true);
  const who = { orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone };
  const allowed = await eligibility(db, who, params.examId, live.version, now);
  const accommodation = await activeAccommodationFor(db, viewer.org.id, viewer.person.id, calendarDateIn(viewer.org.timeZone, now));
  const seconds = allowedSeconds(
    live.version.timeLimitMinutes,
    accommodation ? (accommodation.kind === "untimed" ? { kind: "untimed" } : { kind: "multiplier", multiplier: accommodation.multiplier ?? 1 }) : null,
  );
  return {
    exam: { id: live.exam.id, title: live.exam.title, description: live.version.description },
    items: blueprintTotal(blueprintSchema.parse(live.version.blueprint)),
    standardSeconds: live.version.timeLimitMinutes ? live.version.timeLimitMinutes * 60 : null,
    seconds,
    accommodation: accommodation ? { kind: accommodation.kind, multiplier: accommodation.multiplier } : null,
    passMarkPercent: live.version.passMarkPercent,
    review: REVIEW_WORDS[live.version.reviewPolicy],
    eligibility: allowed,
  };
}

const startSchema = z.object({ layout: z.enum(["one", "all"]).default("one") });

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:exams");
  const parsed = startSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ message: "Choose how to see the questions." }, { status: 400 });
  const result = await startAttempt({ orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone }, params.examId, parsed.data.layout);
  if (!result.ok) return data({ message: result.message }, { status: 409 });
  return redirect(`/exams/attempts/${result.attemptId}`);
}

export default function StartExam() {
  const { exam, items, standardSeconds, seconds, accommodation, passMarkPercent, review, eligibility } = useLoaderData<typeof loader>();
  const failed = useActionData<typeof action>();
  const navigation = useNavigation();
  return (
    <section aria-labelledby="start-heading" className="flex max-w-3xl flex-col gap-4">
      <h1 id="start-heading" className="text-3xl font-semibold">
        {exam.title}
      </h1>
      {exam.description ? <p className="text-muted">{exam.description}</p> : null}
      <div className="rounded-lg border border-rule bg-card p-4">
        <h2 className="text-xl font-semibold">Before you start</h2>
        <ul className="mt-2 flex list-disc flex-col gap-1 pl-6">
          <li>
            {items} questions. Pass mark {passMarkPercent} %.
          </li>
          <li data-testid="time-allowed">
            {seconds === null ? (
              <>No time limit{accommodation?.kind === "untimed" ? " (your accommodation: an untimed sitting)" : ""}.</>
            ) : (
              <>
                You have {formatDuration(seconds)}
                {accommodation?.kind === "multiplier" && standardSeconds ? ` — ${accommodation.multiplier}× the standard ${formatDuration(standardSeconds)}, your accommodation` : ""}. The clock
                starts when you press Start and keeps running if you close the page. Tidemark warns you {WARNINGS_S.map((s) => formatDuration(s)).join(" and ")} before the
                end; when the time is up, the answers saved by then are graded.
              </>
            )}
          </li>
          <li>Each answer is saved as soon as you give it; there is no save button. You can flag a question to come back to it.</li>
          <li>Signing out or your session ending does not end the exam: sign in again, on any device, and carry on.</li>
          <li>When you hand it in you see {review}.</li>
          {eligibility.ok && !eligibility.openAttemptId ? (
            <li>
              This is attempt {eligibility.attemptsUsed + 1} of {eligibility.attemptsAllowed}.
            </li>
          ) : null}
        </ul>
      </div>
      {failed ? (
        <p role="alert" className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
          {failed.message}
        </p>
      ) : null}
      {eligibility.ok ? (
        <Form method="post" className="flex flex-col gap-3">
          {eligibility.openAttemptId ? null : (
            <fieldset className="flex flex-col gap-1">
              <legend className="font-semibold">Show the questions</legend>
              <label className="flex min-h-11 items-center gap-3">
                <input type="radio" name="layout" value="one" defaultChecked className="h-5 w-5" /> One at a time, with a list to jump between them
              </label>
              <label className="flex min-h-11 items-center gap-3">
                <input type="radio" name="layout" value="all" className="h-5 w-5" /> All on one page
              </label>
            </fieldset>
          )}
          <div>
            <Button type="submit" disabled={navigation.state !== "idle"}>
              {eligibility.openAttemptId ? "Resume the exam" : "Start the exam"}
            </Button>
          </div>
        </Form>
      ) : (
        <p className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">{eligibility.message}</p>
      )}
    </section>
  );
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.exam.title ?? "Exam"} · Exams · Tidemark` }];
