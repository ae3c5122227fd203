/**
 * The Team matrix's address: name search, unit, role, status, sort and page in the search
 * params, so a filtered view can be shared, exported and fetched alone. Unreadable values fall
 * back to the default view.
 */
import { z } from "zod";
import { ROLES } from "~/auth/roles";
import { STATUSES, type Status } from "~/domain/status";

/** A cell as the page uses it, aligned with the columns: [status, date, date meaning ("d" due, "v" valid through), waived through]. */
export type CellTuple = [Status, string | null, "d" | "v", string | null];

/**
 * A row's cells travel as one string ("status,date,meaning,waived" per cell, ";" between cells,
 * "" where the requirement does not apply): 25 strings instead of 1,000 small arrays keep the
 * streamed response cheap to encode for 25 people × 40 requirements.
 */
export function encodeCells(cells: readonly (CellTuple | null)[]): string {
  return cells.map((c) => (c ? c.map((v) => v ?? "").join(",") : "")).join(";");
}

export function decodeCells(encoded: string): (CellTuple | null)[] {
  return encoded.split(";").map((part) => {
    if (!part) return null;
    const [status, date, meaning, waived] = part.split(",");
    return [status as Status, date || null, meaning === "d" ? "d" : "v", waived || null];
  });
}

/** Rows per page of the matrix: 25 people × every requirement (up to ~1,000 cells) is more than a screen, and keeps each page light to send and to read with a screen reader. */
export const MATRIX_PAGE_SIZE = 25;

/**
 * The matrix's filter fields, strict: the API (/api/v1/team-matrix) refuses a bad value with the
 * field's message; the page falls back to the default view instead (below). One definition, so
 * the page and the API filter by the same rules.
 */
export const MATRIX_FILTER_FIELDS = {
  q: z.string().trim().max(100, "Search for at most 100 characters."),
  unit: z.string().max(100, "That is not a unit id."),
  role: z.enum(ROLES, { error: `The role is one of ${ROLES.join(", ")}.` }),
  status: z.enum(STATUSES, { error: `The status is one of ${STATUSES.join(", ")}.` }),
  sort: z.enum(["name", "unit", "lapsed"], { error: "Sort by name, unit or lapsed." }),
  dir: z.enum(["asc", "desc"], { error: "The direction is asc or desc." }),
};

const MatrixSearchSchema = z.object({
  q: MATRIX_FILTER_FIELDS.q.catch(""),
  unit: MATRIX_FILTER_FIELDS.unit.catch(""),
  role: MATRIX_FILTER_FIELDS.role.or(z.literal("")).catch(""),
  status: MATRIX_FILTER_FIELDS.status.or(z.literal("")).catch(""),
  sort: MATRIX_FILTER_FIELDS.sort.catch("name"),
  dir: MATRIX_FILTER_FIELDS.dir.catch("asc"),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
});

export type MatrixSearch = z.infer<typeof MatrixSearchSchema>;

export function parseMatrixSearch(params: URLSearchParams): MatrixSearch {
  const get = (k: string) => params.get(k) ?? undefined;
  return MatrixSearchSchema.parse({ q: get("q"), unit: get("unit"), role: get("role"), status: get("status"), sort: get("sort"), dir: get("dir"), page: get("page") });
}

/** Search params of a view; defaults left out. */
export function matrixSearch(s: MatrixSearch): string {
  const p = new URLSearchParams();
  if (s.q) p.set("q", s.q);
  if (s.unit) p.set("unit", s.unit);
  if (s.role) p.set("role", s.role);
  if (s.status) p.set("status", s.status);
  if (s.sort !== "name") p.set("sort", s.sort);
  if (s.dir !== "asc") p.set("dir", s.dir);
  if (s.page > 1) p.set("page", String(s.page));
  const out = p.toString();
  return out ? `?${out}` : "";
}
