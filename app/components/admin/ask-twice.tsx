import type { SubmissionResult } from "@conform-to/react";
import { useEffect, useRef, useState, type ReactNode } from "react";
import { useFetcher } from "react-router";
import { Button, buttonClass } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";

/**
 * A destructive action that asks twice in place, never in a modal (STYLE.md "Forms"): the
 * first button only reveals the question; the second, which sends confirm=yes, does it.
 * Focus moves to the question and back, so a keyboard or screen-reader user follows along.
 */
export function AskTwice({
  id,
  triggerLabel,
  question,
  confirmLabel,
  intent,
  fields = {},
}: {
  id: string;
  triggerLabel: string;
  question: ReactNode;
  confirmLabel: string;
  intent: string;
  fields?: Record<string, string>;
}) {
  const fetcher = useFetcher<SubmissionResult<string[]>>();
  const [asking, setAsking] = useState(false);
  const questionRef = useRef<HTMLParagraphElement>(null);
  const triggerRef = useRef<HTMLButtonElement>(null);
  const returnFocus = useRef(false);

  useEffect(() => {
    if (asking) questionRef.current?.focus();
    else if (returnFocus.current) {
      returnFocus.current = false;
      triggerRef.current?.focus();
    }
  }, [asking]);

  const errors = Object.values(fetcher.data?.error ?? {}).flatMap((e) => e ?? []);
  const busy = fetcher.state !== "idle";

  if (!asking) {
    return (
      <div className="flex flex-col gap-2">
        <button ref={triggerRef} type="button" className={buttonClass("danger", "self-start")} aria-expanded={false} onClick={() => setAsking(true)}>
          {triggerLabel}
        </button>
      </div>
    );
  }
  return (
    <fetcher.Form method="post" className="flex flex-col gap-3 rounded-md border-l-4 border-coral bg-coral-wash px-4 py-3">
      <p id={`${id}-question`} ref={questionRef} tabIndex={-1} className="font-semibold focus:outline-none">
        {question}
      </p>
      <FormErrors id={`${id}-errors`} errors={errors} />
      {Object.entries(fields).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      <input type="hidden" name="confirm" value="yes" />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" name="intent" value={intent} disabled={busy}>
          {busy ? "Working…" : confirmLabel}
        </Button>
        <Button
          variant="secondary"
          onClick={() => {
            returnFocus.current = true;
            setAsking(false);
          }}
        >
          Cancel
        </Button>
      </div>
    </fetcher.Form>
  );
}
