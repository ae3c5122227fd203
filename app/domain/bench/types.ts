/**
 * Types of the ventilation bench. Units are carried in every field name so that a reader
 * never has to guess: pressures cmH2O, volumes mL, flows L/min, times s, compliance
 * mL/cmH2O, resistance cmH2O/(L/s). The same names are used in scenario files
 * (issue 3, item 5), in the simulator and on the Bench page.
 */

/** Vendor-neutral mode names (Chatburn's taxonomy, ISO 19223 vocabulary). */
export type Mode = "volume-control" | "pressure-control" | "adaptive-pressure" | "pressure-support";
export const MODES: readonly Mode[] = ["volume-control", "pressure-control", "adaptive-pressure", "pressure-support"];

export type FlowPattern = "constant" | "ramp";
export type TriggerType = "flow" | "pressure";
/** How adaptive pressure control finds its first pressure: a volume-controlled test breath
 *  with a short plateau, or simply the set inspiratory pressure. */
export type AdaptiveStartup = "test-breath" | "set-pressure";

export interface Settings {
  tidalVolumeMl: number;
  peakFlowLpm: number;
  flowPattern: FlowPattern;
  rateBpm: number;
  peepCmH2O: number;
  /** End-inspiratory pause in volume control (0 = none). */
  pauseS: number;
  /** Pressure above PEEP in pressure control; the start value for adaptive "set-pressure". */
  inspiratoryPressureCmH2O: number;
  inspiratoryTimeS: number;
  /** Pressure above PEEP in pressure support. */
  supportPressureCmH2O: number;
  /** Pressure support cycles off when flow falls to this percentage of the breath's peak flow. */
  cyclePercent: number;
  adaptiveStepCmH2O: number;
  adaptiveMarginCmH2O: number;
  adaptiveStartup: AdaptiveStartup;
  /** Plateau of the adaptive test breath. */
  adaptiveTestPlateauS: number;
  /** Lowest pressure above PEEP the adaptive controller will go down to. */
  adaptiveMinPressureCmH2O: number;
  triggerType: TriggerType;
  triggerFlowLpm: number;
  triggerPressureCmH2O: number;
}

export interface Limits {
  highPressureCmH2O: number;
  /** 0 switches the alarm off. */
  lowPressureCmH2O: number;
  /** 0 switches the alarm off. */
  lowExhaledVolumeMl: number;
}

export type EffortKind = "none" | "steady" | "erratic";

export interface Effort {
  kind: EffortKind;
  /** Peak muscle pressure of one effort. */
  amplitudeCmH2O: number;
  /** The patient's own breathing rate (their clock runs independently of the ventilator's). */
  rateBpm: number;
  /** Delay of the first effort after the run starts (or after effort is switched on). */
  onsetS: number;
  /** Length of one effort; null = 35 % of the patient's own cycle (EFFORT_DURATION_FRACTION). */
  durationS: number | null;
  /** Erratic only: amplitude varies by ±variability, interval by ±variability/2 (uniform). */
  variability: number;
}

export interface Patient {
  complianceMlPerCmH2O: number;
  resistanceCmH2OPerLps: number;
  effort: Effort;
}

/** What an event (or a one-tap action on the page) may change. */
export type ChangeSet = Partial<Settings> &
  Partial<Limits> &
  Partial<Omit<Patient, "effort">> & { effort?: Partial<Effort> };

export type ScenarioEvent = { atBreath: number; atTimeS?: undefined; set: ChangeSet } | {
  atBreath?: undefined;
  atTimeS: number;
  set: ChangeSet;
};

/** A fully resolved scenario (defaults filled in, ranges checked by schema.ts). */
export interface Scenario {
  mode: Mode;
  settings: Settings;
  limits: Limits;
  patient: Patient;
  events: ScenarioEvent[];
  breaths: number;
  seed: number;
  /** Fixed integration step in milliseconds (1–10). */
  stepMs: number;
}

export type AlarmKind = "high-pressure" | "low-pressure" | "low-exhaled-volume" | "volume-not-reached";

export interface AlarmRecord {
  kind: AlarmKind;
  breath: number;
  timeS: number;
  reason: string;
}

export type BreathTrigger = "time" | "patient";
/** What ended inspiration; "high-pressure" means the high-pressure limit cut the breath short. */
export type BreathCycle = "volume" | "time" | "flow" | "high-pressure";

export interface BreathReading {
  breath: number;
  startS: number;
  /** Time from the start of this breath to the start of the next one. */
  durationS: number;
  pipCmH2O: number;
  /** Airway pressure at the end of an end-inspiratory pause (volume control with a pause,
   *  or the adaptive test breath); null otherwise. */
  pplatCmH2O: number | null;
  vtiMl: number;
  vteMl: number;
  peakFlowLpm: number;
  /** From the start of inspiration to the opening of the expiratory valve (pause included). */
  tiS: number;
  mpawCmH2O: number;
  /** Alveolar pressure at the end of expiration (what an end-expiratory hold would read). */
  totalPeepCmH2O: number;
  trigger: BreathTrigger;
  cycle: BreathCycle;
  alarms: AlarmKind[];
  /** Pressure above PEEP the machine aimed for; null in volume control and the test breath. */
  inspiratoryPressureCmH2O: number | null;
  testBreath: boolean;
}

/** Sampled waveforms, one entry per integration step. Flow is the mean over the step that
 *  starts at timeS (what a sampling flow sensor reports), so volume is exactly its running
 *  integral; volume restarts from 0 at the start of each breath, as on a ventilator display. */
export interface Waveform {
  timeS: Float64Array;
  pressureCmH2O: Float64Array;
  flowLpm: Float64Array;
  volumeMl: Float64Array;
}

/** What one call of Bench.nextBreath() returns. */
export interface BreathStep {
  /** The finished breath, or null when no breath started within APNOEA_S (the run stops). */
  reading: BreathReading | null;
  /** Every sample produced by this call (a lead-in before the first breath included). */
  samples: Waveform;
  /** Alarms of this breath, in the order they fired. */
  alarms: AlarmRecord[];
}

export interface BenchState {
  timeS: number;
  /** Number of the breath in progress or about to start. */
  breath: number;
  settings: Settings;
  limits: Limits;
  patient: Patient;
}

export interface Bench {
  /** Runs until the breath in progress ends (the next one is triggered) and returns it. */
  nextBreath(): BreathStep;
  /** A one-tap change (stiffen the lung, raise resistance …) from the current moment. */
  apply(set: ChangeSet): void;
  state(): BenchState;
  /** All samples so far. */
  waveform(): Waveform;
}
