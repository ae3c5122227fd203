/**
 * Standard error of measurement and the band it implies around a score.
 *
 * SEM = SD · √(1 − rₓₓ) (Lane DM, Online Statistics Education, glossary "standard error of
 * measurement"). An observed score X is reported with the band X ± z · SEM: z = 1 is the usual
 * "68 %" band (iEduNote, "Standard Error of Measurement"), z = 1.96 the 95 % band under the
 * normal curve (common practice, no source). Around a pass mark, the band shows which scores the test cannot confidently
 * place on either side of it.
 */

export type ScoreBand = { low: number; high: number };

/**
 * SD · √(1 − reliability). A negative reliability (KR-20 can be negative for items that work
 * against each other) gives an SEM larger than the SD, which is what it means; a reliability
 * above 1 is refused.
 */
export function standardErrorOfMeasurement(sd: number, reliability: number): number {
  if (!(Number.isFinite(sd) && sd >= 0)) {
    throw new RangeError(`The standard deviation must be a finite number of at least 0, not ${String(sd)}.`);
  }
  if (!(Number.isFinite(reliability) && reliability <= 1)) {
    throw new RangeError(`The reliability must be a finite number of at most 1, not ${String(reliability)}.`);
  }
  return sd * Math.sqrt(1 - reliability);
}

/** observed ± z · sem. */
export function semBand(observed: number, sem: number, z = 1): ScoreBand {
  if (!Number.isFinite(observed)) throw new RangeError(`The observed score must be a finite number, not ${String(observed)}.`);
  if (!(Number.isFinite(sem) && sem >= 0)) {
    throw new RangeError(`The standard error of measurement must be a finite number of at least 0, not ${String(sem)}.`);
  }
  if (!(Number.isFinite(z) && z >= 0)) throw new RangeError(`z must be a finite number of at least 0, not ${String(z)}.`);
  return { low: observed - z * sem, high: observed + z * sem };
}
