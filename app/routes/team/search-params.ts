/**
 * The Team ledger's address: search, sort column, direction and page live in the URL's search
 * params, so the page works without JavaScript and a filtered view can be shared. One schema,
 * used by the loader to read the address and by the page to write links.
 */
import { z } from "zod";

export const TEAM_SORTS = ["name", "unit", "hire", "lapsed"] as const;
export type TeamSort = (typeof TEAM_SORTS)[number];
export type SortDirection = "asc" | "desc";

/** The direction a column starts in: A–Z for words and dates, most lapsed first for the count. */
export const DEFAULT_DIRECTION: Record<TeamSort, SortDirection> = { name: "asc", unit: "asc", hire: "asc", lapsed: "desc" };

/** Anything unreadable falls back to the default view rather than an error page. */
export const TeamSearchSchema = z.object({
  q: z.string().trim().max(100).catch(""),
  sort: z.enum(TEAM_SORTS).catch("name"),
  dir: z.enum(["asc", "desc"]).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
});

export type TeamQuery = { q: string; sort: TeamSort; dir: SortDirection; page: number };

export function parseTeamSearch(params: URLSearchParams): TeamQuery {
  const raw = TeamSearchSchema.parse({
    q: params.get("q") ?? undefined,
    sort: params.get("sort") ?? undefined,
    dir: params.get("dir") ?? undefined,
    page: params.get("page") ?? undefined,
  });
  return { q: raw.q, sort: raw.sort, dir: raw.dir ?? DEFAULT_DIRECTION[raw.sort], page: raw.page };
}

/** The address of a Team view; defaults are left out so addresses stay short. */
export function teamHref(query: TeamQuery): string {
  const params = new URLSearchParams();
  if (query.q) params.set("q", query.q);
  if (query.sort !== "name") params.set("sort", query.sort);
  if (query.dir !== DEFAULT_DIRECTION[query.sort]) params.set("dir", query.dir);
  if (query.page > 1) params.set("page", String(query.page));
  const search = params.toString();
  return search ? `/team?${search}` : "/team";
}

/** The link on a column header: sorts by it, or flips the direction when it is already sorted. */
export function sortHref(query: TeamQuery, column: TeamSort): string {
  const dir = query.sort === column ? (query.dir === "asc" ? "desc" : "asc") : DEFAULT_DIRECTION[column];
  return teamHref({ ...query, sort: column, dir, page: 1 });
}
