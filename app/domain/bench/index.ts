/**
 * The ventilation bench — public API (pure TypeScript: runs in the browser and on the server).
 *
 * Units are in every name: pressures cmH2O, volumes mL, flows L/min, times s.
 *
 * Scenarios
 *   validateScenario(input: unknown): { ok: true, scenario } | { ok: false, errors: FieldError[] }
 *       field errors ({ field: "settings.tidalVolumeMl", message: "must be between 20 and 2000 mL (got 5000)" })
 *       for forms; never throws. parseScenario(input) returns the resolved Scenario or throws
 *       ScenarioError (message lists every field). Ranges for form constraints: *_RANGES.
 *
 * Running
 *   simulate(input): SimulationResult — validates, runs scenario.breaths breaths and returns
 *       { scenario, waveform, breaths: BreathReading[], alarms: AlarmRecord[], stoppedEarly }.
 *   createBench(scenario: Scenario): Bench — for the page's breath-by-breath sweep:
 *       bench.nextBreath() → { reading, samples, alarms } (the breath that just ended and the
 *       samples produced meanwhile); bench.apply(changeSet) for one-tap events (patient changes
 *       act at once, settings from the next breath); bench.state(); bench.waveform().
 *       Pass it a Scenario from parseScenario().
 *   toBreathLine(reading) — the rounded per-breath line of `npm run sim`.
 *
 * Plotting
 *   Waveform = { timeS, pressureCmH2O, flowLpm, volumeMl } (Float64Array, one sample per step;
 *   flow is the mean over the step, so volume is exactly its running integral; volume restarts
 *   at 0 each breath). downsampleWaveform(waveform, maxPoints) keeps each bucket's min and max
 *   per signal; concatWaveforms(parts) joins swept breaths.
 *
 * Conventions to state on the page and in items
 *   RAMP_CONVENTION (descending ramp to 50 % of peak; Ti = Vt / (0.75 × peak flow)),
 *   DEFAULT_SETTINGS (adaptive step 3, margin 5, test breath), TRIGGER_LOCKOUT_S, APNOEA_S.
 *
 * Calculations (calculations.ts): staticComplianceMlPerCmH2O, dynamicComplianceMlPerCmH2O,
 *   airwayResistanceCmH2OPerLps, drivingPressureCmH2O, timeConstantS, fractionExchanged,
 *   meanAirwayPressureCmH2O, inspiratoryTimeS, minuteVentilationLpm, alveolarVentilationLpm,
 *   breathTiming (I:E), pressureControlTidalVolumeMl, volumeControlPressures, …
 *
 * Question bank
 *   generateScenarioItem(templateId, seed): GeneratedItem — same seed, same parameters,
 *   waveforms, readings and answer. SCENARIO_TEMPLATES / TEMPLATE_IDS list the templates and
 *   their parameter ranges; item.visible is what the candidate may see before answering.
 *
 * Randomness: createRandom(seed) (mulberry32 with a mixed seed) — use it, never Math.random.
 */
export * from "./types";
export * from "./calculations";
export {
  APNOEA_S,
  DEFAULT_CYCLE_PERCENT,
  DEFAULT_EFFORT,
  DEFAULT_LIMITS,
  DEFAULT_SETTINGS,
  DEFAULT_STEP_MS,
  EFFORT_DURATION_FRACTION,
  PRESSURE_SUPPORT_MAX_TI_S,
  RAMP_CONVENTION,
  RAMP_END_FRACTION,
  TRIGGER_LOCKOUT_S,
  VOLUME_NOT_REACHED_FRACTION,
} from "./defaults";
export { EFFORT_RANGES, LIMITS_RANGES, PATIENT_RANGES, RUN_RANGES, SETTINGS_RANGES, describeRange, type FieldRange } from "./field-ranges";
export {
  REQUIRED_SETTINGS,
  ScenarioError,
  changeSetSchema,
  parseScenario,
  scenarioSchema,
  validateScenario,
  type FieldError,
  type ScenarioInput,
  type ValidationResult,
} from "./schema";
export { createBench } from "./engine";
export { simulate, toBreathLine, type BreathLine, type SimulationResult } from "./simulate";
export { concatWaveforms, downsampleSeries, downsampleWaveform, type DownsampledWaveform, type Series } from "./waveform";
export { createRandom, mulberry32, mixSeed, type Random } from "./prng";
export {
  ALARM_LABELS,
  SCENARIO_TEMPLATES,
  TEMPLATE_IDS,
  generateScenarioItem,
  type GeneratedItem,
  type ParameterRange,
  type Question,
  type ScenarioTemplate,
  type TemplateId,
} from "./generator";
