/**
 * Reading the HR roster CSV (issue 10, item 2). Pure: no database, no Node-only APIs.
 *
 * The file format (shown on /admin/roster):
 * - UTF-8 text (a byte-order mark is accepted); anything else is refused with the first bad
 *   byte's row and column. Comma-separated, RFC 4180 quoting, read with papaparse. At most
 *   ROSTER_MAX_BYTES.
 * - Row 1 is the header. Names are matched without regard to case, spaces or hyphens.
 *   Required: employee_id, name, email, hire_date. Optional: title, unit, roles, active.
 *   A missing required column, a repeated column or an unknown column (a misspelt "titel"
 *   would otherwise drop every title silently) is an error on row 1 naming it.
 * - Each later row is one person, held to the same rules as "Add a person"
 *   (`createPersonSchema` in app/routes/admin/schemas.ts): name, e-mail, hire date YYYY-MM-DD
 *   and a real calendar date, title ≤ 120 characters. employee_id is required here because the
 *   import matches people by it. unit is a unit's short code or its name (any letter case) of
 *   an active unit; roles are role names separated by ";" (added, never removed: removing a
 *   role stays on the person's page, where the last-admin guard lives); active is yes or no.
 * - A blank line is skipped. Row numbers are the file's record numbers with the header as row
 *   1 — a spreadsheet's row numbers, unless a quoted cell spans lines.
 * - Cells keep their content verbatim apart from surrounding whitespace: formulas, markup,
 *   right-to-left and zero-width characters are stored as typed and shown escaped, with
 *   invisible characters marked (`markInvisible`). Formula cells are not errors.
 */
import Papa from "papaparse";
import { ROLES, ROLE_LABELS, type Role } from "~/auth/roles";
import { createPersonSchema } from "~/routes/admin/schemas";

export const ROSTER_MAX_BYTES = 2 * 1024 * 1024;

export const REQUIRED_COLUMNS = ["employee_id", "name", "email", "hire_date"] as const;
export const OPTIONAL_COLUMNS = ["title", "unit", "roles", "active"] as const;
export type RosterColumn = (typeof REQUIRED_COLUMNS)[number] | (typeof OPTIONAL_COLUMNS)[number];
const KNOWN_COLUMNS: readonly RosterColumn[] = [...REQUIRED_COLUMNS, ...OPTIONAL_COLUMNS];

/** A problem in the file. `row` is 1-based (header = 1); `column` is a letter plus its header, e.g. "D (hire_date)". Both null only for a whole-file problem (empty, too large). */
export type RosterProblem = { row: number | null; column: string | null; message: string };

export type RosterUnit = { id: string; name: string; code: string; active: boolean };

/** One person as the file gives them. An optional column absent from the file is `undefined` (left as it is). */
export type RosterRow = {
  row: number;
  employeeId: string;
  name: string;
  email: string;
  hireDate: string;
  title?: string | null;
  homeUnitId?: string | null;
  roles?: Role[];
  active?: boolean;
};

/** `columns`: where each column of the file sits (0-based), for labelling later problems. */
export type RosterParse = { rows: RosterRow[]; problems: RosterProblem[]; columns: Partial<Record<RosterColumn, number>> };

/** Spreadsheet column letters: 0 → A, 25 → Z, 26 → AA. */
export function columnLetter(index: number): string {
  let n = index + 1;
  let s = "";
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

function normaliseHeader(cell: string): string {
  return cell.trim().toLowerCase().replace(/[\s-]+/g, "_");
}

const ALIASES: Record<string, RosterColumn> = { role: "roles", home_unit: "unit", employee_number: "employee_id", e_mail: "email" };

/** Where the first byte that is not UTF-8 sits: its row (line) and cell, counted as the rest of the file is. */
function firstBadByte(bytes: Uint8Array): { row: number; cell: number } {
  let lineStart = 0;
  let row = 1;
  for (let i = 0; i < bytes.length; i++) {
    if (bytes[i] === 0x0a) {
      try {
        new TextDecoder("utf-8", { fatal: true }).decode(bytes.subarray(lineStart, i));
      } catch {
        break;
      }
      lineStart = i + 1;
      row++;
    }
  }
  const line = bytes.subarray(lineStart, bytes.indexOf(0x0a, lineStart) === -1 ? bytes.length : bytes.indexOf(0x0a, lineStart));
  // The cell: count the commas outside quotes before the first byte the decoder refuses.
  let cell = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    try {
      new TextDecoder("utf-8", { fatal: true }).decode(line.subarray(0, i + 1), { stream: true });
    } catch {
      break;
    }
    if (line[i] === 0x22) quoted = !quoted;
    if (line[i] === 0x2c && !quoted) cell++;
  }
  return { row, cell };
}

