import { describe, expect, it } from "vitest";
import { MARKER_COLOUR, PAPER, SIGNALS } from "./signals";

/** WCAG 2.1 definitions of relative luminance and contrast ratio (W3C, "Web Content
 *  Accessibility Guidelines 2.1", 2018, glossary). */
function luminance(hex: string): number {
  const channel = (i: number) => {
    const c = parseInt(hex.slice(1 + 2 * i, 3 + 2 * i), 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * channel(0) + 0.7152 * channel(1) + 0.0722 * channel(2);
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((p, q) => q - p);
  return (hi + 0.05) / (lo + 0.05);
}

describe("signal colours on the paper", () => {
  it("checks the formula on known pairs: black on white is 21:1, the palette's ink on paper 13:1 (PRODUCT.md)", () => {
    expect(contrast("#000000", "#FFFFFF")).toBeCloseTo(21, 6);
    expect(contrast("#17302E", PAPER)).toBeCloseTo(13, 0);
    // PRODUCT.md lists sea-green #0F5C57 at 7.3:1 on the paper (7.25 before rounding).
    expect(Math.abs(contrast("#0F5C57", PAPER) - 7.3)).toBeLessThan(0.1);
  });

  it.each(SIGNALS.map((s) => [s.title, s.colour] as const))("%s (%s) has at least 3:1 against the paper (WCAG 1.4.11)", (_title, colour) => {
    expect(contrast(colour, PAPER)).toBeGreaterThanOrEqual(3);
  });

  it("uses three different colours, each different from the marker ink, and a title and unit for each panel", () => {
    const colours = new Set([...SIGNALS.map((s) => s.colour.toLowerCase()), MARKER_COLOUR.toLowerCase()]);
    expect(colours.size).toBe(4);
    expect(SIGNALS.map((s) => `${s.title} (${s.unit})`)).toEqual(["Pressure (cmH2O)", "Flow (L/min)", "Volume (mL)"]);
  });
});
