import { CalendarDate } from "~/components/calendar-date";
import { blueprintTotal, type Blueprint } from "~/domain/exams/blueprint";
import type { ExamVersion } from "~/db/schema";
import { MULTIPLE_RESPONSE_LABELS, ORDERING_LABELS, REVIEW_POLICY_LABELS } from "~/routes/bank/exam-form";

/** One exam version's settings and blueprint, with the bank's feasibility warnings. */
type VersionView = Omit<ExamVersion, "blueprint"> & { blueprint: Blueprint };

export function ExamVersionCard({ heading, v, topicName, problems }: { heading: string; v: VersionView; topicName: Map<string, string>; problems: { topic: string; message: string }[] }) {
  const b = v.blueprint;
  const id = `version-${v.version}-heading`;
  return (
    <section aria-labelledby={id} className="flex flex-col gap-3 rounded-md border border-rule bg-card p-4">
      <h3 id={id} className="text-xl font-semibold">
        {heading}
      </h3>
      {v.description ? <p>{v.description}</p> : null}
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="text-muted">Items</dt>
        <dd>{blueprintTotal(b)}</dd>
        <dt className="text-muted">Time limit</dt>
        <dd>{v.timeLimitMinutes === null ? "Untimed" : `${v.timeLimitMinutes} minutes`}</dd>
        <dt className="text-muted">Pass mark</dt>
        <dd>{v.passMarkPercent} %</dd>
        <dt className="text-muted">Attempts allowed</dt>
        <dd>{v.attemptsAllowed}</dd>
        <dt className="text-muted">Shuffling</dt>
        <dd>{[v.shuffleItems ? "items" : null, v.shuffleOptions ? "options" : null].filter(Boolean).join(" and ") || "none"}</dd>
        <dt className="text-muted">After submitting</dt>
        <dd>{REVIEW_POLICY_LABELS[v.reviewPolicy]}</dd>
        <dt className="text-muted">Multiple response</dt>
        <dd>{MULTIPLE_RESPONSE_LABELS[v.multipleResponseScoring]}</dd>
        <dt className="text-muted">Ordering</dt>
        <dd>{ORDERING_LABELS[v.orderingScoring]}</dd>
        <dt className="text-muted">Available</dt>
        <dd>
          {v.availableFrom ? <>from <CalendarDate value={v.availableFrom} /></> : "from publishing"}
          {v.availableUntil ? <> until <CalendarDate value={v.availableUntil} /></> : ", no closing day"}
        </dd>
      </dl>
      <table className="w-full border-separate border-spacing-0 text-left">
        <caption className="py-1 text-left font-semibold">Blueprint</caption>
        <thead>
          <tr>
            <th scope="col" className="border-b border-rule px-2 py-1 text-sm text-muted">Topic</th>
            <th scope="col" className="border-b border-rule px-2 py-1 text-right text-sm text-muted">Items</th>
          </tr>
        </thead>
        <tbody>
          {Object.entries(b.topics).map(([slug, n]) => (
            <tr key={slug}>
              <td className="border-b border-rule px-2 py-1">{topicName.get(slug) ?? slug}</td>
              <td className="border-b border-rule px-2 py-1 text-right tabular-nums">{n}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="text-sm">
        Difficulty mix: {b.difficulty ? `easy ${b.difficulty.easy} %, medium ${b.difficulty.medium} %, hard ${b.difficulty.hard} %` : "none (any band)"}. Fixed items: {b.fixed?.length ?? 0}.
      </p>
      {problems.length > 0 ? (
        <div className="rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
          <p className="font-semibold">The bank cannot fill this blueprint yet</p>
          <ul className="list-disc pl-5">
            {problems.map((p) => (
              <li key={p.topic + p.message}>{p.message}</li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="text-sm text-muted">The bank's published items can fill this blueprint.</p>
      )}
    </section>
  );
}
