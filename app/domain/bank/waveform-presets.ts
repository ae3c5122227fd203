/**
 * Bench runs an educator can draw a waveform-point item on. Each is a bench scenario file
 * (vendor-neutral mode names, PRODUCT.md "The ventilation bench"); the item stores the
 * scenario itself, so a later change here never changes a published item.
 */
import type { ScenarioInput } from "~/domain/bench";

export type WaveformPreset = { id: string; label: string; bench: ScenarioInput; viewToS: number };

export const WAVEFORM_PRESETS: readonly WaveformPreset[] = [
  {
    id: "vc-pause",
    label: "Volume control, constant flow, end-inspiratory pause (passive patient)",
    bench: { mode: "volume-control", settings: { tidalVolumeMl: 500, peakFlowLpm: 60, flowPattern: "constant", rateBpm: 15, peepCmH2O: 5, pauseS: 0.5 }, patient: { complianceMlPerCmH2O: 40, resistanceCmH2OPerLps: 10 }, breaths: 3, seed: 1 },
    viewToS: 12,
  },
  {
    id: "vc-flow-starvation",
    label: "Volume control, low set flow, a patient pulling hard (flow starvation)",
    bench: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 500, peakFlowLpm: 35, flowPattern: "constant", rateBpm: 14, peepCmH2O: 5 },
      patient: { complianceMlPerCmH2O: 45, resistanceCmH2OPerLps: 8, effort: { kind: "steady", amplitudeCmH2O: 12, rateBpm: 16, onsetS: 0, durationS: 1.2 } },
      breaths: 4,
      seed: 1,
    },
    viewToS: 12,
  },
  {
    id: "vc-trapped-gas",
    label: "Volume control, high resistance and a fast rate (gas trapping)",
    bench: { mode: "volume-control", settings: { tidalVolumeMl: 550, peakFlowLpm: 50, flowPattern: "constant", rateBpm: 24, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 60, resistanceCmH2OPerLps: 25 }, breaths: 5, seed: 1 },
    viewToS: 10,
  },
  {
    id: "ps-cycle",
    label: "Pressure support with a steady patient (flow cycling)",
    bench: {
      mode: "pressure-support",
      settings: { supportPressureCmH2O: 10, peepCmH2O: 5 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 8, effort: { kind: "steady", amplitudeCmH2O: 6, rateBpm: 16, onsetS: 0.5, durationS: 1 } },
      breaths: 4,
      seed: 1,
    },
    viewToS: 12,
  },
  {
    id: "pc-passive",
    label: "Pressure control, passive patient (time cycling)",
    bench: { mode: "pressure-control", settings: { inspiratoryPressureCmH2O: 15, inspiratoryTimeS: 1, rateBpm: 15, peepCmH2O: 5 }, patient: { complianceMlPerCmH2O: 40, resistanceCmH2OPerLps: 10 }, breaths: 3, seed: 1 },
    viewToS: 12,
  },
  {
    id: "vc-long-effort",
    label: "Volume control, short inspiration, a long strong effort (double triggering)",
    bench: {
      mode: "volume-control",
      settings: { tidalVolumeMl: 400, peakFlowLpm: 60, flowPattern: "constant", rateBpm: 12, peepCmH2O: 5 },
      patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 8, effort: { kind: "steady", amplitudeCmH2O: 14, rateBpm: 14, onsetS: 0.2, durationS: 1.8 } },
      breaths: 8,
      seed: 1,
    },
    viewToS: 12,
  },
];

export function presetById(id: string): WaveformPreset | undefined {
  return WAVEFORM_PRESETS.find((p) => p.id === id);
}
