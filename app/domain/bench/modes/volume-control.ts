/**
 * Volume control with set flow: the ventilator controls flow (constant or descending ramp)
 * and ends inspiration when the set volume has been delivered (volume-cycled), optionally
 * followed by an end-inspiratory pause. Chatburn's taxonomy: volume control, continuous
 * mandatory or assist-control breath sequence.
 */
import { RAMP_END_FRACTION } from "../defaults";
import type { FlowPattern } from "../types";

export interface FlowProfile {
  /** Peak flow, L/s. */
  peakLps: number;
  /** Flow at the end of delivery as a share of peak (1 for constant flow). */
  endFraction: number;
  /** Time to deliver the volume, s. */
  deliveryS: number;
  /** Volume to deliver, L. */
  volumeL: number;
}

/** Mean flow as a share of peak flow for a pattern (constant 1, our ramp 0.75). */
export function meanFlowShare(pattern: FlowPattern): number {
  return pattern === "ramp" ? (1 + RAMP_END_FRACTION) / 2 : 1;
}

export function createFlowProfile(volumeMl: number, peakFlowLpm: number, pattern: FlowPattern): FlowProfile {
  const peakLps = peakFlowLpm / 60;
  const volumeL = volumeMl / 1000;
  return {
    peakLps,
    endFraction: pattern === "ramp" ? RAMP_END_FRACTION : 1,
    deliveryS: volumeL / (peakLps * meanFlowShare(pattern)),
    volumeL,
  };
}

/** Instantaneous set flow (L/s) at `elapsedS` into delivery. */
export function flowAt(profile: FlowProfile, elapsedS: number): number {
  const share = Math.min(Math.max(elapsedS / profile.deliveryS, 0), 1);
  return profile.peakLps * (1 - (1 - profile.endFraction) * share);
}

/** Volume (L) the set flow delivers between two times — exact for a linear flow. */
export function volumeBetween(profile: FlowProfile, fromS: number, toS: number): number {
  return ((flowAt(profile, fromS) + flowAt(profile, toS)) / 2) * (toS - fromS);
}
