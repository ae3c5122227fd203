/**
 * Alarm checks. Each returns an AlarmRecord (kind, breath, time, reason) or null. The
 * reasons are written for a therapist reading the log after a run.
 *
 * - high pressure: airway pressure reaches the limit during inspiration; inspiration ends at
 *   once and the expiratory valve opens (ventilation textbook excerpts, TESTING.md). In
 *   volume control the rest of the set volume is not delivered.
 * - low pressure: the breath's peak pressure stayed below the limit (a disconnection, or a
 *   patient pulling the pressure down in volume control). Checked when inspiration ends.
 * - low exhaled volume: exhaled volume below the limit. Checked when the breath ends.
 * - volume not reached: adaptive pressure control at its upper bound still delivers less than
 *   VOLUME_NOT_REACHED_FRACTION of the set volume.
 */
import { VOLUME_NOT_REACHED_FRACTION } from "./defaults";
import type { AlarmRecord } from "./types";

const one = (x: number) => x.toFixed(1);
const whole = (x: number) => x.toFixed(0);

export function highPressureAlarm(
  breath: number,
  timeS: number,
  limitCmH2O: number,
  deliveredMl: number,
  setVolumeMl: number | null,
): AlarmRecord {
  const volume =
    setVolumeMl === null
      ? `${whole(deliveredMl)} mL inspired`
      : `${whole(deliveredMl)} of ${whole(setVolumeMl)} mL delivered`;
  return {
    kind: "high-pressure",
    breath,
    timeS,
    reason: `Airway pressure reached the high-pressure limit (${one(limitCmH2O)} cmH2O); inspiration ended at once and the expiratory valve opened with ${volume}.`,
  };
}

export function lowPressureAlarm(breath: number, timeS: number, pipCmH2O: number, limitCmH2O: number): AlarmRecord | null {
  if (limitCmH2O <= 0 || pipCmH2O >= limitCmH2O) return null;
  return {
    kind: "low-pressure",
    breath,
    timeS,
    reason: `Peak airway pressure ${one(pipCmH2O)} cmH2O stayed below the low-pressure limit (${one(limitCmH2O)} cmH2O).`,
  };
}

export function lowExhaledVolumeAlarm(breath: number, timeS: number, vteMl: number, limitMl: number): AlarmRecord | null {
  if (limitMl <= 0 || vteMl >= limitMl) return null;
  return {
    kind: "low-exhaled-volume",
    breath,
    timeS,
    reason: `Exhaled volume ${whole(vteMl)} mL is below the low exhaled volume limit (${whole(limitMl)} mL).`,
  };
}

export function volumeNotReachedAlarm(
  breath: number,
  timeS: number,
  vtiMl: number,
  targetMl: number,
  pressureCmH2O: number,
  upperBoundCmH2O: number,
): AlarmRecord | null {
  const atBound = pressureCmH2O >= upperBoundCmH2O - 1e-9;
  if (!atBound || vtiMl >= VOLUME_NOT_REACHED_FRACTION * targetMl) return null;
  return {
    kind: "volume-not-reached",
    breath,
    timeS,
    reason: `Inspired ${whole(vtiMl)} mL of a set ${whole(targetMl)} mL with the pressure at its upper bound (${one(upperBoundCmH2O)} cmH2O above PEEP: high-pressure limit minus margin).`,
  };
}
