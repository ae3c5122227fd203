import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { monthLabel, spreadLabels, TrendChart } from "./trend-chart";

describe("spreadLabels", () => {
  it("keeps labels that do not collide where they are", () => {
    expect(spreadLabels([10, 50, 90], 12, 0, 200)).toEqual([10, 50, 90]);
  });
  it("pushes colliding labels apart by the gap, keeping their order", () => {
    expect(spreadLabels([50, 50, 55], 12, 0, 200)).toEqual([50, 62, 74]);
  });
  it("shifts the stack up when it would run past the bottom", () => {
    expect(spreadLabels([100, 100], 12, 0, 105)).toEqual([93, 105]);
  });
});

describe("monthLabel", () => {
  it("names the month and year of a month end", () => {
    expect(monthLabel("2026-11-30")).toBe("Nov 2026");
  });
});

describe("TrendChart", () => {
  const monthEnds = ["2026-09-30", "2026-10-31", "2026-11-30"];
  const trend = {
    monthEnds,
    series: [
      { unitId: "u1", unit: "Adult ICU", points: monthEnds.map((day, i) => ({ day, percentCurrent: 50 + i * 10, cells: 10 })) },
      { unitId: "u2", unit: "Emergency", points: monthEnds.map((day, i) => ({ day, percentCurrent: i === 0 ? 0 : 75, cells: i === 0 ? 0 : 8 })) },
    ],
  };

  it("draws one line per unit, named by its caption, with every value in a table", () => {
    // React marks text boundaries with empty comments; they are not text.
    const html = renderToString(<TrendChart trend={trend} />).replace(/<!-- -->/g, "");
    // The chart is an image named by the figcaption (aria-labelledby → an id the caption carries).
    const labelledBy = /<svg[^>]*role="img"[^>]*aria-labelledby="([^"]+)"/.exec(html)?.[1];
    expect(labelledBy).toBeTruthy();
    expect(html).toMatch(new RegExp(`<figcaption id="${labelledBy}"[^>]*>[^<]*Latest: Adult ICU 70.0 %; Emergency 75.0 %`));
    expect(html.match(/<polyline/g)).toHaveLength(2);
    // The table: a row per month end, a column per unit; a month without records says so.
    expect(html.match(/<tr>/g)).toHaveLength(4);
    expect(html).toContain("50.0 %");
    expect(html).toContain("— (no records)");
  });

  it("says so when there is no unit to show", () => {
    expect(renderToString(<TrendChart trend={{ monthEnds, series: [] }} />)).toContain("No units to show.");
  });
});
