/**
 * Adaptive pressure control toward a set tidal volume (Chatburn's taxonomy: pressure control
 * with adaptive targeting). The controller is a model of a common family of implementations
 * (TESTING.md; practitioners' descriptions, common practice, no source):
 *
 * - start-up: a volume-controlled test breath with a short plateau; the starting pressure is
 *   the one that plateau implies for the set volume (Pplat − PEEP, scaled to the set volume);
 *   or, with startup "set-pressure", the set inspiratory pressure.
 * - after each breath the pressure moves toward the set volume by at most `stepCmH2O`,
 *   upward when the inspired volume is short and downward when it overshoots, using the
 *   breath's own volume/pressure ratio to estimate the pressure needed.
 * - upper bound: high-pressure limit − margin (as airway pressure, so PEEP is subtracted to
 *   give the pressure above PEEP); lower bound `minPressureCmH2O`.
 *
 * Published, vendor-neutral behaviour it must show (Branson & Chatburn, Respir Care 2007):
 * it cannot tell better compliance from more patient effort — when the patient pulls
 * harder, it lowers the pressure — and it cannot guarantee a constant tidal volume.
 */

export interface AdaptiveBounds {
  minCmH2O: number;
  maxCmH2O: number;
}

/** Pressure bounds above PEEP. The upper bound wins if the two cross. */
export function adaptiveBounds(highPressureCmH2O: number, marginCmH2O: number, peepCmH2O: number, minPressureCmH2O: number): AdaptiveBounds {
  const maxCmH2O = highPressureCmH2O - marginCmH2O - peepCmH2O;
  return { minCmH2O: Math.min(minPressureCmH2O, maxCmH2O), maxCmH2O };
}

function clamp(value: number, bounds: AdaptiveBounds): number {
  return Math.min(bounds.maxCmH2O, Math.max(bounds.minCmH2O, value));
}

/** Starting pressure above PEEP from the test breath's plateau. */
export function startingPressure(
  targetMl: number,
  testVolumeMl: number,
  plateauAbovePeepCmH2O: number,
  bounds: AdaptiveBounds,
): number {
  // A plateau at or below PEEP (the patient pulled during the hold) tells us nothing: start
  // low and let the breath-by-breath steps find the pressure, never high.
  if (testVolumeMl <= 0 || plateauAbovePeepCmH2O <= 0) return bounds.minCmH2O;
  // Static compliance from the plateau (Cstat = V/(Pplat − PEEP)), then P = Vt/Cstat.
  return clamp((plateauAbovePeepCmH2O * targetMl) / testVolumeMl, bounds);
}

/** The next breath's pressure above PEEP, at most `stepCmH2O` away from the current one. */
export function nextAdaptivePressure(
  currentCmH2O: number,
  targetMl: number,
  measuredMl: number,
  stepCmH2O: number,
  bounds: AdaptiveBounds,
): number {
  // Dynamic volume/pressure ratio of the last breath; no volume at all → step up fully.
  const needed = measuredMl > 0 && currentCmH2O > 0 ? (currentCmH2O * targetMl) / measuredMl : currentCmH2O + stepCmH2O;
  const change = Math.max(-stepCmH2O, Math.min(stepCmH2O, needed - currentCmH2O));
  return clamp(currentCmH2O + change, bounds);
}
