import { describe, expect, it } from "vitest";
import type { BreathReading } from "~/domain/bench/types";
import { describeWaveform } from "./summary";

const breath = (n: number, extra: Partial<BreathReading> = {}): BreathReading => ({
  breath: n,
  startS: (n - 1) * 4,
  durationS: 4,
  pipCmH2O: 25,
  pplatCmH2O: null,
  vtiMl: 500,
  vteMl: 499.6,
  peakFlowLpm: 60,
  tiS: 0.5,
  mpawCmH2O: 6.5,
  totalPeepCmH2O: 5,
  trigger: "time",
  cycle: "volume",
  alarms: [],
  inspiratoryPressureCmH2O: null,
  testBreath: false,
  ...extra,
});

describe("the plot's text alternative", () => {
  it("names the signals, the time window, each range and the latest breath", () => {
    const text = describeWaveform({
      startS: 1,
      endS: 16,
      ranges: { pressureCmH2O: [5, 25], flowLpm: [-55.04, 60], volumeMl: [0, 500] },
      breaths: [breath(1), breath(2), breath(3, { pipCmH2O: 30, alarms: ["high-pressure"] })],
    });
    expect(text).toContain("Pressure, flow and volume against time, 1.0 to 16.0 s.");
    expect(text).toContain("Pressure 5.0 to 25.0 cmH2O; flow \u221255.0 to 60.0 L/min; volume 0 to 500 mL.");
    expect(text).toContain("Breaths 1 to 3 shown.");
    expect(text).toContain("Latest, breath 3: peak pressure 30.0 cmH2O, inspired volume 500 mL, exhaled volume 500 mL, alarms High pressure.");
  });

  it("lists markers and shaded windows, and says when nothing is drawn", () => {
    const text = describeWaveform({
      startS: 0,
      endS: 5,
      ranges: null,
      markers: [{ timeS: 0.5, label: "End of inspiration" }],
      windows: [{ fromS: 0, toS: 0.5, label: "Inspiration" }],
    });
    expect(text).toContain("No samples in this time window.");
    expect(text).toContain('Marker "End of inspiration" at 0.5 s.');
    expect(text).toContain('Shaded "Inspiration" from 0.0 to 0.5 s.');
  });
});
