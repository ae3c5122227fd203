/**
 * An item exactly as a therapist sees it: the stem, the answer control of its type, and after
 * "Check answer" the verdict, the rationale and the reference. Built from the version's
 * content and a seed with the same pure functions an attempt uses, in the browser and on the
 * server alike. "Phone width" draws it in a 360 px frame, the narrowest common phone viewport.
 */
import { useId, useMemo, useState } from "react";
import { AnswerControl, type GivenAnswer } from "~/components/exams/answer-control";
import { Button } from "~/components/ui/button";
import type { ItemContent } from "~/domain/bank/item-content";
import { gradeResponse, presentItem, type Response } from "~/domain/bank/present";
import { parseNumericAnswer } from "~/domain/scoring";

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
  const [given, setGiven] = useState<GivenAnswer | null>(presented.kind === "ordering" ? { kind: "ordering", order: presented.steps.map((s) => s.id) } : null);
  const [checked, setChecked] = useState(false);
  const name = useId();
  const response = given ? responseOfGiven(given, presented.kind === "numeric" ? presented.unit : "") : null;
  const correct = checked && response ? gradeResponse(key, response) : null;
  return (
    <div className="flex flex-col gap-4 rounded-md border border-rule bg-card p-4">
      <p className="whitespace-pre-line text-lg" data-testid="preview-stem">
        {presented.stem}
      </p>
      <AnswerControl
        presented={presented}
        answer={given}
        name={name}
        onAnswer={(a) => {
          setGiven(a);
          setChecked(false);
        }}
      />
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

/** What the preview grades: the answer as given, a typed number read as an exam reads it. */
function responseOfGiven(given: GivenAnswer, unit: string): Response {
  if (given.kind !== "numeric") return given;
  const parsed = parseNumericAnswer(given.text, unit);
  return { kind: "numeric", value: parsed.ok ? parsed.value : Number.NaN };
}
