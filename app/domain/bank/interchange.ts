/**
 * Import and export of items as CSV or JSON. Both formats carry the same fields; in CSV the
 * body and scenario are JSON text in their cells and topics are separated by "|". Export
 * writes exactly what import reads, so export → import → export gives the same file.
 * CSV is read and written with papaparse (RFC 4180 quoting).
 */
import Papa from "papaparse";
import { contentErrors, itemContent, type ItemContent } from "./item-content";

export const INTERCHANGE_COLUMNS = ["type", "topics", "stem", "body", "scenario", "rationale", "reference"] as const;

/** Uploads larger than this are refused before they are read (OWASP ASVS 4.0.3 V12.1.1). */
export const MAX_IMPORT_BYTES = 1_000_000;
export const MAX_IMPORT_ROWS = 500;

export type ImportFormat = "csv" | "json";
export type RowError = { row: number; field: string; message: string };
export type ParsedImport = { rows: { row: number; content: ItemContent | null }[]; errors: RowError[]; fileError: string | null };

/** Canonical key order, so the JSON of an item is the same however it was built. */
export function canonicalContent(c: ItemContent): ItemContent {
  return { type: c.type, stem: c.stem, topics: [...c.topics].sort(), body: c.body, scenario: c.scenario, rationale: c.rationale, reference: c.reference };
}

export function exportJson(items: readonly ItemContent[]): string {
  return `${JSON.stringify({ format: "tidemark-items", version: 1, items: items.map(canonicalContent) }, null, 2)}\n`;
}

/**
 * CSV cells a spreadsheet would run as a formula (OWASP, "CSV Injection": a leading =, +, -, @,
 * tab or carriage return) are written with one more leading apostrophe, and a cell already
 * starting with apostrophes before such a character gets one more too, so import can take exactly
 * one away and export → import → export stays the same file.
 */
const ESCAPED_FORMULA = /^'*[=+\-@\t\r]/;
function neutraliseFormula(cell: string): string {
  return ESCAPED_FORMULA.test(cell) ? `'${cell}` : cell;
}
function restoreFormula(cell: string): string {
  return cell.startsWith("'") && ESCAPED_FORMULA.test(cell) ? cell.slice(1) : cell;
}

export function exportCsv(items: readonly ItemContent[]): string {
  const rows = items.map(canonicalContent).map((c) => ({
    type: c.type,
    topics: c.topics.join("|"),
    stem: c.stem,
    body: JSON.stringify(c.body),
    scenario: c.scenario ? JSON.stringify(c.scenario) : "",
    rationale: c.rationale,
    reference: c.reference,
  }));
  return `${Papa.unparse({ fields: [...INTERCHANGE_COLUMNS], data: rows.map((r) => INTERCHANGE_COLUMNS.map((k) => neutraliseFormula(r[k]))) }, { newline: "\n" })}\n`;
}

function checkRows(raw: unknown[], firstRow: number): ParsedImport {
  const rows: ParsedImport["rows"] = [];
  const errors: RowError[] = [];
  raw.forEach((input, i) => {
    const row = firstRow + i;
    const problems = contentErrors(input);
    if (problems.length) {
      rows.push({ row, content: null });
      for (const p of problems) errors.push({ row, ...p });
    } else {
      rows.push({ row, content: canonicalContent(itemContent.parse(input)) });
    }
  });
  return { rows, errors, fileError: null };
}

function fileError(message: string): ParsedImport {
  return { rows: [], errors: [], fileError: message };
}

export function parseJsonImport(textIn: string): ParsedImport {
  let parsed: unknown;
  try {
    parsed = JSON.parse(textIn);
  } catch (e) {
    return fileError(`The file is not valid JSON (${(e as Error).message}).`);
  }
  const items = Array.isArray(parsed) ? parsed : (parsed as { items?: unknown })?.items;
  if (!Array.isArray(items)) return fileError('The JSON file must be a list of items, or an object with an "items" list.');
  if (items.length === 0) return fileError("The file has no items.");
  if (items.length > MAX_IMPORT_ROWS) return fileError(`The file has ${items.length} items; import at most ${MAX_IMPORT_ROWS} at a time.`);
  // Rows are numbered from 1 in JSON (the first item is row 1).
  return checkRows(items, 1);
}

function jsonCell(value: string, field: string, errors: string[]): unknown {
  if (value.trim() === "") return field === "scenario" ? null : undefined;
  try {
    return JSON.parse(value);
  } catch {
    errors.push(field);
    return undefined;
  }
}

export function parseCsvImport(textIn: string): ParsedImport {
  const result = Papa.parse<Record<string, string>>(textIn.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: "greedy", transform: restoreFormula });
  const fields = result.meta.fields ?? [];
  const missing = INTERCHANGE_COLUMNS.filter((c) => !fields.includes(c));
  if (missing.length) return fileError(`The CSV file is missing the column${missing.length > 1 ? "s" : ""} ${missing.join(", ")}. The first line must name: ${INTERCHANGE_COLUMNS.join(", ")}.`);
  if (result.data.length === 0) return fileError("The file has no items.");
  if (result.data.length > MAX_IMPORT_ROWS) return fileError(`The file has ${result.data.length} rows; import at most ${MAX_IMPORT_ROWS} at a time.`);
  const out: ParsedImport = { rows: [], errors: [], fileError: null };
  result.data.forEach((r, i) => {
    // Row 1 is the header line, so the first item is row 2: the number a spreadsheet shows.
    const row = i + 2;
    const badJson: string[] = [];
    const input = {
      type: r.type,
      topics: (r.topics ?? "").split("|").map((t) => t.trim()).filter(Boolean),
      stem: r.stem,
      body: jsonCell(r.body ?? "", "body", badJson),
      scenario: jsonCell(r.scenario ?? "", "scenario", badJson),
      rationale: r.rationale,
      reference: r.reference,
    };
    const checked = checkRows([input], row);
    out.rows.push(...checked.rows);
    for (const f of badJson) out.errors.push({ row, field: f, message: "This cell is not valid JSON." });
    out.errors.push(...checked.errors.filter((e) => !badJson.includes(e.field)));
    if (badJson.length) out.rows[out.rows.length - 1] = { row, content: null };
  });
  for (const e of result.errors) {
    if (typeof e.row === "number") out.errors.push({ row: e.row + 2, field: "row", message: e.message });
  }
  return out;
}

/** Which format a file is, by its name and then its content; null when it is neither. */
export function detectFormat(name: string, head: string): ImportFormat | null {
  const lower = name.toLowerCase();
  const start = head.replace(/^\uFEFF/, "").trimStart();
  if (lower.endsWith(".json")) return start.startsWith("{") || start.startsWith("[") ? "json" : null;
  if (lower.endsWith(".csv")) return start.length > 0 && !start.startsWith("{") && !/[\u0000-\u0008]/.test(start) ? "csv" : null;
  return null;
}

export function parseImport(format: ImportFormat, textIn: string): ParsedImport {
  return format === "json" ? parseJsonImport(textIn) : parseCsvImport(textIn);
}
