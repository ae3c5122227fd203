/**
 * Plausible ranges for every number a scenario can hold: wide enough for adult and neonatal
 * teaching cases, narrow enough to refuse typing slips (a negative compliance, a rate of 0,
 * a tidal volume of 5 L). Ranges are ours (common practice, no source); the Bench page uses
 * them for its form constraints and the schema for its messages.
 */
export interface FieldRange {
  min: number;
  max: number;
  unit: string;
  integer?: boolean;
}

export const SETTINGS_RANGES = {
  tidalVolumeMl: { min: 20, max: 2000, unit: "mL" },
  peakFlowLpm: { min: 5, max: 150, unit: "L/min" },
  rateBpm: { min: 4, max: 80, unit: "breaths/min" },
  peepCmH2O: { min: 0, max: 30, unit: "cmH2O" },
  pauseS: { min: 0, max: 2, unit: "s" },
  inspiratoryPressureCmH2O: { min: 1, max: 60, unit: "cmH2O" },
  inspiratoryTimeS: { min: 0.2, max: 3, unit: "s" },
  supportPressureCmH2O: { min: 0, max: 40, unit: "cmH2O" },
  cyclePercent: { min: 5, max: 80, unit: "% of peak flow" },
  adaptiveStepCmH2O: { min: 0.5, max: 10, unit: "cmH2O" },
  adaptiveMarginCmH2O: { min: 0, max: 20, unit: "cmH2O" },
  adaptiveTestPlateauS: { min: 0.05, max: 1, unit: "s" },
  adaptiveMinPressureCmH2O: { min: 0, max: 30, unit: "cmH2O" },
  triggerFlowLpm: { min: 0.5, max: 20, unit: "L/min" },
  triggerPressureCmH2O: { min: 0.5, max: 20, unit: "cmH2O" },
} as const satisfies Record<string, FieldRange>;

export const LIMITS_RANGES = {
  highPressureCmH2O: { min: 10, max: 120, unit: "cmH2O" },
  lowPressureCmH2O: { min: 0, max: 60, unit: "cmH2O" },
  lowExhaledVolumeMl: { min: 0, max: 2000, unit: "mL" },
} as const satisfies Record<string, FieldRange>;

export const PATIENT_RANGES = {
  complianceMlPerCmH2O: { min: 1, max: 200, unit: "mL/cmH2O" },
  resistanceCmH2OPerLps: { min: 1, max: 200, unit: "cmH2O/(L/s)" },
} as const satisfies Record<string, FieldRange>;

export const EFFORT_RANGES = {
  amplitudeCmH2O: { min: 0, max: 40, unit: "cmH2O" },
  rateBpm: { min: 4, max: 80, unit: "breaths/min" },
  onsetS: { min: 0, max: 60, unit: "s" },
  durationS: { min: 0.1, max: 3, unit: "s" },
  variability: { min: 0, max: 0.9, unit: "(share)" },
} as const satisfies Record<string, FieldRange>;

export const RUN_RANGES = {
  breaths: { min: 1, max: 1000, unit: "breaths", integer: true },
  seed: { min: 0, max: 4294967295, unit: "", integer: true },
  stepMs: { min: 1, max: 10, unit: "ms" },
  atBreath: { min: 1, max: 1000, unit: "", integer: true },
  atTimeS: { min: 0, max: 3600, unit: "s" },
} as const satisfies Record<string, FieldRange>;

export function describeRange(range: FieldRange): string {
  const unit = range.unit ? ` ${range.unit}` : "";
  return `between ${range.min} and ${range.max}${unit}`;
}
