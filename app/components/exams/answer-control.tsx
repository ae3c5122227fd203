/**
 * The answer control of one question as a therapist sees it in an exam: radio buttons, check
 * boxes, a number field, an ordering list moved with buttons, or a point marked on a waveform.
 * Every change is handed to `onAnswer` at once (a typed number when the field is left or after a
 * short pause), so the page can save it; the control never knows the key.
 */
import { useEffect, useRef, useState } from "react";
import { Button } from "~/components/ui/button";
import { WaveformPlot } from "~/components/waveform";
import type { Presented } from "~/domain/bank/present";

/** An answer as the page sends it; a numeric answer is the text typed (the server reads it). */
export type GivenAnswer =
  | { kind: "single"; choice: number }
  | { kind: "multiple"; choices: number[] }
  | { kind: "numeric"; text: string }
  | { kind: "ordering"; order: number[] }
  | { kind: "waveform-point"; timeS: number };

/** What the server has stored, turned back into what the control shows. */
export function givenFromStored(stored: unknown): GivenAnswer | null {
  if (!stored || typeof stored !== "object") return null;
  const s = stored as { kind: string; text?: string; value?: number };
  if (s.kind === "numeric") return { kind: "numeric", text: s.text ?? String(s.value ?? "") };
  return stored as GivenAnswer;
}

type Props = {
  presented: Presented;
  answer: GivenAnswer | null;
  onAnswer: (answer: GivenAnswer | null) => void;
  /** Prefix for ids and radio-group names, unique on the page. */
  name: string;
  disabled?: boolean;
  /** Ids of the elements that describe the control (e.g. a refusal message). */
  describedBy?: string;
};

export function AnswerControl({ presented, answer, onAnswer, name, disabled, describedBy }: Props) {
  switch (presented.kind) {
    case "single":
    case "multiple":
      return (
        <fieldset className="flex flex-col gap-1" disabled={disabled} aria-describedby={describedBy}>
          <legend className="mb-1 font-semibold">{presented.kind === "single" ? "Choose one answer" : "Choose every correct answer"}</legend>
          {presented.options.map((o) => {
            const chosen = answer?.kind === "multiple" ? answer.choices.includes(o.id) : answer?.kind === "single" && answer.choice === o.id;
            return (
              <label key={o.id} className="flex min-h-11 items-center gap-3 rounded-md px-2 hover:bg-sea-wash">
                <input
                  type={presented.kind === "single" ? "radio" : "checkbox"}
                  name={`${name}-choice`}
                  checked={chosen}
                  onChange={(e) => {
                    if (presented.kind === "single") onAnswer({ kind: "single", choice: o.id });
                    else {
                      const prev = answer?.kind === "multiple" ? answer.choices : [];
                      const next = e.target.checked ? [...prev, o.id] : prev.filter((c) => c !== o.id);
                      onAnswer(next.length === 0 ? null : { kind: "multiple", choices: next });
                    }
                  }}
                  className="h-5 w-5"
                />
                <span>{o.text}</span>
              </label>
            );
          })}
        </fieldset>
      );
    case "numeric":
      return <NumericControl unit={presented.unit} decimals={presented.decimals} answer={answer} onAnswer={onAnswer} name={name} disabled={disabled} describedBy={describedBy} />;
    case "ordering":
      return <OrderingControl steps={presented.steps} answer={answer} onAnswer={onAnswer} disabled={disabled} />;
    case "waveform-point":
      return (
        <div className="flex flex-col gap-2">
          <WaveformPlot
            waveform={presented.waveform}
            breaths={presented.breaths}
            startS={presented.viewFromS}
            endS={presented.viewToS}
            showTable={false}
            markers={answer?.kind === "waveform-point" ? [{ timeS: answer.timeS, label: "Your answer" }] : []}
            onPointClick={disabled ? undefined : (timeS) => onAnswer({ kind: "waveform-point", timeS: Number(timeS.toFixed(2)) })}
          />
          <p className="text-sm text-muted">
            {answer?.kind === "waveform-point" ? `You marked ${answer.timeS.toFixed(2)} s.` : "Click the moment on the waveform, or use the slider under it."}
          </p>
        </div>
      );
  }
}

function NumericControl({ unit, decimals, answer, onAnswer, name, disabled, describedBy }: { unit: string; decimals: number } & Omit<Props, "presented">) {
  const [text, setText] = useState(answer?.kind === "numeric" ? answer.text : "");
  const sent = useRef(text);
  const timer = useRef<ReturnType<typeof setTimeout>>(undefined);
  const send = (value: string) => {
    clearTimeout(timer.current);
    if (value.trim() === sent.current.trim()) return;
    sent.current = value;
    onAnswer(value.trim() === "" ? null : { kind: "numeric", text: value });
  };
  useEffect(() => () => clearTimeout(timer.current), []);
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={`${name}-numeric`} className="font-semibold">
        Your answer ({unit}, {decimals === 0 ? "a whole number" : `${decimals} decimal${decimals > 1 ? "s" : ""}`})
      </label>
      <div className="flex items-center gap-2">
        <input
          id={`${name}-numeric`}
          inputMode="decimal"
          autoComplete="off"
          value={text}
          disabled={disabled}
          aria-describedby={describedBy}
          className="w-40 rounded-md border border-muted/60 bg-card px-3 py-2"
          onChange={(e) => {
            setText(e.target.value);
            clearTimeout(timer.current);
            const value = e.target.value;
            timer.current = setTimeout(() => send(value), 800);
          }}
          onBlur={(e) => send(e.target.value)}
        />
        <span>{unit}</span>
      </div>
    </div>
  );
}

function OrderingControl({ steps, answer, onAnswer, disabled }: { steps: { id: number; text: string }[] } & Pick<Props, "answer" | "onAnswer" | "disabled">) {
  const byId = new Map(steps.map((s) => [s.id, s]));
  const order = answer?.kind === "ordering" && answer.order.every((id) => byId.has(id)) ? answer.order.map((id) => byId.get(id)!) : steps;
  const [moved, setMoved] = useState<string>("");
  const move = (i: number, by: number) => {
    const next = [...order];
    const [s] = next.splice(i, 1);
    next.splice(i + by, 0, s);
    setMoved(`"${s.text}" is now step ${i + by + 1} of ${next.length}.`);
    onAnswer({ kind: "ordering", order: next.map((x) => x.id) });
  };
  return (
    <div>
      <p className="mb-1 font-semibold">Put the steps in order (first at the top)</p>
      <ol className="flex flex-col gap-1">
        {order.map((s, i) => (
          <li key={s.id} className="flex items-center gap-2 rounded-md border border-rule px-2 py-1">
            <span className="w-6 text-right tabular-nums">{i + 1}.</span>
            <span className="flex-1">{s.text}</span>
            <Button variant="quiet" aria-label={`Move "${s.text}" up`} disabled={disabled || i === 0} onClick={() => move(i, -1)}>
              Up
            </Button>
            <Button variant="quiet" aria-label={`Move "${s.text}" down`} disabled={disabled || i === order.length - 1} onClick={() => move(i, 1)}>
              Down
            </Button>
          </li>
        ))}
      </ol>
      <p className="sr-only" aria-live="polite">
        {moved}
      </p>
      {answer?.kind !== "ordering" && !disabled ? (
        <Button variant="secondary" className="mt-2" onClick={() => onAnswer({ kind: "ordering", order: order.map((x) => x.id) })}>
          Keep this order as my answer
        </Button>
      ) : null}
    </div>
  );
}
