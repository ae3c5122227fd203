/**
 * The Bench page's one-tap events, as change sets for the running simulator. Each is worked out
 * from the scenario in use (the form's values), so pressing a button twice does the same thing
 * once, and "Restore" always knows what normal was. The sizes (half the compliance, twice the
 * resistance, a strong steady pull of 12 cmH2O) are teaching choices, common practice, no source.
 */
import { PATIENT_RANGES } from "~/domain/bench/field-ranges";
import type { ChangeSet, Scenario } from "~/domain/bench/types";

export type OneTapId = "stiffen" | "restore" | "raise-resistance" | "pulls-harder" | "erratic" | "settle";

export interface OneTap {
  id: OneTapId;
  label: string;
  /** What the button does, with the numbers it will use. */
  detail: (baseline: Scenario) => string;
  changes: (baseline: Scenario) => ChangeSet;
}

const round1 = (x: number) => Math.round(x * 10) / 10;
const clampTo = (x: number, range: { min: number; max: number }) => Math.min(range.max, Math.max(range.min, x));

/** A strong, regular pull: enough to out-draw a 40–60 L/min set flow (flow starvation). */
export const STRONG_EFFORT = { kind: "steady", amplitudeCmH2O: 12, rateBpm: 20, onsetS: 0.2 } as const;
export const ERRATIC_EFFORT = { kind: "erratic", amplitudeCmH2O: 8, rateBpm: 18, variability: 0.6, onsetS: 0.2 } as const;

export const ONE_TAPS: readonly OneTap[] = [
  {
    id: "stiffen",
    label: "Stiffen the lung",
    detail: (b) => `Compliance to half: ${round1(stiffCompliance(b))} mL/cmH2O`,
    changes: (b) => ({ complianceMlPerCmH2O: stiffCompliance(b) }),
  },
  {
    id: "restore",
    label: "Restore the lung",
    detail: (b) => `Compliance ${b.patient.complianceMlPerCmH2O}, resistance ${b.patient.resistanceCmH2OPerLps} again`,
    changes: (b) => ({ complianceMlPerCmH2O: b.patient.complianceMlPerCmH2O, resistanceCmH2OPerLps: b.patient.resistanceCmH2OPerLps }),
  },
  {
    id: "raise-resistance",
    label: "Raise resistance",
    detail: (b) => `Resistance doubled: ${round1(highResistance(b))} cmH2O/(L/s)`,
    changes: (b) => ({ resistanceCmH2OPerLps: highResistance(b) }),
  },
  {
    id: "pulls-harder",
    label: "Patient pulls harder",
    detail: () => `Strong steady effort: ${STRONG_EFFORT.amplitudeCmH2O} cmH2O at ${STRONG_EFFORT.rateBpm}/min`,
    changes: () => ({ effort: { ...STRONG_EFFORT } }),
  },
  {
    id: "erratic",
    label: "Erratic breathing",
    detail: () => `Effort varies breath to breath around ${ERRATIC_EFFORT.amplitudeCmH2O} cmH2O`,
    changes: () => ({ effort: { ...ERRATIC_EFFORT } }),
  },
  {
    id: "settle",
    label: "Patient settles",
    detail: (b) => (b.patient.effort.kind === "none" ? "Effort back to none (passive)" : `Effort back to the settings (${b.patient.effort.kind})`),
    changes: (b) => ({ effort: { ...b.patient.effort } }),
  },
];

function stiffCompliance(b: Scenario): number {
  return clampTo(round1(b.patient.complianceMlPerCmH2O / 2), PATIENT_RANGES.complianceMlPerCmH2O);
}

function highResistance(b: Scenario): number {
  return clampTo(round1(b.patient.resistanceCmH2OPerLps * 2), PATIENT_RANGES.resistanceCmH2OPerLps);
}
