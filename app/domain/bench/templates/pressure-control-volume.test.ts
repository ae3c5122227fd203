import { describe, expect, it } from "vitest";
import { pressureControlTidalVolumeMl } from "../calculations";
import { generateScenarioItem } from "../generator";

describe("pc-tidal-volume template", () => {
  it("keys the exponential-filling volume of the numbers shown, and the simulator delivers it", () => {
    // Vt = C·ΔP·(1 − e^(−Ti/τ)) (Yartsev A, Deranged Physiology, "Time constants"; TESTING.md V17).
    for (let seed = 1; seed <= 40; seed++) {
      const item = generateScenarioItem("pc-tidal-volume", seed);
      const s = item.shown;
      const expected = pressureControlTidalVolumeMl(s.complianceMlPerCmH2O, s.pressureAbovePeepCmH2O, s.inspiratoryTimeS, s.resistanceCmH2OPerLps);
      expect(item.answer as number).toBeCloseTo(expected, 0);
      // The bench's own breath (its pressure rise and time step are not in the closed form) lands
      // inside the item's tolerance, so the waveform shown never contradicts the key.
      const breath = item.result.breaths.at(-1)!;
      expect(Math.abs(breath.vtiMl - expected)).toBeLessThan(item.question.kind === "numeric" ? item.question.tolerance : 0);
    }
  });
});
