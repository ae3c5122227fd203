/**
 * One version's content as an educator reads it (key included), and, for scenario items, the
 * same stem drawn with several seeds side by side, each with the answer the bench computed.
 */
import { useMemo } from "react";
import { SCENARIO_TEMPLATES } from "~/domain/bench";
import { ITEM_TYPE_LABELS, type ItemContent } from "~/domain/bank/item-content";
import { presentItem } from "~/domain/bank/present";

export function VersionDetails({ content, topicNames }: { content: ItemContent; topicNames: Map<string, string> }) {
  const key = useMemo(() => (content.body.kind === "scenario" ? null : presentItem(content, 1).key), [content]);
  return (
    <dl className="grid gap-x-6 gap-y-2 rounded-md border border-rule bg-card p-4 md:grid-cols-[12rem_1fr]">
      <dt className="font-semibold">Type</dt>
      <dd>
        {ITEM_TYPE_LABELS[content.type]}
        {content.scenario ? ` · scenario from the bench template "${SCENARIO_TEMPLATES[content.scenario.templateId].title}"` : ""}
      </dd>
      <dt className="font-semibold">Topics</dt>
      <dd>{content.topics.map((t) => topicNames.get(t) ?? t).join(", ")}</dd>
      <dt className="font-semibold">Stem</dt>
      <dd className="whitespace-pre-line">{content.stem}</dd>
      {content.body.kind === "single" || content.body.kind === "multiple" ? (
        <>
          <dt className="font-semibold">Options</dt>
          <dd>
            <ol className="list-decimal pl-6">
              {content.body.options.map((o, i) => (
                <li key={o}>
                  {o}
                  {(content.body.kind === "single" ? content.body.correct === i : (content.body as { correct: number[] }).correct.includes(i)) ? <strong> — correct</strong> : null}
                </li>
              ))}
            </ol>
          </dd>
        </>
      ) : null}
      {content.body.kind === "ordering" ? (
        <>
          <dt className="font-semibold">Correct order</dt>
          <dd>
            <ol className="list-decimal pl-6">
              {content.body.steps.map((s) => (
                <li key={s}>{s}</li>
              ))}
            </ol>
          </dd>
        </>
      ) : null}
      {key && (key.kind === "numeric" || key.kind === "waveform-point") ? (
        <>
          <dt className="font-semibold">Key</dt>
          <dd>
            {key.text}
            {content.body.kind === "numeric" ? `; ${content.body.decimals} decimal${content.body.decimals === 1 ? "" : "s"} expected` : ""}
          </dd>
        </>
      ) : null}
      <dt className="font-semibold">Rationale</dt>
      <dd className="whitespace-pre-line">{content.rationale}</dd>
      <dt className="font-semibold">Reference</dt>
      <dd>{content.reference}</dd>
    </dl>
  );
}

export function ScenarioSeeds({ content }: { content: ItemContent }) {
  const seeds = content.scenario?.previewSeeds ?? [];
  const drawn = useMemo(() => seeds.map((seed) => ({ seed, ...presentItem(content, seed) })), [content, seeds]);
  return (
    <section aria-labelledby="seeds-heading" className="flex flex-col gap-3">
      <h3 id="seeds-heading" className="text-xl font-semibold">
        Seeds side by side
      </h3>
      <p className="text-muted">Each attempt draws its own seed; the answer is computed by the bench for that seed, never typed in.</p>
      <ul className="grid gap-3 md:grid-cols-2 xl:grid-cols-3">
        {drawn.map((d) => (
          <li key={d.seed} className="flex flex-col gap-2 rounded-md border border-rule bg-card p-3" data-testid="seed-card">
            <p className="font-semibold">Seed {d.seed}</p>
            <p className="whitespace-pre-line text-sm">{d.presented.stem}</p>
            {d.presented.kind === "single" ? (
              <ul className="list-disc pl-5 text-sm">
                {d.presented.options.map((o) => (
                  <li key={o.id}>{o.text}</li>
                ))}
              </ul>
            ) : null}
            <p className="text-sm">
              <span className="font-semibold">Bench answer: </span>
              {d.key.text}
            </p>
            {d.generated ? <p className="text-sm text-muted">{d.generated.rationale}</p> : null}
          </li>
        ))}
      </ul>
    </section>
  );
}
