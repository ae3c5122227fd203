import { Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import type { AnalysedItem, ItemAnalysisView } from "~/db/queries/item-analysis.server";
import { FEW_ANSWERS_TEXT, FLAG_TEXT, FLAG_THRESHOLDS } from "~/domain/psychometrics/form-analysis";
import { loadAnalysis } from "./exam-analysis-load.server";
import type { Route } from "./+types/exam-analysis";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:bank");
  return loadAnalysis(viewer.org.id, params.examId, request);
}

const fixed = (n: number | null, digits = 2) => (n === null ? "—" : n.toFixed(digits));
const points = (n: number) => (Number.isInteger(n) ? String(n) : n.toFixed(1));

export default function ExamAnalysisPage() {
  const a = useLoaderData<typeof loader>();
  const query = a.version.live ? "" : `?version=${a.version.version}`;
  const flagged = a.items.filter((i) => i.flags.length > 0).length;
  return (
    <section aria-labelledby="analysis-heading" className="flex flex-col gap-6">
      <p>
        <Link to={`/bank/exams/${a.exam.id}`}>← {a.exam.title}</Link>
      </p>
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="analysis-heading" className="text-2xl font-semibold">
          Item analysis: {a.exam.title}
        </h2>
        <p className="flex gap-4">
          <a href={`/bank/exams/${a.exam.id}/analysis.csv${query}`} download>
            Download CSV
          </a>
          <a href={`/bank/exams/${a.exam.id}/analysis.pdf${query}`} download>
            Download PDF (one page)
          </a>
        </p>
      </div>

      <p>
        Version {a.version.version}
        {a.version.live ? " (live)" : ""} · pass mark {a.version.passMarkPercent} % · {a.examinees} {a.examinees === 1 ? "examinee" : "examinees"} (first sittings)
        {a.retakesExcluded > 0 ? ` · ${a.retakesExcluded} ${a.retakesExcluded === 1 ? "retake" : "retakes"} not analysed` : ""}
      </p>
      {a.versions.length > 1 ? (
        <nav aria-label="Exam versions">
          <p className="text-sm">
            Other versions:{" "}
            {a.versions
              .filter((v) => v.version !== a.version.version)
              .map((v, i) => (
                <span key={v.version}>
                  {i > 0 ? " · " : ""}
                  <Link to={`/bank/exams/${a.exam.id}/analysis${v.live ? "" : `?version=${v.version}`}`}>
                    version {v.version} ({v.examinees} examinees)
                  </Link>
                </span>
              ))}
          </p>
        </nav>
      ) : null}

      {a.examinees === 0 ? (
        <p className="text-muted">Nobody has completed a graded sitting of this version yet, so there is nothing to analyse.</p>
      ) : (
        <>
          {a.smallSample ? (
            <p role="note" className="rounded-md border border-coral p-3">
              <strong className="font-semibold">Few examinees.</strong> Only {a.examinees} examinees sat this version; with fewer than {FLAG_THRESHOLDS.minExaminees} the statistics below can change a lot with a few more sittings (common practice, no source). Read them as a first look.
            </p>
          ) : null}
          <Method a={a} />
          <Reliability a={a} />
          <Distribution a={a} />
          <section aria-labelledby="items-heading" className="flex flex-col gap-3">
            <h3 id="items-heading" className="text-xl font-semibold">
              Items ({a.items.length}, {flagged} flagged)
            </h3>
            <p className="text-sm text-muted">
              p is the share who answered right (the mean fraction of the item's points). r is the corrected point-biserial: the correlation of the item with the examinee's score on the
              rest of their form. D is the upper group's share right minus the lower group's. Flags (thresholds are common practice, no source): too easy above {FLAG_THRESHOLDS.tooEasyAbove},
              too hard below {FLAG_THRESHOLDS.tooHardBelow}, weak discrimination with r below {FLAG_THRESHOLDS.weakBelow}, negative below {FLAG_THRESHOLDS.negativeBelow}, and a wrong option nobody
              chose once at least {FLAG_THRESHOLDS.minWrongForUnusedOption} answered wrong. An item seen by fewer than {FLAG_THRESHOLDS.minItemAnswers} examinees carries a caution beside its count.
            </p>
            <ItemTable items={a.items} />
          </section>
          <section aria-labelledby="groups-heading" className="flex flex-col gap-2">
            <h3 id="groups-heading" className="text-xl font-semibold">
              How the upper and lower groups are formed
            </h3>
            <p>{a.groupRule}</p>
            {a.summary.method === "random-forms" ? <p>Because forms are drawn at random, each item's groups are formed among the examinees who saw it, ranked by their total on their own form.</p> : null}
          </section>
        </>
      )}
    </section>
  );
}

function Method({ a }: { a: ItemAnalysisView }) {
  return (
    <section aria-labelledby="method-heading" className="flex flex-col gap-2">
      <h3 id="method-heading" className="text-xl font-semibold">
        What was analysed
      </h3>
      {a.summary.method === "same-form" ? (
        <p>Every examinee answered the same {a.summary.formLength} items, so the classical statistics apply as for a printed test.</p>
      ) : (
        <p>
          Each examinee answered a form of {a.summary.formLength ?? "varying numbers of"} items drawn from the bank by the blueprint, so not everyone saw every item. Each item's p, r and D
          are computed over the examinees who saw it, against their total on their own form. KR-21 uses only the number of items, the mean and the variance of the totals, so it applies as
          usual to randomly drawn forms. KR-20 needs the Σpq of one form: here it is the Σpq of each examinee's own form, from the items' statistics, averaged over the examinees — an
          approximation for the average drawn form.
        </p>
      )}
      <p className="text-sm text-muted">
        Only each person's first sitting in a cycle counts: a retake is the same person again, who has seen items of the first form. Items are counted by item; an item edited while this
        version ran has its item versions pooled (listed beside it).
      </p>
    </section>
  );
}

function Reliability({ a }: { a: ItemAnalysisView }) {
  const s = a.summary;
  const k = s.formLength;
  const pct = (x: number) => `${x.toFixed(1)} %`;
  return (
    <section aria-labelledby="reliability-heading" className="flex flex-col gap-2">
      <h3 id="reliability-heading" className="text-xl font-semibold">
        Reliability
      </h3>
      <dl className="grid max-w-2xl grid-cols-[auto_1fr] gap-x-6 gap-y-1">
        <dt className="font-semibold">Mean score</dt>
        <dd className="tabular-nums">
          {fixed(s.mean)} of {k ?? "—"} items{s.meanPercent !== null ? ` (${pct(s.meanPercent)})` : ""}
        </dd>
        <dt className="font-semibold">Standard deviation</dt>
        <dd className="tabular-nums">{fixed(s.sd)} items</dd>
        <dt className="font-semibold">KR-20</dt>
        <dd className="tabular-nums">
          {fixed(s.kr20, 3)}
          {s.method === "random-forms" ? " (average drawn form)" : ""}
        </dd>
        <dt className="font-semibold">KR-21</dt>
        <dd className="tabular-nums">{fixed(s.kr21, 3)}</dd>
        <dt className="font-semibold">Standard error of measurement</dt>
        <dd className="tabular-nums">{s.sem === null ? "—" : `${s.sem.toFixed(2)} items (SD × √(1 − KR-20))`}</dd>
      </dl>
      <p className="text-sm text-muted">
        {s.varianceKind === "population" ? "Variances divide by N (population variance), as the classical worked examples do." : "Variances divide by N − 1 (sample variance)."} KR-20 and
        KR-21: Kuder GF, Richardson MW, Psychometrika 1937; SEM: Lane, Online Statistics Education, glossary. Values near 1 mean another sitting would rank the examinees much the same.
      </p>
      {a.passBand ? (
        <p>
          Pass mark {points(a.passBand.cut)} of {k} items ({a.version.passMarkPercent} %). One SEM either side is {a.passBand.low.toFixed(1)} to {a.passBand.high.toFixed(1)} items (
          {pct(a.passBand.lowPercent)} to {pct(a.passBand.highPercent)}): the exam cannot confidently place a score in this band on either side of the mark (a 68 % band).{" "}
          {a.passBand.inside} of {a.examinees} examinees scored inside it.
        </p>
      ) : (
        <p className="text-muted">No band around the pass mark: the standard error of measurement is undefined for these attempts.</p>
      )}
    </section>
  );
}

function Distribution({ a }: { a: ItemAnalysisView }) {
  const bins = a.distribution;
  const max = Math.max(1, ...bins.map((b) => b.count));
  const width = 640;
  const height = 220;
  const left = 36;
  const bottom = 30;
  const top = 12;
  const plotW = width - left - 8;
  const plotH = height - top - bottom;
  const barW = plotW / Math.max(1, bins.length);
  const cut = a.passBand?.cut ?? (a.summary.formLength ? (a.summary.formLength * a.version.passMarkPercent) / 100 : null);
  const words = bins
    .filter((b) => b.count > 0)
    .map((b) => `${b.score}: ${b.count}`)
    .join("; ");
  return (
    <section aria-labelledby="distribution-heading" className="flex flex-col gap-2">
      <h3 id="distribution-heading" className="text-xl font-semibold">
        Score distribution
      </h3>
      <figure className="flex flex-col gap-2">
        <svg viewBox={`0 0 ${width} ${height}`} className="w-full max-w-3xl" role="img" aria-labelledby="distribution-caption">
          <line x1={left} y1={top + plotH} x2={width - 8} y2={top + plotH} stroke="#5B6B68" strokeWidth="1" />
          <text x={left - 6} y={top + 4} textAnchor="end" fontSize="11" fill="#5B6B68">
            {max}
          </text>
          <text x={left - 6} y={top + plotH} textAnchor="end" fontSize="11" fill="#5B6B68">
            0
          </text>
          {bins.map((b, i) => {
            const h = (b.count / max) * plotH;
            return (
              <g key={b.score}>
                <rect x={left + i * barW + 1} y={top + plotH - h} width={Math.max(1, barW - 2)} height={h} fill="#0F5C57" />
                <text x={left + i * barW + barW / 2} y={height - 12} textAnchor="middle" fontSize="10" fill="#17302E">
                  {b.score}
                </text>
              </g>
            );
          })}
          {cut !== null ? (
            <g>
              <line x1={left + cut * barW} y1={top} x2={left + cut * barW} y2={top + plotH} stroke="#B8432A" strokeWidth="2" strokeDasharray="5 3" />
              <text x={left + cut * barW + 4} y={top + 10} fontSize="11" fill="#B8432A">
                pass mark
              </text>
            </g>
          ) : null}
        </svg>
        <figcaption id="distribution-caption" className="text-sm">
          Examinees by score (items right out of {a.summary.formLength ?? "the form"}), with the pass mark as a dashed line. Score: examinees — {words}.
        </figcaption>
      </figure>
      <details>
        <summary>The distribution as a table</summary>
        <LedgerTable caption="Examinees by score" maxHeight="max-h-80">
          <thead>
            <tr>
              <Th numeric>Score (items right)</Th>
              <Th numeric>Examinees</Th>
            </tr>
          </thead>
          <tbody>
            {bins.map((b) => (
              <tr key={b.score}>
                <Td numeric>{b.score}</Td>
                <Td numeric>{b.count}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      </details>
    </section>
  );
}

function ItemTable({ items }: { items: AnalysedItem[] }) {
  return (
    <LedgerTable caption="Item statistics, flagged items first" maxHeight="max-h-[80vh]">
      <thead>
        <tr>
          <Th>Item</Th>
          <Th>Topic</Th>
          <Th numeric>Seen by</Th>
          <Th numeric>p</Th>
          <Th numeric>r (corrected)</Th>
          <Th numeric>D</Th>
          <Th>Flags</Th>
        </tr>
      </thead>
      <tbody>
        {items.map((item) => (
          <tr key={item.itemId}>
            <Td className="min-w-72">
              <p>{item.stemStart}</p>
              <p className="text-sm">
                <Link to={`/bank/items/${item.itemId}/edit`}>Edit this item</Link>
                {item.versionsSeen.length > 1 ? <span className="text-muted"> · answered in item versions {item.versionsSeen.join(", ")}</span> : null}
              </p>
              {item.options ? <OptionDetails item={item} /> : null}
            </Td>
            <Td className="text-sm">{item.topics.join(", ")}</Td>
            <Td numeric>
              {item.seenBy}
              {item.fewAnswers ? <span className="block text-xs font-normal text-muted">{FEW_ANSWERS_TEXT}</span> : null}
            </Td>
            <Td numeric>{fixed(item.p)}</Td>
            <Td numeric>{fixed(item.correctedPointBiserial)}</Td>
            <Td numeric>{fixed(item.discrimination)}</Td>
            <Td className="min-w-64 text-sm">
              {item.flags.length === 0 ? (
                <span className="text-muted">None</span>
              ) : (
                <ul className="flex flex-col gap-1">
                  {item.flags.map((f) => (
                    <li key={f}>
                      <strong className="font-semibold text-coral">{FLAG_TEXT[f].label}.</strong> {FLAG_TEXT[f].explain}
                    </li>
                  ))}
                </ul>
              )}
            </Td>
          </tr>
        ))}
      </tbody>
    </LedgerTable>
  );
}

function OptionDetails({ item }: { item: AnalysedItem }) {
  const g = item.groupSize;
  const share = (x: number) => (g > 0 ? `${Math.round((x / g) * 100)} %` : "—");
  const n = (x: number) => (Number.isInteger(x) ? String(x) : x.toFixed(1));
  return (
    <details className="mt-2">
      <summary className="text-sm">Option choices by the upper and lower groups ({g} each)</summary>
      <table className="mt-2 w-full text-sm">
        <caption className="sr-only">Option choices for this item by group</caption>
        <thead>
          <tr>
            <th scope="col" className="py-1 pr-2 text-left font-semibold">
              Option
            </th>
            <th scope="col" className="py-1 pr-2 text-right font-semibold">
              Upper
            </th>
            <th scope="col" className="py-1 pr-2 text-right font-semibold">
              Lower
            </th>
            <th scope="col" className="py-1 text-right font-semibold">
              All
            </th>
          </tr>
        </thead>
        <tbody>
          {item.options!.map((o) => (
            <tr key={o.text} className="border-t border-rule">
              <th scope="row" className="py-1 pr-2 text-left font-normal">
                {o.text}
                {o.correct ? <strong className="font-semibold"> (key)</strong> : null}
                {!o.correct && o.all === 0 ? <span className="text-coral"> — nobody chose it</span> : null}
              </th>
              <td className="py-1 pr-2 text-right tabular-nums">
                {n(o.upper)} ({share(o.upper)})
              </td>
              <td className="py-1 pr-2 text-right tabular-nums">
                {n(o.lower)} ({share(o.lower)})
              </td>
              <td className="py-1 text-right tabular-nums">{o.all}</td>
            </tr>
          ))}
          {item.unanswered.all > 0 ? (
            <tr className="border-t border-rule">
              <th scope="row" className="py-1 pr-2 text-left font-normal text-muted">
                No answer
              </th>
              <td className="py-1 pr-2 text-right tabular-nums">{n(item.unanswered.upper)}</td>
              <td className="py-1 pr-2 text-right tabular-nums">{n(item.unanswered.lower)}</td>
              <td className="py-1 text-right tabular-nums">{item.unanswered.all}</td>
            </tr>
          ) : null}
        </tbody>
      </table>
      <p className="mt-1 text-xs text-muted">Examinees tied at a group's edge count as a share of an examinee, so group counts can be fractional.</p>
    </details>
  );
}

export const meta: Route.MetaFunction = ({ data: d }) => [{ title: `Item analysis · ${d?.exam.title ?? "Exam"} · Bank · Tidemark` }];
