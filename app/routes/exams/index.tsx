import { Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { CalendarDate, formatInstantDate } from "~/components/calendar-date";
import { buttonClass } from "~/components/ui/button";
import { examsForPerson } from "~/db/queries/exam-attempts.server";
import { calendarDateIn } from "~/domain/status";
import type { Route } from "./+types/index";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:exams");
  const now = new Date();
  const { cards, history } = await examsForPerson({ orgId: viewer.org.id, personId: viewer.person.id, timeZone: viewer.org.timeZone }, now);
  return { cards, history, today: calendarDateIn(viewer.org.timeZone, now), timeZone: viewer.org.timeZone };
}

export default function ExamsIndex() {
  const { cards, history, today, timeZone } = useLoaderData<typeof loader>();
  return (
    <>
      <div>
        <h1 className="text-3xl font-semibold">Exams</h1>
        <p className="mt-2 max-w-3xl text-muted">
          Exams assigned to you come first, soonest due. Every answer is saved the moment you give it, so you can stop, lose the
          connection or change device and carry on where you were — but the clock keeps running until the time is up.
        </p>
      </div>

      <section aria-labelledby="open-exams">
        <h2 id="open-exams" className="text-xl font-semibold">
          To take
        </h2>
        {cards.length === 0 ? (
          <p className="mt-2">No exam is open to you right now. When your educator assigns one, it appears here and in My plan.</p>
        ) : (
          <ul className="mt-3 grid gap-4 md:grid-cols-2">
            {cards.map((c) => (
              <li key={c.examId} className="flex flex-col gap-2 rounded-lg border border-rule bg-card p-4" data-testid="exam-card">
                <h3 className="text-lg font-semibold">{c.title}</h3>
                {c.description ? <p className="text-muted">{c.description}</p> : null}
                <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                  <dt className="font-semibold">Due</dt>
                  <dd>{c.dueOn ? <DueDate dueOn={c.dueOn} today={today} /> : "Not assigned to you; open to take"}</dd>
                  <dt className="font-semibold">Questions</dt>
                  <dd>{c.items}</dd>
                  <dt className="font-semibold">Time</dt>
                  <dd>{c.timeLimitMinutes ? `${c.timeLimitMinutes} min` : "No time limit"}</dd>
                  <dt className="font-semibold">Pass mark</dt>
                  <dd>{c.passMarkPercent} %</dd>
                  {c.eligibility.ok ? (
                    <>
                      <dt className="font-semibold">Attempts</dt>
                      <dd>
                        {c.eligibility.attemptsUsed} of {c.eligibility.attemptsAllowed} used
                      </dd>
                    </>
                  ) : null}
                </dl>
                <div className="mt-1">
                  {c.openAttemptId ? (
                    <Link to={`/exams/attempts/${c.openAttemptId}`} className={buttonClass("primary")}>
                      Resume {c.title}
                    </Link>
                  ) : c.eligibility.ok ? (
                    <Link to={`/exams/${c.examId}/start`} className={buttonClass("primary")}>
                      Start {c.title}
                    </Link>
                  ) : (
                    <p className="text-sm">{c.eligibility.message}</p>
                  )}
                </div>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="exam-history">
        <h2 id="exam-history" className="text-xl font-semibold">
          My results
        </h2>
        {history.length === 0 ? (
          <p className="mt-2">You have not taken an exam in Tidemark yet.</p>
        ) : (
          <table className="mt-3 w-full max-w-4xl border-collapse text-left">
            <caption className="sr-only">Your exam attempts, newest first</caption>
            <thead>
              <tr className="border-b border-rule">
                <th scope="col" className="py-2 pr-4">Exam</th>
                <th scope="col" className="py-2 pr-4">Attempt</th>
                <th scope="col" className="py-2 pr-4">Closed</th>
                <th scope="col" className="py-2 pr-4">Score</th>
                <th scope="col" className="py-2 pr-4">Result</th>
              </tr>
            </thead>
            <tbody>
              {history.map((h) => (
                <tr key={h.attemptId} className="border-b border-rule">
                  <td className="py-2 pr-4">{h.title}</td>
                  <td className="py-2 pr-4">{h.attemptNumber}</td>
                  <td className="py-2 pr-4">
                    {h.submittedAt ? `${formatInstantDate(h.submittedAt, timeZone)}${h.closedReason === "deadline" ? " (time ran out)" : ""}` : "In progress"}
                  </td>
                  <td className="py-2 pr-4 tabular-nums">{h.percent === null ? "—" : `${formatPercent(h.percent)} %`}</td>
                  <td className="py-2 pr-4">
                    {h.submittedAt ? (
                      <Link to={`/exams/attempts/${h.attemptId}/result`} className="text-sea underline">
                        {h.passed ? "Passed" : "Not passed"}
                        <span className="sr-only"> — see the result of {h.title}, attempt {h.attemptNumber}</span>
                      </Link>
                    ) : (
                      <Link to={`/exams/attempts/${h.attemptId}`} className="text-sea underline">
                        Resume<span className="sr-only"> {h.title}</span>
                      </Link>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </>
  );
}

function DueDate({ dueOn, today }: { dueOn: string; today: string }) {
  return (
    <>
      <CalendarDate value={dueOn} />
      {dueOn < today ? <span className="ml-2 font-semibold text-coral">overdue</span> : null}
    </>
  );
}

/** One decimal at most: 85 %, 87.5 %. */
export function formatPercent(p: number): string {
  return String(Math.round(p * 10) / 10);
}

export const meta: Route.MetaFunction = () => [{ title: "Exams · Tidemark" }];
