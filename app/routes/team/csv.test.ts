import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { escapeFormula, toCsv } from "./csv";

describe("Team CSV export", () => {
  it("neutralises cells a spreadsheet would run as formulas (OWASP, \"CSV Injection\")", () => {
    expect(escapeFormula("=HYPERLINK(\"http://x\")")).toBe("'=HYPERLINK(\"http://x\")");
    expect(escapeFormula("+1")).toBe("'+1");
    expect(escapeFormula("-2")).toBe("'-2");
    expect(escapeFormula("@SUM(A1)")).toBe("'@SUM(A1)");
    expect(escapeFormula("\u22123")).toBe("'\u22123");
    expect(escapeFormula("Lapsed 2026-03-31")).toBe("Lapsed 2026-03-31");
  });

  it("round-trips through papaparse: hostile names, commas, quotes and line breaks come back as written (escaped)", () => {
    const rows = [
      ["Name", "Unit", "Basic life support"],
      ["=cmd|' /C calc'!A0", "Adult ICU, north", "Lapsed (valid through 2026-03-31)"],
      ['O"Brien\nsecond line', "@unit", "Current"],
    ];
    const parsed = Papa.parse<string[]>(toCsv(rows), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual([
      ["Name", "Unit", "Basic life support"],
      ["'=cmd|' /C calc'!A0", "Adult ICU, north", "Lapsed (valid through 2026-03-31)"],
      ['O"Brien\nsecond line', "'@unit", "Current"],
    ]);
  });
});
