import { describe, expect, it } from "vitest";
import { DEFAULT_EFFORT, EFFORT_DURATION_FRACTION } from "./defaults";
import { createEffortSource } from "./patient";
import type { Effort } from "./types";

const steady: Effort = { ...DEFAULT_EFFORT, kind: "steady", amplitudeCmH2O: 8, rateBpm: 20, onsetS: 0.5 };

function trace(effort: Effort, seed: number, untilS: number, dt = 0.005): number[] {
  const source = createEffortSource(effort, seed);
  return Array.from({ length: Math.round(untilS / dt) }, (_, i) => source.pmusAt(i * dt));
}

describe("patient effort", () => {
  it("none: no muscle pressure at all", () => {
    expect(Math.max(...trace(DEFAULT_EFFORT, 1, 30))).toBe(0);
  });

  it("steady: a half-sine of the set amplitude every 60/rate s, starting at onsetS, lasting 35 % of the cycle", () => {
    const source = createEffortSource(steady, 1);
    const cycle = 3; // 60 / 20 breaths/min
    const duration = EFFORT_DURATION_FRACTION * cycle; // 1.05 s
    expect(source.pmusAt(0.49)).toBe(0);
    expect(source.pmusAt(0.5 + duration / 2)).toBeCloseTo(8, 9);
    expect(source.pmusAt(0.5 + duration + 0.01)).toBe(0);
    expect(source.pmusAt(0.5 + cycle + duration / 2)).toBeCloseTo(8, 9);
    expect(source.pmusAt(0.5 + 2 * cycle + duration / 4)).toBeCloseTo(8 * Math.sin(Math.PI / 4), 9);
  });

  it("erratic: amplitudes vary within ±variability and replay exactly for the same seed", () => {
    const erratic: Effort = { ...steady, kind: "erratic", variability: 0.5 };
    const a = trace(erratic, 7, 60);
    expect(trace(erratic, 7, 60)).toEqual(a);
    expect(trace(erratic, 8, 60)).not.toEqual(a);
    expect(Math.max(...a)).toBeLessThanOrEqual(8 * 1.5 + 1e-9);
    expect(Math.max(...a)).toBeGreaterThan(8 * 1.05);
  });

  it("an amplitude change applies to the effort in progress; switching off stops it at once", () => {
    const source = createEffortSource(steady, 1);
    const mid = 0.5 + (EFFORT_DURATION_FRACTION * 3) / 2;
    expect(source.pmusAt(mid - 0.1)).toBeGreaterThan(0);
    source.update({ ...steady, amplitudeCmH2O: 16 }, mid);
    expect(source.pmusAt(mid)).toBeCloseTo(16, 9);
    source.update({ ...steady, kind: "none" }, mid + 0.01);
    expect(source.pmusAt(mid + 0.02)).toBe(0);
  });

  it("switched on later, the first effort starts onsetS after the switch", () => {
    const source = createEffortSource(DEFAULT_EFFORT, 1);
    source.pmusAt(10);
    source.update({ ...steady, onsetS: 0.2 }, 10);
    expect(source.pmusAt(10.19)).toBe(0);
    expect(source.pmusAt(10.3)).toBeGreaterThan(0);
  });
});
