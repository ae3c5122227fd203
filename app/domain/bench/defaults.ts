/**
 * Defaults and fixed constants of the bench model. Each one is a modelling choice, not a
 * published value, unless a source is named beside it.
 */
import type { Effort, Limits, Settings } from "./types";

/** Integration step. The issue asks for 10 ms or less; 5 ms keeps the exponential update
 *  accurate for time constants down to 0.05 s (common practice, no source). */
export const DEFAULT_STEP_MS = 5;

/**
 * Descending-ramp convention. There is no single published convention (TESTING.md): we ramp
 * flow linearly from the set peak flow down to RAMP_END_FRACTION of it, so the mean flow is
 * 0.75 × peak and Ti = Vt / (0.75 × peak flow). The Bench page and items must state this.
 */
export const RAMP_END_FRACTION = 0.5;
export const RAMP_CONVENTION =
  "Descending ramp: flow falls in a straight line from the set peak flow to 50 % of it, so mean flow is 75 % of peak and Ti = tidal volume ÷ (0.75 × peak flow).";

/** Pressure support cycles at 25 % of peak flow unless set otherwise
 *  (Ann Thorac Med, PMC6967144, Fig. 1). */
export const DEFAULT_CYCLE_PERCENT = 25;

/** Pressure support has no set inspiratory time; a breath whose flow never falls to the
 *  cycle threshold ends after this backup time (common practice, no source). */
export const PRESSURE_SUPPORT_MAX_TI_S = 3;

/** A patient trigger is ignored for this long after the expiratory valve opens, so the tail
 *  of the effort that started a breath does not start another at once (common practice,
 *  no source; real trigger windows differ between devices). */
export const TRIGGER_LOCKOUT_S = 0.3;

/** With no trigger for this long the run stops (apnoea): pressure support is patient-triggered
 *  only, so a patient without effort gets no breaths (common practice, no source). */
export const APNOEA_S = 20;

/** Share of the patient's own cycle an effort lasts when durationS is not given (from memory:
 *  neural inspiratory time is roughly a third of the cycle at rest). */
export const EFFORT_DURATION_FRACTION = 0.35;

/** Adaptive pressure control raises "volume not reached" when a breath at its upper bound
 *  delivers less than this share of the target (common practice, no source). */
export const VOLUME_NOT_REACHED_FRACTION = 0.95;

/** Used for any field a scenario leaves out; the fields each mode needs must be given
 *  (schema.ts REQUIRED_SETTINGS). Adult teaching values, common practice, no source. */
export const DEFAULT_SETTINGS: Settings = {
  tidalVolumeMl: 500,
  peakFlowLpm: 60,
  flowPattern: "constant",
  rateBpm: 12,
  peepCmH2O: 5,
  pauseS: 0,
  inspiratoryPressureCmH2O: 15,
  inspiratoryTimeS: 1,
  supportPressureCmH2O: 10,
  cyclePercent: DEFAULT_CYCLE_PERCENT,
  // Step 3, margin 5 and a test breath: practitioners' description of a common family of
  // implementations (TESTING.md); parameters because implementations differ.
  adaptiveStepCmH2O: 3,
  adaptiveMarginCmH2O: 5,
  adaptiveStartup: "test-breath",
  adaptiveTestPlateauS: 0.2,
  adaptiveMinPressureCmH2O: 5,
  // Trigger sensitivities of 2 L/min or 2 cmH2O: common practice, no source.
  triggerType: "flow",
  triggerFlowLpm: 2,
  triggerPressureCmH2O: 2,
};

/** High-pressure limit 40 cmH2O (common practice, no source); the low limits are off (0)
 *  unless a scenario sets them. */
export const DEFAULT_LIMITS: Limits = {
  highPressureCmH2O: 40,
  lowPressureCmH2O: 0,
  lowExhaledVolumeMl: 0,
};

export const DEFAULT_EFFORT: Effort = {
  kind: "none",
  amplitudeCmH2O: 0,
  rateBpm: 15,
  onsetS: 0.5,
  durationS: null,
  variability: 0.5,
};
