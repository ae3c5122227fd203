import { describe, expect, it } from "vitest";
import { semBand, standardErrorOfMeasurement } from "./index";

describe("standard error of measurement, SEM = SD·√(1 − rₓₓ)", () => {
  it("S6: SD 10, reliability 0.90 → SEM 3.16; observed 50 → 68 % band 46.84–53.16 (iEduNote, 'Standard Error of Measurement'; formula: Lane, Online Statistics Education, glossary)", () => {
    const sem = standardErrorOfMeasurement(10, 0.9);
    expect(sem).toBeCloseTo(3.16, 2);
    const band = semBand(50, sem);
    expect(band.low).toBeCloseTo(46.84, 2);
    expect(band.high).toBeCloseTo(53.16, 2);
  });

  it.each([
    // S7: Open Knowledge Graph, "Standard Error of Measurement" questions.
    ["S7 (Open Knowledge Graph, 'Standard Error of Measurement' questions)", 15, 0.84, 6.0, 10],
    ["S7 (Open Knowledge Graph, 'Standard Error of Measurement' questions)", 12, 0.81, 5.23, 2],
    ["S7 (Open Knowledge Graph, 'Standard Error of Measurement' questions)", 12, 0.96, 2.4, 10],
    // S8: computed from the formula; a calculator page prints 29.5 for these inputs, which is wrong.
    ["S8 (computed from the formula; a calculator page prints 29.5: wrong)", 80, 0.87, 28.84, 2],
  ])("%s: SD %d, r %d → SEM %d", (_, sd, reliability, expected, digits) => {
    expect(standardErrorOfMeasurement(sd, reliability)).toBeCloseTo(expected, digits);
  });

  it("a perfectly reliable test has no measurement error; a negative reliability gives an SEM above the SD", () => {
    expect(standardErrorOfMeasurement(7, 1)).toBe(0);
    expect(standardErrorOfMeasurement(4, -0.21)).toBeCloseTo(4.4, 12);
  });

  it("refuses a reliability above 1 or a negative SD", () => {
    expect(() => standardErrorOfMeasurement(10, 1.2)).toThrow(new RangeError("The reliability must be a finite number of at most 1, not 1.2."));
    expect(() => standardErrorOfMeasurement(-1, 0.8)).toThrow(new RangeError("The standard deviation must be a finite number of at least 0, not -1."));
    expect(() => standardErrorOfMeasurement(Number.NaN, 0.8)).toThrow(RangeError);
  });
});

describe("semBand: observed ± z·SEM", () => {
  it("z = 1.96 gives the 95 % band under the normal curve (common practice, no source)", () => {
    expect(semBand(70, 2.5, 1.96)).toEqual({ low: 70 - 4.9, high: 70 + 4.9 });
  });

  it("refuses a negative SEM or z, and a missing observed score", () => {
    expect(() => semBand(50, -3)).toThrow(new RangeError("The standard error of measurement must be a finite number of at least 0, not -3."));
    expect(() => semBand(50, 3, -1)).toThrow(new RangeError("z must be a finite number of at least 0, not -1."));
    expect(() => semBand(Number.NaN, 3)).toThrow(new RangeError("The observed score must be a finite number, not NaN."));
  });
});
