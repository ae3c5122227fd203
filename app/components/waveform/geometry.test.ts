import { describe, expect, it } from "vitest";
import { plotGeometry, tickBudget } from "./geometry";

describe("plot geometry", () => {
  it("stacks the panels top to bottom without overlap, with the time axis under the last", () => {
    const g = plotGeometry({ width: 800, panelCount: 3 });
    expect(g.panels).toHaveLength(3);
    for (let i = 0; i < 3; i++) {
      const p = g.panels[i];
      expect(p.top).toBeGreaterThan(p.titleY);
      expect(p.bottom).toBeGreaterThan(p.top);
      if (i > 0) expect(p.titleY).toBeGreaterThan(g.panels[i - 1].bottom);
    }
    expect(g.timeLabelY).toBeGreaterThan(g.panels[2].bottom);
    expect(g.height).toBeGreaterThan(g.timeTitleY);
    expect(g.left).toBeLessThan(g.right);
    expect(g.right).toBeLessThanOrEqual(800);
  });

  it("gives at least two ticks however small the panel", () => {
    expect(tickBudget(10, 80)).toBe(2);
    expect(tickBudget(888, 80)).toBe(11);
  });
});
