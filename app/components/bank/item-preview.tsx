/**
 * An item exactly as a therapist sees it: the stem, the answer control of its type, and after
 * "Check answer" the verdict, the rationale and the reference. Built from the version's
 * content and a seed with the same pure functions an attempt uses, in the browser and on the
 * server alike. "Phone width" draws it in a 360 px frame, the narrowest common phone viewport.
 */
import { useId, useMemo, useState } from "react";
import { WaveformPlot } from "~/components/waveform";
import { Button } from "~/components/ui/button";
import type { ItemContent } from "~/domain/bank/item-content";
import { gradeResponse, presentItem, type Response } from "~/domain/bank/present";

export function ItemPreview({ content, seed, title = "Therapist view" }: { content: ItemContent; seed: number; title?: string }) {
  const [phone, setPhone] = useState(false);
  const headingId = useId();
  return (
    <section aria-labelledby={headingId} className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 id={headingId} className="text-xl font-semibold">
          {title}
        </h3>
        <Button variant="secondary" aria-pressed={phone} onClick={() => setPhone((p) => !p)}>
          {phone ? "Full width" : "Phone width"}
        </Button>
      </div>
      <div className={phone ? "mx-auto w-[360px] max-w-full rounded-2xl border-4 border-ink/70 p-3" : ""} data-testid="therapist-view" data-phone={phone}>
        <QuestionCard content={content} seed={seed} />
      </div>
    </section>
  );
}

function QuestionCard({ content, seed }: { content: ItemContent; seed: number }) {
  const { presented, key } = useMemo(() => presentItem(content, seed), [content, seed]);
  // An ordering can be submitted as shown (it is never shown in the correct order).
  const [response, setResponse] = useState<Response | null>(presented.kind === "ordering" ? { kind: "ordering", order: presented.steps.map((s) => s.id) } : null);
  const [checked, setChecked] = useState(false);
  const name = useId();
  const update = (r: Response) => {
    setResponse(r);
    setChecked(false);
  };
  const correct = checked && response ? gradeResponse(key, response) : null;
  return (
    <div className="flex flex-col gap-4 rounded-md border border-rule bg-card p-4">
      <p className="whitespace-pre-line text-lg" data-testid="preview-stem">
        {presented.stem}
      </p>
      {presented.kind === "single" || presented.kind === "multiple" ? (
        <fieldset className="flex flex-col gap-1">
          <legend className="mb-1 font-semibold">{presented.kind === "single" ? "Choose one answer" : "Choose every correct answer"}</legend>
          {presented.options.map((o) => {
            const chosen = response?.kind === "multiple" ? response.choices.includes(o.id) : response?.kind === "single" && response.choice === o.id;
            return (
              <label key={o.id} className="flex min-h-11 items-center gap-3 rounded-md px-2 hover:bg-sea-wash">
                <input
                  type={presented.kind === "single" ? "radio" : "checkbox"}
                  name={name}
                  checked={chosen}
                  onChange={(e) => {
                    if (presented.kind === "single") update({ kind: "single", choice: o.id });
                    else {
                      const prev = response?.kind === "multiple" ? response.choices : [];
                      update({ kind: "multiple", choices: e.target.checked ? [...prev, o.id] : prev.filter((c) => c !== o.id) });
                    }
                  }}
                  className="h-5 w-5"
                />
                <span>{o.text}</span>
              </label>
            );
          })}
        </fieldset>
      ) : null}
      {presented.kind === "numeric" ? (
        <div className="flex flex-col gap-1">
          <label htmlFor={`${name}-numeric`} className="font-semibold">
            Your answer ({presented.unit}, {presented.decimals === 0 ? "a whole number" : `${presented.decimals} decimal${presented.decimals > 1 ? "s" : ""}`})
          </label>
          <div className="flex items-center gap-2">
            <input
              id={`${name}-numeric`}
              inputMode="decimal"
              className="w-40 rounded-md border border-muted/60 bg-card px-3 py-2"
              onChange={(e) => update({ kind: "numeric", value: e.target.value.trim() === "" ? Number.NaN : Number(e.target.value) })}
            />
            <span>{presented.unit}</span>
          </div>
        </div>
      ) : null}
      {presented.kind === "ordering" ? <OrderingControl steps={presented.steps} onChange={(order) => update({ kind: "ordering", order })} /> : null}
      {presented.kind === "waveform-point" ? (
        <div className="flex flex-col gap-2">
          <WaveformPlot
            waveform={presented.waveform}
            breaths={presented.breaths}
            startS={presented.viewFromS}
            endS={presented.viewToS}
            showTable={false}
            markers={response?.kind === "waveform-point" ? [{ timeS: response.timeS, label: "Your answer" }] : []}
            onPointClick={(timeS) => update({ kind: "waveform-point", timeS: Number(timeS.toFixed(2)) })}
          />
          <p className="text-sm text-muted" aria-live="polite">
            {response?.kind === "waveform-point" ? `You marked ${response.timeS.toFixed(2)} s.` : "Click the moment on the waveform, or use the slider under it."}
          </p>
        </div>
      ) : null}
      <div>
        <Button onClick={() => setChecked(true)} disabled={!response}>
          Check answer
        </Button>
      </div>
      {checked && correct !== null ? (
        <div role="status" className={`rounded-md border-l-4 px-4 py-3 ${correct ? "border-sea bg-sea-wash" : "border-coral bg-coral-wash"}`}>
          <p className="font-semibold">{correct ? "Correct." : `Not correct. The answer: ${key.text}.`}</p>
          <p className="mt-2 whitespace-pre-line">
            <span className="font-semibold">Why: </span>
            {content.rationale}
          </p>
          <p className="mt-2 text-sm">
            <span className="font-semibold">Reference: </span>
            {content.reference}
          </p>
        </div>
      ) : null}
    </div>
  );
}

function OrderingControl({ steps, onChange }: { steps: { id: number; text: string }[]; onChange: (order: number[]) => void }) {
  const [order, setOrder] = useState(steps);
  const move = (i: number, by: number) => {
    const next = [...order];
    const [s] = next.splice(i, 1);
    next.splice(i + by, 0, s);
    setOrder(next);
    onChange(next.map((x) => x.id));
  };
  return (
    <div>
      <p className="mb-1 font-semibold">Put the steps in order (first at the top)</p>
      <ol className="flex flex-col gap-1">
        {order.map((s, i) => (
          <li key={s.id} className="flex items-center gap-2 rounded-md border border-rule px-2 py-1">
            <span className="w-6 text-right tabular-nums">{i + 1}.</span>
            <span className="flex-1">{s.text}</span>
            <Button variant="quiet" aria-label={`Move "${s.text}" up`} disabled={i === 0} onClick={() => move(i, -1)}>
              Up
            </Button>
            <Button variant="quiet" aria-label={`Move "${s.text}" down`} disabled={i === order.length - 1} onClick={() => move(i, 1)}>
              Down
            </Button>
          </li>
        ))}
      </ol>
    </div>
  );
}
