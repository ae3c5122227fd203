/**
 * The patient's inspiratory effort (muscle pressure, Pmus) over time.
 *
 * The patient breathes on their own clock, independent of the ventilator: efforts start
 * every 60/rate seconds, the first one `onsetS` after the run starts (or after effort is
 * switched on). One effort is a half-sine of muscle pressure lasting `durationS`
 * (default 35 % of the patient's cycle) — a smooth rise and relaxation, the usual teaching
 * shape (common practice, no source). Pmus enters the equation of motion on the patient's
 * side: Paw + Pmus = PEEP + V/C + R·V̇ (Chatburn, Respir Care 2014;59(11):1747–63).
 *
 * Erratic effort draws each effort's amplitude uniformly within ±variability of the set
 * amplitude and each interval within ±variability/2 of the patient's cycle, from the seeded
 * random source (prng.ts), so a run replays exactly.
 */
import { EFFORT_DURATION_FRACTION } from "./defaults";
import { createRandom } from "./prng";
import type { Effort } from "./types";

export interface EffortSource {
  /** Muscle pressure at time t (cmH2O, ≥ 0). Times must not decrease between calls. */
  pmusAt(tS: number): number;
  /** Changes the effort from time t on; amplitude changes apply to the effort in progress. */
  update(effort: Effort, tS: number): void;
}

export function createEffortSource(initial: Effort, seed: number): EffortSource {
  const random = createRandom(seed).next;
  let effort = initial;
  // Current effort window and its random amplitude factor.
  let start = Number.POSITIVE_INFINITY;
  let duration = 0;
  let amplitudeFactor = 1;
  let nextStart = effort.kind === "none" ? Number.POSITIVE_INFINITY : effort.onsetS;

  const cycleS = () => 60 / effort.rateBpm;

  function beginNext(): void {
    start = nextStart;
    let interval = cycleS();
    amplitudeFactor = 1;
    if (effort.kind === "erratic") {
      // Fixed draw order (amplitude, then interval) keeps a seed's replay exact.
      amplitudeFactor = 1 + effort.variability * (2 * random() - 1);
      interval *= 1 + (effort.variability / 2) * (2 * random() - 1);
    }
    const wanted = effort.durationS ?? EFFORT_DURATION_FRACTION * cycleS();
    // An effort never runs into the next one.
    duration = Math.min(wanted, 0.9 * interval);
    nextStart = start + interval;
  }

  return {
    pmusAt(tS) {
      while (tS >= nextStart) beginNext();
      const into = tS - start;
      if (into < 0 || into >= duration || effort.kind === "none") return 0;
      return effort.amplitudeCmH2O * amplitudeFactor * Math.sin((Math.PI * into) / duration);
    },
    update(next, tS) {
      const wasOff = effort.kind === "none";
      effort = next;
      if (next.kind === "none") {
        nextStart = Number.POSITIVE_INFINITY;
        duration = 0;
      } else if (wasOff) {
        nextStart = tS + next.onsetS;
      }
    },
  };
}