function decode(bytes: Uint8Array): { text: string } | { problem: RosterProblem } {
  try {
    // fatal: refuse rather than replace with U+FFFD; the decoder drops a leading BOM by default.
    return { text: new TextDecoder("utf-8", { fatal: true }).decode(bytes) };
  } catch {
    const at = firstBadByte(bytes);
    return {
      problem: {
        row: at.row,
        column: columnLetter(at.cell),
        message:
          "The file is not UTF-8 text (it may be Latin-1 or Windows-1252, as older spreadsheet exports are). Save it again as “CSV UTF-8” and upload that; nothing was imported.",
      },
    };
  }
}

function parseRole(word: string): Role | null {
  const w = word.trim().toLowerCase();
  return ROLES.find((r) => r === w || ROLE_LABELS[r].toLowerCase() === w) ?? null;
}

const YES = new Set(["yes", "y", "true", "1", "active"]);
const NO = new Set(["no", "n", "false", "0", "inactive"]);

/** Reads and checks the file. Any problem means nothing is imported. */
export function parseRoster(bytes: Uint8Array, units: readonly RosterUnit[]): RosterParse {
  const fail = (problem: RosterProblem): RosterParse => ({ rows: [], problems: [problem], columns: {} });
  if (bytes.length === 0) return fail({ row: null, column: null, message: "The file is empty. Export the roster again with its header row and one row per person." });
  if (bytes.length > ROSTER_MAX_BYTES) {
    const mb = (bytes.length / 1024 / 1024).toFixed(1);
    return fail({ row: null, column: null, message: `The file is ${mb} MB; the limit is ${ROSTER_MAX_BYTES / 1024 / 1024} MB. Split the roster into smaller files.` });
  }
  const decoded = decode(bytes);
  if ("problem" in decoded) return fail(decoded.problem);
  if (decoded.text.trim() === "") return fail({ row: null, column: null, message: "The file is empty (only blank space). Export the roster again with its header row and one row per person." });

  const parsed = Papa.parse<string[]>(decoded.text, { header: false, delimiter: ",", skipEmptyLines: false });
  const records = parsed.data;
  const problems: RosterProblem[] = [];
  for (const e of parsed.errors) {
    const row = (e.row ?? 0) + 1;
    const cells = records[e.row ?? 0]?.length ?? 1;
    problems.push({
      row,
      column: columnLetter(Math.max(0, cells - 1)),
      message:
        e.code === "MissingQuotes"
          ? "A cell opens a double quote that is never closed, so the rest of the file would be read as one cell. Close the quote (write a quote inside a cell as two quotes: \"\")."
          : `The CSV cannot be read here: ${e.message}.`,
    });
  }
  if (problems.length > 0) return { rows: [], problems, columns: {} };

  // Header.
  const header = records[0] ?? [];
  const columns: (RosterColumn | null)[] = [];
  const seen = new Map<RosterColumn, number>();
  header.forEach((cell, i) => {
    const name = normaliseHeader(cell);
    const known = (KNOWN_COLUMNS as readonly string[]).includes(name) ? (name as RosterColumn) : ALIASES[name];
    const col = `${columnLetter(i)} (${cell.trim() || "blank"})`;
    if (!known) {
      problems.push({ row: 1, column: col, message: `Unknown column “${cell.trim()}”. The columns Tidemark reads are ${KNOWN_COLUMNS.join(", ")}; rename it or remove it.` });
      columns.push(null);
    } else if (seen.has(known)) {
      problems.push({ row: 1, column: col, message: `The column ${known} appears twice (also column ${columnLetter(seen.get(known) as number)}); keep one.` });
      columns.push(null);
    } else {
      seen.set(known, i);
      columns.push(known);
    }
  });
  const missing = REQUIRED_COLUMNS.filter((c) => !seen.has(c));
  if (missing.length > 0) {
    problems.push({
      row: 1,
      column: columnLetter(header.length),
      message: `Missing required column${missing.length > 1 ? "s" : ""}: ${missing.join(", ")}. Row 1 must name employee_id, name, email and hire_date.`,
    });
  }
  if (problems.length > 0) return { rows: [], problems, columns: {} };

  const present = [...seen.keys()];
  const colLabel = (c: RosterColumn) => `${columnLetter(seen.get(c) as number)} (${c})`;
  const blank = (cells: string[]) => cells.every((c) => c.trim() === "");
  const personSchema = createPersonSchema();
  const unitByKey = new Map<string, RosterUnit>();
  for (const u of units) {
    unitByKey.set(u.code.toLowerCase(), u);
    unitByKey.set(u.name.trim().toLowerCase(), u);
  }
  const firstRowOf = { employeeId: new Map<string, number>(), email: new Map<string, number>() };
  const rows: RosterRow[] = [];

  records.slice(1).forEach((cells, i) => {
    const row = i + 2;
    if (blank(cells)) return;
    if (cells.length !== header.length) {
      const more = cells.length > header.length;
      problems.push({
        row,
        column: columnLetter(more ? header.length : cells.length),
        message: more
          ? `This row has ${cells.length} cells but the header has ${header.length}. A cell containing a comma must be in double quotes.`
          : `This row has ${cells.length} cells but the header has ${header.length}; every row needs a cell for each column (an empty one is fine for optional columns).`,
      });
      return;
    }
    const cell = (c: RosterColumn): string | undefined => (seen.has(c) ? cells[seen.get(c) as number].trim() : undefined);
    const add = (c: RosterColumn, message: string) => problems.push({ row, column: colLabel(c), message });
    const before = problems.length;

    const employeeId = cell("employee_id") ?? "";
    if (employeeId === "") add("employee_id", "The employee id is empty; Tidemark matches people by it, so every row needs one.");
    const checked = personSchema.safeParse({
      name: cell("name"),
      email: cell("email"),
      employeeId,
      title: cell("title") ?? undefined,
      hireDate: cell("hire_date"),
    });
    const fieldColumn: Record<string, RosterColumn> = { name: "name", email: "email", employeeId: "employee_id", title: "title", hireDate: "hire_date" };
    if (!checked.success) {
      for (const issue of checked.error.issues) {
        const c = fieldColumn[String(issue.path[0])];
        if (c && !(c === "employee_id" && employeeId === "")) add(c, issue.message);
      }
    }

    let homeUnitId: string | null | undefined;
    const unitCell = cell("unit");
    if (unitCell !== undefined) {
      if (unitCell === "") homeUnitId = null;
      else {
        const unit = unitByKey.get(unitCell.toLowerCase());
        if (!unit) add("unit", `There is no unit “${unitCell}” in your organisation. Use a unit's short code or name as on Admin › Units.`);
        else if (!unit.active) add("unit", `The unit ${unit.name} is deactivated; reactivate it on Admin › Units or choose another.`);
        else homeUnitId = unit.id;
      }
    }

    let roles: Role[] | undefined;
    const rolesCell = cell("roles");
    if (rolesCell !== undefined) {
      roles = [];
      for (const word of rolesCell.split(";").filter((w) => w.trim() !== "")) {
        const role = parseRole(word);
        if (!role) add("roles", `Unknown role “${word.trim()}”. Roles are ${ROLES.join(", ")}, separated by “;”.`);
        else if (!roles.includes(role)) roles.push(role);
      }
    }

    let active: boolean | undefined;
    const activeCell = cell("active");
    if (activeCell !== undefined) {
      const w = activeCell.toLowerCase();
      if (YES.has(w)) active = true;
      else if (NO.has(w)) active = false;
      else add("active", `Write yes or no in active (found “${activeCell}”).`);
    }

    if (employeeId !== "") {
      const earlier = firstRowOf.employeeId.get(employeeId);
      if (earlier) add("employee_id", `Employee id ${employeeId} is also on row ${earlier}; each person appears once.`);
      else firstRowOf.employeeId.set(employeeId, row);
    }
    if (checked.success) {
      const earlier = firstRowOf.email.get(checked.data.email);
      if (earlier) add("email", `${checked.data.email} is also on row ${earlier}; each person signs in with their own address.`);
      else firstRowOf.email.set(checked.data.email, row);
    }

    if (problems.length === before && checked.success) {
      rows.push({
        row,
        employeeId,
        name: checked.data.name,
        email: checked.data.email,
        hireDate: checked.data.hireDate,
        ...(present.includes("title") ? { title: checked.data.title } : {}),
        ...(homeUnitId !== undefined ? { homeUnitId } : {}),
        ...(roles ? { roles } : {}),
        ...(active !== undefined ? { active } : {}),
      });
    }
  });

  if (rows.length === 0 && problems.length === 0) {
    problems.push({ row: 2, column: columnLetter(0), message: "The file has a header but no people. Export the roster again with one row per person." });
  }
  return { rows: problems.length > 0 ? [] : rows, problems, columns: Object.fromEntries(seen) };
}
