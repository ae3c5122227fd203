/**
 * What the bench models and the conventions it has chosen, stated on the page (TESTING.md asks
 * for the descending-ramp convention to be stated wherever it matters).
 */
import { DEFAULT_SETTINGS, DEFAULT_STEP_MS, RAMP_CONVENTION, TRIGGER_LOCKOUT_S } from "~/domain/bench/defaults";

export function ModelNotes() {
  const s = DEFAULT_SETTINGS;
  return (
    <section aria-labelledby="model-heading" className="mt-10 max-w-3xl">
      <h2 id="model-heading" className="text-2xl font-semibold">
        How the bench works
      </h2>
      <ul className="mt-2 list-disc space-y-1 pl-6">
        <li>
          One lung compartment driven by the equation of motion: airway pressure + muscle pressure = PEEP + volume ÷ compliance +
          resistance × flow (Chatburn and colleagues, Respiratory Care 2014). It is stepped every {DEFAULT_STEP_MS} ms; inertance is
          ignored.
        </li>
        <li>{RAMP_CONVENTION}</li>
        <li>
          Adaptive pressure control starts with a test breath with a short plateau, then moves the pressure by at most{" "}
          {s.adaptiveStepCmH2O} cmH2O a breath, never above the high-pressure limit minus {s.adaptiveMarginCmH2O} cmH2O. Real
          implementations differ; these are the model's defaults.
        </li>
        <li>
          Pressure support ends a breath when inspiratory flow falls to the cycle threshold (25 % of peak unless you set another).
          Patient breaths are flow-triggered at {s.triggerFlowLpm} L/min; a trigger is ignored for {TRIGGER_LOCKOUT_S} s after
          expiration begins.
        </li>
        <li>Pressures are in cmH2O, volumes in mL, flows in L/min, times in seconds. Nothing you do here is recorded.</li>
      </ul>
    </section>
  );
}
