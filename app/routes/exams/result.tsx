/**
 * A closed attempt's result, as the exam's review policy allows the therapist to see it (an
 * educator of the organisation sees everything, for the attempts list in the Bank).
 */
import { Link, redirect, useLoaderData } from "react-router";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { formatInstantDate } from "~/components/calendar-date";
import { buttonClass } from "~/components/ui/button";
import { WaveformPlot } from "~/components/waveform";
import { database } from "~/db/client.server";
import { ownAttempt, resultView, type ResultItem } from "~/db/queries/exam-attempts.server";
import { formatDuration } from "~/domain/exams";
import { formatPercent } from "./index";
import type { Route } from "./+types/result";

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:exams");
  const asEducator = can(viewer.roles, "bank:write");
  const view = await resultView(viewer.org.id, params.attemptId, { personId: viewer.person.id, asEducator });
  if (view === null) notFound("We could not find that result.", true);
  if (view === "open") {
    // The therapist goes back to their exam; an educator is told it is still being taken.
    const { db } = await database();
    if (await ownAttempt(db, { orgId: viewer.org.id, personId: viewer.person.id }, params.attemptId)) throw redirect(`/exams/attempts/${params.attemptId}`);
    return { view: null, own: false, timeZone: viewer.org.timeZone };
  }
  return { view, own: view.attempt.personId === viewer.person.id, timeZone: viewer.org.timeZone };
}

export default function Result() {
  const { view, own, timeZone } = useLoaderData<typeof loader>();
  if (!view) {
    return (
      <section aria-labelledby="result-heading" className="flex max-w-4xl flex-col gap-4">
        <h1 id="result-heading" className="text-3xl font-semibold">
          Still being taken
        </h1>
        <p>This attempt is open. Its result appears here when it is handed in or when its time runs out.</p>
        <div>
          <Link to="/bank/exams" className={buttonClass("secondary")}>
            Back to the exams
          </Link>
        </div>
      </section>
    );
  }
  const { exam, score, attempt } = view;
  return (
    <section aria-labelledby="result-heading" className="flex max-w-4xl flex-col gap-4">
      <h1 id="result-heading" className="text-3xl font-semibold">
        {exam.title}: {own ? "your result" : "result"}
      </h1>
      <div className={`rounded-lg border-l-4 p-4 ${score.passed ? "border-sea bg-sea-wash" : "border-coral bg-coral-wash"}`} data-testid="result-summary">
        <p className="text-2xl font-semibold">
          {score.passed ? "Passed" : "Not passed"} — {formatPercent(score.percent)} %
        </p>
        <p className="mt-1">
          {formatPercent(score.raw)} of {score.max} points; the pass mark is {exam.passMarkPercent} %. Attempt {attempt.attemptNumber}, handed in{" "}
          {formatInstantDate(attempt.submittedAt, timeZone)}
          {attempt.closedReason === "deadline" ? " when the time ran out (the answers saved by then were graded)" : ""}.
          {attempt.allowedSeconds ? ` Time allowed: ${formatDuration(attempt.allowedSeconds)}.` : " No time limit."}
        </p>
        {score.passed && own ? <p className="mt-1">Your plan now shows this exam as met. Your certificate follows.</p> : null}
      </div>

      {view.subscores ? (
        <section aria-labelledby="topics-heading">
          <h2 id="topics-heading" className="text-xl font-semibold">
            By topic
          </h2>
          <table className="mt-2 w-full max-w-xl border-collapse text-left">
            <caption className="sr-only">Score in each topic</caption>
            <thead>
              <tr className="border-b border-rule">
                <th scope="col" className="py-2 pr-4">Topic</th>
                <th scope="col" className="py-2 pr-4 text-right">Points</th>
                <th scope="col" className="py-2 pr-4 text-right">Score</th>
              </tr>
            </thead>
            <tbody>
              {view.subscores.map((s) => (
                <tr key={s.topic} className="border-b border-rule">
                  <th scope="row" className="py-2 pr-4 font-normal">{topicLabel(s.topic)}</th>
                  <td className="py-2 pr-4 text-right tabular-nums">
                    {formatPercent(s.raw)} / {s.max}
                  </td>
                  <td className="py-2 pr-4 text-right tabular-nums">{formatPercent(s.percent)} %</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : (
        <p className="text-muted">This exam shows the score only.</p>
      )}

      {view.items ? (
        <section aria-labelledby="items-heading" className="flex flex-col gap-4">
          <h2 id="items-heading" className="text-xl font-semibold">
            Question by question
          </h2>
          {view.items.map((item) => (
            <ReviewedItem key={item.position} item={item} />
          ))}
        </section>
      ) : null}

      <div>
        <Link to="/exams" className={buttonClass("secondary")}>
          Back to Exams
        </Link>
      </div>
    </section>
  );
}

function ReviewedItem({ item }: { item: ResultItem }) {
  const verdict = item.fraction >= 1 ? "Correct" : item.fraction > 0 ? `Partly correct (${formatPercent(item.fraction * 100)} %)` : item.answer ? "Not correct" : "Not answered";
  return (
    <article aria-labelledby={`r-${item.position}`} className="rounded-lg border border-rule bg-card p-4">
      <h3 id={`r-${item.position}`} className="font-semibold">
        Question {item.position + 1}: {verdict}
      </h3>
      <p className="mt-2 whitespace-pre-line">{item.presented.stem}</p>
      {item.presented.kind === "waveform-point" ? (
        <div className="mt-2">
          <WaveformPlot
            waveform={item.presented.waveform}
            breaths={item.presented.breaths}
            startS={item.presented.viewFromS}
            endS={item.presented.viewToS}
            showTable={false}
            markers={item.answer?.kind === "waveform-point" ? [{ timeS: item.answer.timeS, label: "Your answer" }] : []}
            windows={item.key.kind === "waveform-point" ? [{ fromS: item.key.fromS, toS: item.key.toS, label: "Correct window" }] : []}
          />
        </div>
      ) : null}
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="font-semibold">Your answer</dt>
        <dd>{describeAnswer(item)}</dd>
        <dt className="font-semibold">The answer</dt>
        <dd>{item.key.text}</dd>
        <dt className="font-semibold">Why</dt>
        <dd className="whitespace-pre-line">{item.rationale}</dd>
        <dt className="font-semibold">Reference</dt>
        <dd>{item.reference}</dd>
      </dl>
    </article>
  );
}

function describeAnswer(item: ResultItem): string {
  const a = item.answer;
  const p = item.presented;
  if (!a) return "Not answered";
  if (a.kind === "single" && (p.kind === "single" || p.kind === "multiple")) return p.options.find((o) => o.id === a.choice)?.text ?? "—";
  if (a.kind === "multiple" && p.kind === "multiple") return a.choices.map((c) => p.options.find((o) => o.id === c)?.text ?? "—").join("; ");
  if (a.kind === "numeric") return "text" in a ? a.text : String(a.value);
  if (a.kind === "ordering" && p.kind === "ordering") return a.order.map((id, i) => `${i + 1}. ${p.steps.find((s) => s.id === id)?.text ?? "—"}`).join(" ");
  if (a.kind === "waveform-point") return `${a.timeS.toFixed(2)} s`;
  return "—";
}

function topicLabel(slug: string): string {
  const s = slug.replace(/-/g, " ");
  return s.charAt(0).toUpperCase() + s.slice(1);
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: `Result · ${data?.view?.exam.title ?? "Exam"} · Tidemark` }];
