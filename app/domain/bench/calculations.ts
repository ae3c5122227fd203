/**
 * Respiratory mechanics and timing calculations, as small functions items and tests use.
 * Single-compartment linear model, inertance ignored. Units in the names: mL, L/min, s,
 * cmH2O. Intermediate conversions are never rounded (TESTING.md, V8).
 *
 * Sources: equation of motion Paw = PEEP + V/C + R·V̇ (Chatburn RL, El-Khatib M,
 * Mireles-Cabodevila E, "A taxonomy for mechanical ventilation: 10 fundamental maxims",
 * Respir Care 2014;59(11):1747–63); time constants (Yartsev A, Deranged Physiology, "Time
 * constants"); mean airway pressure (Marini JJ, Ravenscraft SA, Crit Care Med
 * 1992;20(11):1604–16).
 */
import { meanFlowShare } from "./modes/volume-control";
import type { FlowPattern } from "./types";

const lps = (flowLpm: number) => flowLpm / 60;

/** Static compliance Cstat = Vt / (Pplat − PEEP), mL/cmH2O — measured with no flow. */
export function staticComplianceMlPerCmH2O(tidalVolumeMl: number, plateauCmH2O: number, peepCmH2O: number): number {
  return tidalVolumeMl / (plateauCmH2O - peepCmH2O);
}

/** Dynamic characteristic Cdyn = Vt / (PIP − PEEP), mL/cmH2O — includes the resistive
 *  pressure, so it is not a compliance of the lung alone; label it "dynamic". */
export function dynamicComplianceMlPerCmH2O(tidalVolumeMl: number, peakCmH2O: number, peepCmH2O: number): number {
  return tidalVolumeMl / (peakCmH2O - peepCmH2O);
}

/** Raw = (PIP − Pplat) / V̇, cmH2O/(L/s), for constant flow with an end-inspiratory pause. */
export function airwayResistanceCmH2OPerLps(peakCmH2O: number, plateauCmH2O: number, flowLpm: number): number {
  return (peakCmH2O - plateauCmH2O) / lps(flowLpm);
}

/** Resistance from the resistive pressure alone (PIP − Pplat given directly). */
export function resistanceFromPressureCmH2OPerLps(resistivePressureCmH2O: number, flowLpm: number): number {
  return resistivePressureCmH2O / lps(flowLpm);
}

/** Driving pressure ΔP = Pplat − PEEP, cmH2O. */
export function drivingPressureCmH2O(plateauCmH2O: number, peepCmH2O: number): number {
  return plateauCmH2O - peepCmH2O;
}

/** Elastance E = 1/C, cmH2O/mL. */
export function elastanceCmH2OPerMl(complianceMlPerCmH2O: number): number {
  return 1 / complianceMlPerCmH2O;
}

/** τ = R·C, s (C converted from mL to L). */
export function timeConstantS(resistanceCmH2OPerLps: number, complianceMlPerCmH2O: number): number {
  return (resistanceCmH2OPerLps * complianceMlPerCmH2O) / 1000;
}

/** Share of the volume change completed after n time constants: 1 − e^(−n). */
export function fractionExchanged(timeConstants: number): number {
  return 1 - Math.exp(-timeConstants);
}

/** Pressure above PEEP in a passive single compartment, constant flow:
 *  PIP = PEEP + Vt/C + R·V̇ and Pplat = PEEP + Vt/C (the equation of motion). */
export function volumeControlPressures(
  peepCmH2O: number,
  tidalVolumeMl: number,
  complianceMlPerCmH2O: number,
  resistanceCmH2OPerLps: number,
  flowLpm: number,
): { pipCmH2O: number; pplatCmH2O: number } {
  const pplatCmH2O = peepCmH2O + tidalVolumeMl / complianceMlPerCmH2O;
  return { pipCmH2O: pplatCmH2O + resistanceCmH2OPerLps * lps(flowLpm), pplatCmH2O };
}

/** Passive pressure control: Vt = C·ΔP·(1 − e^(−Ti/τ)), mL (exponential filling). */
export function pressureControlTidalVolumeMl(
  complianceMlPerCmH2O: number,
  pressureAbovePeepCmH2O: number,
  inspiratoryTimeS: number,
  resistanceCmH2OPerLps: number,
): number {
  const tau = timeConstantS(resistanceCmH2OPerLps, complianceMlPerCmH2O);
  return complianceMlPerCmH2O * pressureAbovePeepCmH2O * (1 - Math.exp(-inspiratoryTimeS / tau));
}

export type PressureShape = "rectangular" | "triangular";

/** Mean airway pressure = k·(PIP − PEEP)·Ti/Ttot + PEEP, k = 1 for a rectangular pressure
 *  (pressure control), 0.5 for a triangular one (volume control, constant flow). */
export function meanAirwayPressureCmH2O(
  peakCmH2O: number,
  peepCmH2O: number,
  inspiratoryTimeS: number,
  rateBpm: number,
  shape: PressureShape,
): number {
  const k = shape === "rectangular" ? 1 : 0.5;
  return (k * (peakCmH2O - peepCmH2O) * inspiratoryTimeS) / (60 / rateBpm) + peepCmH2O;
}

/** Ti = Vt / mean flow; mean flow = peak for constant flow, 0.75 × peak for our descending
 *  ramp (to 50 % of peak; see RAMP_CONVENTION). */
export function inspiratoryTimeS(tidalVolumeMl: number, peakFlowLpm: number, pattern: FlowPattern = "constant"): number {
  return tidalVolumeMl / 1000 / (lps(peakFlowLpm) * meanFlowShare(pattern));
}

/** Vt = V̇ × Ti for constant flow, mL. */
export function tidalVolumeFromFlowMl(flowLpm: number, inspiratoryTimeS: number): number {
  return lps(flowLpm) * inspiratoryTimeS * 1000;
}

/** VE = Vt × f, L/min. */
export function minuteVentilationLpm(tidalVolumeMl: number, rateBpm: number): number {
  return (tidalVolumeMl * rateBpm) / 1000;
}

/** VA = (Vt − VD) × f, L/min. */
export function alveolarVentilationLpm(tidalVolumeMl: number, deadSpaceMl: number, rateBpm: number): number {
  return ((tidalVolumeMl - deadSpaceMl) * rateBpm) / 1000;
}

/** VD × f, L/min. */
export function deadSpaceVentilationLpm(deadSpaceMl: number, rateBpm: number): number {
  return (deadSpaceMl * rateBpm) / 1000;
}

export interface BreathTiming {
  totalCycleS: number;
  expiratoryTimeS: number;
  /** E in I:E = 1:E. */
  ieRatio: number;
  /** "1:4", "1:2.5", or for inverse ratios "2:1". */
  ieLabel: string;
}

const compact = (x: number) => String(Number(x.toFixed(2)));

/** Total cycle time 60/f, Te = Ttot − Ti, I:E = 1 : Te/Ti. */
export function breathTiming(rateBpm: number, inspiratoryTimeS: number): BreathTiming {
  const totalCycleS = 60 / rateBpm;
  const expiratoryTimeS = totalCycleS - inspiratoryTimeS;
  const ieRatio = expiratoryTimeS / inspiratoryTimeS;
  const ieLabel = ieRatio >= 1 ? `1:${compact(ieRatio)}` : `${compact(1 / ieRatio)}:1`;
  return { totalCycleS, expiratoryTimeS, ieRatio, ieLabel };
}
