/**
 * CSV for the Team export (RFC 4180: fields with a comma, quote or line break are quoted, quotes
 * doubled; CRLF line ends). A cell a spreadsheet would run as a formula is neutralised with a
 * leading apostrophe: OWASP, "CSV Injection" — fields starting with = + − @, tab or carriage
 * return (the minus sign U+2212 included, which some spreadsheets also accept).
 */
const FORMULA_START = /^[=+\-@\t\r\u2212]/;

export function escapeFormula(value: string): string {
  return FORMULA_START.test(value) ? `'${value}` : value;
}

function quote(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

export function toCsv(rows: readonly (readonly string[])[]): string {
  return rows.map((r) => r.map((v) => quote(escapeFormula(v))).join(",")).join("\r\n") + "\r\n";
}
