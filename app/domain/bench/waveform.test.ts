import { describe, expect, it } from "vitest";
import { simulate } from "./simulate";
import { downsampleSeries, downsampleWaveform } from "./waveform";

describe("downsampling for plots", () => {
  const r = simulate({
    mode: "volume-control",
    settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 12, peepCmH2O: 5 },
    patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
    breaths: 12,
  });

  it("keeps every strip under the point budget, in time order, with first and last samples", () => {
    const d = downsampleWaveform(r.waveform, 400);
    for (const s of [d.pressureCmH2O, d.flowLpm, d.volumeMl]) {
      expect(s.timeS.length).toBeLessThanOrEqual(400);
      expect(s.timeS.length).toBe(s.values.length);
      expect(s.timeS.every((t, i) => i === 0 || t > s.timeS[i - 1])).toBe(true);
      expect(s.timeS[0]).toBe(0);
      expect(s.timeS.at(-1)).toBe(r.waveform.timeS.at(-1));
    }
  });

  it("keeps the extremes a plot must show: peak pressure, peak inspiratory and expiratory flow", () => {
    const d = downsampleWaveform(r.waveform, 200);
    expect(Math.max(...d.pressureCmH2O.values)).toBe(Math.max(...r.waveform.pressureCmH2O));
    expect(Math.max(...d.flowLpm.values)).toBe(Math.max(...r.waveform.flowLpm));
    expect(Math.min(...d.flowLpm.values)).toBe(Math.min(...r.waveform.flowLpm));
  });

  it("returns short signals unchanged", () => {
    expect(downsampleSeries([0, 1, 2], [5, 6, 7], 100)).toEqual({ timeS: [0, 1, 2], values: [5, 6, 7] });
  });
});
