/**
 * Guided exercises: the one loaded (steps, the question, and the answer behind a reveal) and the
 * list to choose from. Each exercise is an ordinary link (?exercise=id), so it loads with one
 * click, works before JavaScript arrives, and can be shared with a colleague.
 */
import { useEffect, useRef } from "react";
import { Link } from "react-router";
import { buttonClass } from "~/components/ui/button";
import { MODE_LABELS } from "./bench-form";
import type { Exercise } from "./exercise";

export function ActiveExercise({ exercise, onRestart, focusOnMount }: { exercise: Exercise; onRestart: () => void; focusOnMount: boolean }) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => {
    // Loaded from the list below: take keyboard and screen-reader focus to what was loaded.
    if (focusOnMount) heading.current?.focus();
  }, [focusOnMount]);
  return (
    <section aria-labelledby="exercise-heading" className="mb-6 rounded-lg border border-rule border-l-4 border-l-sea bg-card p-4">
      <p className="text-sm font-semibold text-muted">Exercise · {MODE_LABELS[exercise.mode]}</p>
      <h2 id="exercise-heading" ref={heading} tabIndex={-1} className="text-xl font-semibold">
        {exercise.title}
      </h2>
      <ol className="mt-2 list-decimal space-y-1 pl-6">
        {exercise.steps.map((step) => (
          <li key={step}>{step}</li>
        ))}
      </ol>
      <p className="mt-3">
        <strong className="font-semibold">Question.</strong> {exercise.question}
      </p>
      <details className="mt-3 rounded-md border border-rule bg-paper">
        <summary className="min-h-11 cursor-pointer px-3 py-2 font-semibold text-sea">Show the answer</summary>
        <div className="space-y-2 px-3 pb-3">
          <p>
            <strong className="font-semibold">Answer.</strong> {exercise.answer}
          </p>
          <p>
            <strong className="font-semibold">Why.</strong> {exercise.rationale}
          </p>
        </div>
      </details>
      <div className="mt-3 flex flex-wrap gap-2">
        <button type="button" className={buttonClass("secondary")} onClick={onRestart}>
          Restart this exercise
        </button>
        <Link to="/bench" className={buttonClass("quiet")}>
          Leave the exercise
        </Link>
      </div>
    </section>
  );
}

export function ExerciseList({ exercises, activeId }: { exercises: readonly Exercise[]; activeId: string | null }) {
  return (
    <section aria-labelledby="exercises-heading" className="mt-10">
      <h2 id="exercises-heading" className="text-2xl font-semibold">
        Guided exercises
      </h2>
      <p className="text-muted">Each loads a short scenario into the bench, tells you what to watch and ends with a question.</p>
      <ol className="mt-4 grid gap-3 md:grid-cols-2">
        {exercises.map((e, i) => (
          <li key={e.id} className="flex flex-col rounded-lg border border-rule bg-card p-4">
            <p className="text-sm text-muted">
              {i + 1} · {MODE_LABELS[e.mode]}
            </p>
            <h3 className="text-lg font-semibold">{e.title}</h3>
            <p className="mt-1 grow">{e.summary}</p>
            <div className="mt-3">
              {e.id === activeId ? (
                <p className="inline-flex min-h-11 items-center font-semibold text-sea">Loaded above</p>
              ) : (
                <Link to={`/bench?exercise=${e.id}`} className={buttonClass("secondary", "no-underline")} aria-label={`Load exercise: ${e.title}`}>
                  Load exercise
                </Link>
              )}
            </div>
          </li>
        ))}
      </ol>
    </section>
  );
}
