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

const MatrixSearchSchema = z.object({
  q: z.string().trim().max(100).catch(""),
  unit: z.string().max(100).catch(""),
  role: z.enum(ROLES).or(z.literal("")).catch(""),
  status: z.enum(STATUSES).or(z.literal("")).catch(""),
  sort: z.enum(["name", "unit", "lapsed"]).catch("name"),
  dir: z.enum(["asc", "desc"]).catch("asc"),
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
