/**
 * The interactive bench: plot, readings, alarm banner, run controls, one-tap events and the
 * settings form, around one BenchRun. The route keys this component by exercise, so loading an
 * exercise starts from a clean slate.
 */
import { memo, useCallback, useEffect, useMemo, useRef, useState } from "react";
import { parseScenario, type ScenarioInput } from "~/domain/bench/schema";
import type { Scenario } from "~/domain/bench/types";
import { WaveformPlot } from "~/components/waveform/waveform-plot";
import { AlarmBanner } from "./alarm-banner";
import { MODE_LABELS, changesBetween, checkDraft, draftFromScenario, sameDraft, withChanges, type BenchDraft } from "./bench-form";
import { ActiveExercise } from "./exercise-panel";
import type { Exercise } from "./exercise";
import type { OneTap } from "./one-tap-events";
import { ReadingsPanel } from "./readings-panel";
import { OneTapEvents, RunControls } from "./run-controls";
import { SettingsForm, fieldId, type SettingsErrors } from "./settings-form";
import { useBenchRunner } from "./use-bench-runner";

/** True until the first page has hydrated: an exercise opened by address does not steal focus. */
let firstPageLoad = true;

export function BenchWorkbench({ exercise, freePlay }: { exercise: Exercise | null; freePlay: ScenarioInput }) {
  const initial = useMemo(() => parseScenario(exercise?.scenario ?? freePlay), [exercise, freePlay]);
  const [applied, setApplied] = useState<Scenario>(initial);
  const [appliedDraft, setAppliedDraft] = useState<BenchDraft>(() => draftFromScenario(initial));
  const [draft, setDraft] = useState<BenchDraft>(appliedDraft);
  const [errors, setErrors] = useState<SettingsErrors | null>(null);
  const [note, setNote] = useState("");
  const [tapNote, setTapNote] = useState("");
  const runner = useBenchRunner(() => initial);
  const [focusExercise] = useState(() => !firstPageLoad);
  // Marks the bench interactive once hydrated (browser tests wait for it before pressing buttons).
  const [interactive, setInteractive] = useState(false);
  useEffect(() => {
    firstPageLoad = false;
    setInteractive(true);
  }, []);

  // After a refused apply, take focus to the first field with a message.
  const focusPending = useRef(false);
  useEffect(() => {
    if (!focusPending.current || !errors) return;
    focusPending.current = false;
    const first = Object.keys(errors.fieldErrors)[0];
    (first ? document.getElementById(fieldId(first)) : document.getElementById("settings-form-errors"))?.focus();
  }, [errors]);

  const { run } = runner;
  const view = run.view();
  const latest = view.latest;

  function applySettings() {
    const check = checkDraft(draft, { seed: applied.seed, stepMs: applied.stepMs });
    if (!check.ok) {
      focusPending.current = true;
      setErrors({ fieldErrors: check.fieldErrors, formErrors: check.formErrors });
      setNote("");
      return;
    }
    setErrors(null);
    const changes = changesBetween(applied, check.scenario);
    // A new mode, or a run stopped at apnoea (it cannot go on), starts a new run.
    if (changes === null || run.stopped) {
      runner.restart(check.scenario);
      setApplied(check.scenario);
      setNote(`Applied: a new run in ${MODE_LABELS[check.scenario.mode].toLowerCase()}.`);
    } else if (Object.keys(changes).length === 0) {
      setNote("Nothing changed.");
    } else {
      const from = run.nextBreathNumber();
      runner.apply(changes);
      setApplied(withChanges(applied, changes));
      setNote(`Applied from breath ${from}.`);
    }
    setAppliedDraft(draft);
  }

  // The form is memoised (it does not change with the sweep), so it gets a stable handler that
  // always runs the latest applySettings.
  const applyRef = useRef(applySettings);
  applyRef.current = applySettings;
  const onApply = useCallback(() => applyRef.current(), []);

  function restartExercise() {
    runner.restart(initial);
    setApplied(initial);
    const fresh = draftFromScenario(initial);
    setAppliedDraft(fresh);
    setDraft(fresh);
    setErrors(null);
    setNote("");
    setTapNote("");
  }

  function tap(t: OneTap) {
    const from = run.nextBreathNumber();
    runner.apply(t.changes(applied));
    setTapNote(`${t.label}: ${t.detail(applied).replace(/^./, (c) => c.toLowerCase())}, from breath ${from}.`);
  }

  return (
    <>
      {exercise ? <ActiveExercise exercise={exercise} onRestart={restartExercise} focusOnMount={focusExercise} /> : null}
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_21rem]">
        <section aria-labelledby="plot-heading" data-interactive={interactive ? "true" : undefined} className="min-w-0 rounded-lg border border-rule bg-card p-4">
          <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
            <h2 id="plot-heading" className="text-lg font-semibold">
              {MODE_LABELS[run.scenario.mode]}
              <span className="font-normal text-muted"> · waveforms, last {run.windowS} s</span>
            </h2>
          </div>
          <WaveformPlot
            waveform={view.waveform}
            startS={view.startS}
            endS={view.endS}
            breaths={view.breaths}
            tableCaption="Readings of each finished breath in the plotted window"
          />
          <div className="mt-4">
            <RunControls
              paused={runner.paused}
              stopped={run.stopped !== null}
              reducedMotion={runner.reducedMotion}
              onPause={runner.pause}
              onResume={runner.resume}
              onStep={runner.stepBreath}
            />
          </div>
          <OneTapEvents baseline={applied} onTap={tap} />
          <p role="status" className="mt-2 min-h-6 text-sm">
            {tapNote}
          </p>
        </section>
        <div className="min-w-0">
          <AlarmBanner latest={latest} />
          <ReadingsPanel latest={latest?.reading ?? null} mode={run.scenario.mode} patient={run.patient()} />
        </div>
      </div>
      <div className="mt-6">
        <MemoSettingsForm
          draft={draft}
          setDraft={setDraft}
          errors={errors}
          dirty={!sameDraft(draft, appliedDraft)}
          note={note}
          onApply={onApply}
        />
      </div>
    </>
  );
}

/** The form does not change with the sweep; skip its re-render on animation frames. */
const MemoSettingsForm = memo(SettingsForm);
