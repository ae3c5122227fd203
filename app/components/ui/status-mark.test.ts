/**
 * The Team matrix draws each status's shape from the stylesheet (a CSS image keyed on the cell's
 * data-status) instead of a drawing per cell: the stylesheet must draw exactly the shapes the
 * rest of Tidemark draws inline, so a shape changed in one place cannot silently differ.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { STATUS_SHAPES, STATUSES, statusShapeDataUri } from "./status-mark";

const css = readFileSync(path.resolve(import.meta.dirname, "../../styles/app.css"), "utf8");

describe("the status shapes in the stylesheet", () => {
  it.each(STATUSES)("the matrix cell of a %s requirement shows the same shape as StatusMark", (status) => {
    const rule = css.match(new RegExp(`\\.matrix-cells td\\[data-status="${status}"\\] > a::before \\{([^}]*)\\}`));
    expect(rule, `a ::before rule for ${status}`).not.toBeNull();
    const urls = [...rule![1].matchAll(/content: url\("([^"]+)"\)/g)].map((m) => m[1]);
    expect(urls.length).toBeGreaterThan(0);
    for (const url of urls) expect(url).toBe(statusShapeDataUri(status));
    // With empty alternative text: the word beside it says the status.
    expect(rule![1]).toContain(`content: url("${statusShapeDataUri(status)}") / "";`);
  });

  it("each shape is a complete 16 × 16 SVG image that decodes back to its drawing", () => {
    for (const status of STATUSES) {
      const svg = decodeURIComponent(statusShapeDataUri(status).replace("data:image/svg+xml,", ""));
      expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="14" height="14" viewBox="0 0 16 16">/);
      expect(svg).toContain(STATUS_SHAPES[status]);
    }
    // Five different drawings: told apart by outline, not only by colour (PRODUCT.md).
    expect(new Set(Object.values(STATUS_SHAPES)).size).toBe(5);
  });
});
