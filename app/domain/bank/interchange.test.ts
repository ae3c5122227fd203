import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { detectFormat, exportCsv, INTERCHANGE_COLUMNS, parseCsvImport, parseJsonImport } from "./interchange";
import type { ItemContent } from "./item-content";

const good: ItemContent = {
  type: "numeric",
  stem: 'Tidal volume 500 mL, "plateau" 20, PEEP 5; compliance?\nSecond line, with a comma',
  topics: ["lung-mechanics"],
  body: { kind: "numeric", answer: 33.3, unit: "mL/cmH2O", tolerance: 0.1, decimals: 1 },
  scenario: null,
  rationale: "Vt / (Pplat − PEEP).",
  reference: "Hess DR, Kacmarek RM. Essentials of Mechanical Ventilation. 2019.",
};

describe("CSV interchange", () => {
  it("writes RFC 4180 CSV that papaparse reads back field for field (quotes, commas, line breaks)", () => {
    const csv = exportCsv([good]);
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });
    expect(parsed.meta.fields).toEqual([...INTERCHANGE_COLUMNS]);
    expect(parsed.data[0].stem).toBe(good.stem);
    expect(JSON.parse(parsed.data[0].body)).toEqual(good.body);
  });

  it("reports every bad row with its spreadsheet row number and field, and keeps the good rows", () => {
    const rows = [
      { type: "numeric", topics: "lung-mechanics", stem: "ok", body: JSON.stringify(good.body), scenario: "", rationale: "r", reference: "ref" },
      { type: "numeric", topics: "no-such-topic", stem: "", body: "{not json", scenario: "", rationale: "r", reference: "ref" },
      { type: "single", topics: "modes", stem: "s", body: JSON.stringify({ kind: "single", options: ["a", "b"], correct: 5 }), scenario: "", rationale: "", reference: "ref" },
    ];
    const csv = Papa.unparse({ fields: [...INTERCHANGE_COLUMNS], data: rows.map((r) => INTERCHANGE_COLUMNS.map((k) => r[k])) });
    const out = parseCsvImport(csv);
    expect(out.fileError).toBeNull();
    expect(out.rows.map((r) => [r.row, r.content !== null])).toEqual([
      [2, true],
      [3, false],
      [4, false],
    ]);
    const where = out.errors.map((e) => `${e.row}:${e.field}`);
    expect(where).toContain("3:body");
    expect(where).toContain("3:stem");
    expect(where).toContain("3:topics.0");
    expect(where).toContain("4:rationale");
    expect(where).toContain("4:body.correct");
  });

  it("refuses a file without the expected columns, naming them", () => {
    expect(parseCsvImport("a,b\n1,2\n").fileError).toMatch(/missing the columns type, topics, stem/);
  });
});

describe("JSON interchange and file checks", () => {
  it("numbers JSON rows from 1 and refuses what is not a list of items", () => {
    const out = parseJsonImport(JSON.stringify({ items: [good, { ...good, stem: "" }] }));
    expect(out.errors).toEqual([{ row: 2, field: "stem", message: "Enter the stem." }]);
    expect(parseJsonImport("{oops").fileError).toMatch(/not valid JSON/);
    expect(parseJsonImport('{"x":1}').fileError).toMatch(/list of items/);
  });

  it("tells CSV from JSON by name and content, and refuses anything else", () => {
    expect(detectFormat("bank.csv", "type,topics")).toBe("csv");
    expect(detectFormat("bank.json", '{"items":[]}')).toBe("json");
    expect(detectFormat("bank.json", "type,topics")).toBeNull();
    expect(detectFormat("bank.pdf", "%PDF-1.7")).toBeNull();
    expect(detectFormat("bank.csv", "\u0000\u0001binary")).toBeNull();
  });
});
