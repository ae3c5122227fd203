import { useState } from "react";
import { useFetcher } from "react-router";
import { TextAreaField } from "~/components/ui/field";
import { RESULT_WORDS, type Mark, type Step, type StepResult } from "~/domain/checkoffs/record";

const RESULTS: StepResult[] = ["met", "not-met", "not-applicable"];

const TONE: Record<StepResult, string> = {
  met: "border-sea bg-sea text-white",
  "not-met": "border-coral bg-coral text-white",
  "not-applicable": "border-ink bg-ink text-white",
};

/**
 * One step at the bedside: three large buttons (at least 56 px tall, PRODUCT.md asks 44) that
 * save on the tap through a fetcher, and a comment saved with the next tap or its own button.
 * What is shown is the tap in flight, then what the server saved, so a reload shows the same.
 */
export function StepRow({ index, step, mark, editable, intent }: { index: number; step: Step; mark: Mark | undefined; editable: boolean; intent: string }) {
  const fetcher = useFetcher<{ message?: string }>();
  const pending = fetcher.formData?.get("result");
  const shown = (typeof pending === "string" ? pending : mark?.result) as StepResult | undefined;
  const [comment, setComment] = useState(mark?.comment ?? "");
  const label = `Step ${index + 1}`;
  const error = fetcher.data?.message;
  return (
    <li className="rounded-lg border border-rule bg-card p-4" data-testid={`step-${index + 1}`} data-result={mark?.result ?? ""}>
      <div className="flex flex-wrap items-start gap-3">
        <span className="min-w-8 text-xl font-semibold tabular-nums text-muted">{index + 1}.</span>
        <p className="flex-1 text-lg">
          {step.text}
          {step.critical ? (
            <span className="ml-2 inline-flex items-center gap-1 rounded border border-coral px-1.5 text-sm font-semibold text-coral">
              <svg width="12" height="12" viewBox="0 0 12 12" aria-hidden="true">
                <path d="M6 1 11 10H1Z" fill="none" stroke="currentColor" strokeWidth="1.5" />
              </svg>
              Critical
            </span>
          ) : null}
        </p>
      </div>
      {editable ? (
        <fetcher.Form method="post" className="mt-3 flex flex-col gap-2">
          <input type="hidden" name="intent" value={intent} />
          <input type="hidden" name="stepIndex" value={index} />
          <div role="group" aria-label={`${label}: result`} className="grid grid-cols-3 gap-2">
            {RESULTS.map((r) => (
              <button
                key={r}
                type="submit"
                name="result"
                value={r}
                aria-pressed={shown === r}
                className={`min-h-14 rounded-md border-2 px-2 text-lg font-semibold ${shown === r ? TONE[r] : "border-sea bg-card text-sea"}`}
              >
                {shown === r ? "✓ " : ""}
                {RESULT_WORDS[r]}
                <span className="sr-only"> — {label}</span>
              </button>
            ))}
          </div>
          <TextAreaField
            id={`comment-${index}`}
            name="comment"
            label={`Comment on step ${index + 1}`}
            hint={shown === "not-met" ? "Required for a step not met: what was missed." : "Optional. Saved with the next tap, or with the button."}
            rows={2}
            value={comment}
            onChange={(e) => setComment(e.currentTarget.value)}
            errors={error ? [error] : undefined}
          />
          {shown ? (
            <div>
              <button type="submit" name="result" value={shown} className="min-h-11 rounded-md border border-sea bg-card px-4 font-semibold text-sea">
                Save comment<span className="sr-only"> on step {index + 1}</span>
              </button>
              <span className="ml-3 text-sm text-muted" aria-live="polite">
                {fetcher.state !== "idle" ? "Saving…" : mark ? "Saved" : ""}
              </span>
            </div>
          ) : null}
        </fetcher.Form>
      ) : (
        <div className="mt-2 pl-11">
          <p className="font-semibold">{mark ? RESULT_WORDS[mark.result] : <span className="text-muted">Not marked</span>}</p>
          {mark?.comment ? <p className="text-muted">Comment: {mark.comment}</p> : null}
        </div>
      )}
    </li>
  );
}
