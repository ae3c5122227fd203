import { describe, expect, it } from "vitest";
import { linePath, visibleRange } from "./path";
import { linearScale } from "./scale";

describe("visible sample range", () => {
  const t = [0, 0.5, 1, 1.5, 2, 2.5, 3];

  it("keeps one sample beyond each edge so the trace reaches the panel's sides", () => {
    expect(visibleRange(t, 1.2, 2.2)).toEqual([2, 6]);
    // A sample exactly on the right edge ends the line there; nothing past it is needed.
    expect(visibleRange(t, 1, 2)).toEqual([1, 5]);
  });

  it("clamps at the ends and returns nothing for a window outside the samples", () => {
    expect(visibleRange(t, -5, 0.7)).toEqual([0, 3]);
    expect(visibleRange(t, 2.7, 9)).toEqual([5, 7]);
    expect(visibleRange(t, 4, 9)).toEqual([0, 0]);
    expect(visibleRange([], 0, 1)).toEqual([0, 0]);
  });
});

describe("SVG line paths", () => {
  const x = linearScale([0, 10], [0, 1000]);
  const y = linearScale([0, 30], [300, 0]);

  it("moves to the first point and draws lines to the rest, in px rounded to 0.1", () => {
    expect(linePath([0, 1, 2], [0, 15, 30], x, y)).toBe("M0 300L100 150L200 0");
    expect(linePath([0.123456], [10.0001], x, y)).toBe("M12.3 200");
  });

  it("drops points that land on the same rounded position and skips non-finite values", () => {
    expect(linePath([0, 0.0001, 1, 2], [0, 0, Number.NaN, 30], x, y)).toBe("M0 300L200 0");
  });

  it("gives the same string for the same data every time (server and browser agree)", () => {
    const times = Array.from({ length: 500 }, (_, i) => i * 0.02);
    const values = times.map((s) => 5 + 20 * Math.sin(s));
    expect(linePath(times, values, x, y)).toBe(linePath(Float64Array.from(times), Float64Array.from(values), x, y));
  });

  it("is empty without points", () => {
    expect(linePath([], [], x, y)).toBe("");
  });
});
