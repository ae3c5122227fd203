import { describe, expect, it } from "vitest";
import { decimalsOf, formatTick, linearScale, niceDomain, niceStep, niceTicks, ticksBetween } from "./scale";

describe("linear scales", () => {
  it("maps the domain onto the range and back, including an inverted (SVG, y-down) range", () => {
    const y = linearScale([0, 30], [200, 50]);
    expect(y(0)).toBe(200);
    expect(y(30)).toBe(50);
    expect(y(15)).toBe(125);
    expect(y.invert(125)).toBe(15);
    const x = linearScale([3, 18], [56, 944]);
    expect(x.invert(x(7.25))).toBeCloseTo(7.25, 12);
  });

  it("puts a zero-width domain in the middle instead of dividing by zero", () => {
    expect(linearScale([5, 5], [0, 100])(5)).toBe(50);
  });
});

describe("nice ticks (1, 2, 2.5 or 5 times a power of ten)", () => {
  it.each([
    [15, 6, 2.5],
    [30, 4, 10],
    [120, 4, 50],
    [1200, 4, 500],
    [0.9, 4, 0.25],
    [7, 10, 1],
  ])("span %d in at most %d intervals → step %d", (span, max, step) => {
    expect(niceStep(span, max)).toBe(step);
    expect(span / niceStep(span, max)).toBeLessThanOrEqual(max + 1e-9);
  });

  it("lists the multiples of the step inside the range, printed without float noise", () => {
    expect(ticksBetween(3.2, 18.2, 2.5)).toEqual([5, 7.5, 10, 12.5, 15, 17.5]);
    expect(ticksBetween(0, 0.3, 0.1)).toEqual([0, 0.1, 0.2, 0.3]);
    expect(niceTicks(-60, 60, 4)).toEqual({ step: 50, ticks: [-50, 0, 50] });
  });

  it("never loops on a bad step or an inverted range", () => {
    expect(ticksBetween(0, 10, 0)).toEqual([]);
    expect(ticksBetween(10, 0, 1)).toEqual([]);
  });
});

describe("domains for the panels", () => {
  it("covers the data, rounded outward to the step, and at least the panel's minimum range", () => {
    // Volume of a 500 mL breath in a panel that shows at least 0–600 mL.
    expect(niceDomain([0, 499.7], { atLeast: [0, 600] })).toEqual([0, 600]);
    // A stiff lung in volume control: PIP 35 goes past the 30 cmH2O minimum.
    expect(niceDomain([5, 35.02], { atLeast: [0, 30] })).toEqual([0, 40]);
  });

  it("clips rounding noise just outside the minimum range instead of adding an empty step", () => {
    expect(niceDomain([-0.4, 480], { atLeast: [0, 600] })).toEqual([0, 600]);
    // A real dip below zero (a patient exhaling below the breath's start) still shows.
    expect(niceDomain([-40, 480], { atLeast: [0, 600] })).toEqual([-200, 600]);
  });

  it("makes flow symmetric about zero so inspiration and expiration share one scale", () => {
    expect(niceDomain([-92, 61], { atLeast: [-60, 60], symmetric: true })).toEqual([-100, 100]);
  });

  it("leaves headroom above a peak that reaches the top of the range", () => {
    // High-pressure limit 30: the trace stops at 30.0 and the axis goes on to 40.
    expect(niceDomain([5, 30], { atLeast: [0, 30] })).toEqual([0, 40]);
    expect(niceDomain([5, 29], { atLeast: [0, 30] })).toEqual([0, 30]);
  });

  it("stays still while small changes happen inside a step (no jitter while sweeping)", () => {
    expect(niceDomain([5, 25.01], { atLeast: [0, 30] })).toEqual(niceDomain([5, 24.2], { atLeast: [0, 30] }));
  });

  it("falls back to 0–1 with no finite data", () => {
    expect(niceDomain([])).toEqual([0, 1]);
    expect(niceDomain([Number.NaN])).toEqual([0, 1]);
  });
});

describe("tick labels", () => {
  it("use the step's decimals, a true minus sign and never −0", () => {
    expect(decimalsOf(2.5)).toBe(1);
    expect(decimalsOf(0.25)).toBe(2);
    expect(formatTick(7.5, 2.5)).toBe("7.5");
    expect(formatTick(10, 2.5)).toBe("10.0");
    expect(formatTick(-50, 50)).toBe("\u221250");
    expect(formatTick(-0, 1)).toBe("0");
    expect(formatTick(-0.0001, 0.5)).toBe("0.0");
  });
});
