/**
 * The Team matrix's table, people × requirements, drawn with TanStack Table (v9 API). The server
 * owns filtering, sorting and paging (app/db/queries/team-matrix.server.ts): the table receives
 * one sorted page, runs in manual sorting and manual pagination, and turns a header click or a
 * page button into the next view's search params, which the page fetches without a reload.
 * Table gives the models and state; the markup, labels and ARIA here are ours.
 */
import {
  createColumnHelper,
  functionalUpdate,
  metaHelper,
  rowPaginationFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
  type Header,
  type PaginationState,
  type SortingState,
  type Updater,
} from "@tanstack/react-table";
import escapeHtml from "escape-html";
import { useMemo, type MouseEvent } from "react";
import { useNavigate } from "react-router";
import { formatCalendarDate } from "~/components/calendar-date";
import { Button } from "~/components/ui/button";
import { STATUS_WORDS } from "~/components/ui/status-mark";
import {
  decodeCells,
  MATRIX_PAGE_SIZE,
  matrixSearch,
  type CellTuple,
  type MatrixSearch,
} from "~/routes/team/matrix-params";

/** What the page's loader sends for the table: one page of rows, cells encoded per row. */
export type MatrixView = {
  search: MatrixSearch;
  columns: readonly { id: string; name: string }[];
  rows: readonly {
    id: string;
    name: string;
    homeUnit: string | null;
    cells: string;
  }[];
  page: number;
  pageCount: number;
  matching: number;
};

type MatrixPerson = {
  id: string;
  name: string;
  homeUnit: string | null;
  cells: (CellTuple | null)[];
};

type ColumnMeta = {
  headerClassName: string;
  /** The requirement behind a cell column: its name and its place in a row's cells. */
  requirement?: { id: string; name: string; index: number };
};

const features = tableFeatures({
  rowSortingFeature,
  rowPaginationFeature,
  tableMeta: metaHelper<{ back: string }>(),
  columnMeta: metaHelper<ColumnMeta>(),
});

const column = createColumnHelper<typeof features, MatrixPerson>();

/** The columns the server can sort by from a header; "lapsed" is reachable by address only. */
type HeaderSort = Extract<MatrixSearch["sort"], "name" | "unit">;
const SORTS: readonly MatrixSearch["sort"][] = ["name", "unit", "lapsed"];

/** The table's sorting state for a view: one column, from the address. */
export function sortingFromSearch(search: MatrixSearch): SortingState {
  return [{ id: search.sort, desc: search.dir === "desc" }];
}

/** The view a new sorting state asks for: that column and direction, from the first page. */
export function searchForSorting(
  search: MatrixSearch,
  sorting: SortingState,
): MatrixSearch {
  const first = sorting[0];
  const sort = SORTS.find((s) => s === first?.id) ?? "name";
  return { ...search, sort, dir: first?.desc ? "desc" : "asc", page: 1 };
}

/** The table's pagination state for a view: page N of the address is page index N − 1. */
export function paginationFromSearch(search: MatrixSearch): PaginationState {
  return { pageIndex: search.page - 1, pageSize: MATRIX_PAGE_SIZE };
}

/** The view a new pagination state asks for; filters and sort stay. */
export function searchForPagination(
  search: MatrixSearch,
  pagination: PaginationState,
): MatrixSearch {
  return { ...search, page: pagination.pageIndex + 1 };
}

/** What a cell's link says after its status word (the person and requirement are its row and column headers). */
export function cellWhen([, date, meaning, waivedThrough]: CellTuple): string {
  return waivedThrough
    ? `waived through ${formatCalendarDate(waivedThrough)}`
    : date
      ? `${meaning === "d" ? "due" : "valid through"} ${formatCalendarDate(date)}`
      : "";
}

/** The cell page of a person × requirement (its evidence; waivers and extensions). */
export const cellPath = (personId: string, requirementId: string) => `/team/people/${personId}/requirements/${requirementId}`;

const SORTABLE_HEADER = "px-3 py-2";
const REQUIREMENT_HEADER = "max-w-40 px-3 py-2 align-bottom font-semibold";

function sortableColumn(id: HeaderSort, label: string) {
  return column.accessor(id === "name" ? "name" : "homeUnit", {
    id,
    // The server sorts; the toggle only asks for the next view. Both columns start A–Z and
    // then flip, never back to unsorted (the page has always sorted; "name" by default).
    sortDescFirst: false,
    meta: { headerClassName: SORTABLE_HEADER },
    header: ({ column: c }) => (
      <button
        type="button"
        className="min-h-11 font-semibold text-sea underline"
        onClick={c.getToggleSortingHandler()}
      >
        {label}
      </button>
    ),
    cell: ({ getValue }) => getValue() ?? "—",
  });
}

function matrixColumns(requirements: MatrixView["columns"]) {
  return column.columns([
    sortableColumn("name", "Person"),
    sortableColumn("unit", "Home unit"),
    ...requirements.map((r, index) =>
      column.accessor((p) => p.cells[index] ?? null, {
        id: `requirement:${r.id}`,
        enableSorting: false,
        header: r.name,
        meta: {
          headerClassName: REQUIREMENT_HEADER,
          requirement: { id: r.id, name: r.name, index },
        },
      }),
    ),
  ]);
}

function ariaSort(header: Header<typeof features, MatrixPerson>) {
  if (!header.column.getCanSort()) return undefined;
  const sorted = header.column.getIsSorted();
  return sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none";
}

/**
 * The table instance for a view. `go` fetches the view a header or page button asks for; it is
 * never called while rendering (no auto-reset of sorting or page index).
 */
export function useMatrixTable(
  view: MatrixView,
  go: (search: MatrixSearch) => void,
) {
  // Stable inputs: Table rebuilds its row and column models only when these change.
  const data = useMemo<MatrixPerson[]>(
    () =>
      view.rows.map((r) => ({
        id: r.id,
        name: r.name,
        homeUnit: r.homeUnit,
        cells: decodeCells(r.cells),
      })),
    [view.rows],
  );
  const columns = useMemo(() => matrixColumns(view.columns), [view.columns]);
  const sorting = useMemo(() => sortingFromSearch(view.search), [view.search]);
  const pagination = useMemo(
    () => paginationFromSearch(view.search),
    [view.search],
  );
  const meta = useMemo(
    () => ({ back: `/team/matrix${matrixSearch(view.search)}` }),
    [view.search],
  );
  return useTable({
    features,
    columns,
    data,
    getRowId: (p) => p.id,
    meta,
    state: { sorting, pagination },
    manualSorting: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
    autoResetSorting: false,
    onSortingChange: (updater: Updater<SortingState>) =>
      go(searchForSorting(view.search, functionalUpdate(updater, sorting))),
    manualPagination: true,
    autoResetPageIndex: false,
    pageCount: view.pageCount,
    rowCount: view.matching,
    onPaginationChange: (updater: Updater<PaginationState>) =>
      go(
        searchForPagination(view.search, functionalUpdate(updater, pagination)),
      ),
  });
}

/**
 * One row of the matrix as markup: the person (row header), the home unit and one status cell
 * per requirement. A page holds up to 25 × 40 = 1,000 cells, and as React elements (five per
 * cell) they were most of the cost of each document request, so the row is written
 * as one string, text escaped with escape-html, and handed to React whole; the same function runs
 * on the server and in the browser, so hydration sees the same markup. Cells are styled once by
 * `.matrix-cells` in app/styles/app.css, which also draws each status's shape (a CSS image keyed
 * on `data-status`, so no cell carries its own drawing).
 *
 * A cell's link says the status and its date; the person and the requirement are its row and
 * column headers (WCAG 2.2, 2.4.4 Link Purpose (In Context): a link's purpose may come from its
 * table cell's headers).
 */
export function matrixRowHtml(person: MatrixPerson, requirementIds: readonly string[]): string {
  let html = `<th scope="row" class="px-3 py-2 font-semibold whitespace-nowrap">${escapeHtml(person.name)}</th><td class="px-3 py-2 whitespace-nowrap">${person.homeUnit ? escapeHtml(person.homeUnit) : "—"}</td>`;
  requirementIds.forEach((requirementId, index) => {
    const cell = person.cells[index];
    const status = cell?.[0];
    if (!cell || !status || !(status in STATUS_WORDS)) {
      html += '<td data-status="not-applicable"><span aria-hidden="true">—</span><span class="sr-only">Does not apply</span></td>';
      return;
    }
    const when = cellWhen(cell);
    const href = escapeHtml(cellPath(encodeURIComponent(person.id), encodeURIComponent(requirementId)));
    html += `<td data-status="${status}"><a href="${href}">${STATUS_WORDS[status]}${when ? `<span class="sr-only">, ${when}</span>` : ""}</a></td>`;
  });
  return html;
}

/**
 * A plain click on a cell opens its evidence in place (client navigation) with the current view
 * as the way back; a modified click, a middle click or no script at all follows the plain link
 * and the cell page offers the unfiltered matrix instead.
 */
function useOpenCell(back: string) {
  const navigate = useNavigate();
  return (event: MouseEvent<HTMLElement>) => {
    if (event.defaultPrevented || event.button !== 0 || event.metaKey || event.ctrlKey || event.shiftKey || event.altKey) return;
    const link = (event.target as Element).closest("a");
    const href = link?.getAttribute("href");
    if (!href || !href.startsWith("/team/people/")) return;
    event.preventDefault();
    navigate(`${href}?back=${encodeURIComponent(back)}`);
  };
}

export function MatrixTable({
  view,
  go,
}: {
  view: MatrixView;
  go: (search: MatrixSearch) => void;
}) {
  const table = useMatrixTable(view, go);
  const { pageIndex } = table.state.pagination;
  const pageCount = table.getPageCount();
  const openCell = useOpenCell(table.options.meta?.back ?? "/team/matrix");
  const requirementIds = view.columns.map((c) => c.id);
  return (
    <>
      <div className="overflow-x-auto rounded-lg border border-rule bg-card">
        <table
          className="matrix-cells border-collapse text-left text-sm"
          data-testid="matrix"
        >
          <caption className="sr-only">
            Status of each requirement for each person; each cell opens its
            evidence
          </caption>
          <thead className="sticky top-0 bg-card">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-rule">
                {group.headers.map((header) => (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={ariaSort(header)}
                    className={header.column.columnDef.meta?.headerClassName}
                  >
                    <table.FlexRender header={header} />
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          {/* The links inside handle the keyboard; this only adds the way back to a plain click. */}
          {/* eslint-disable-next-line jsx-a11y/click-events-have-key-events, jsx-a11y/no-noninteractive-element-interactions */}
          <tbody onClick={openCell}>
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                className="border-b border-rule align-top"
                data-testid="matrix-row"
                dangerouslySetInnerHTML={{ __html: matrixRowHtml(row.original, requirementIds) }}
              />
            ))}
          </tbody>
        </table>
      </div>

      {pageCount > 1 ? (
        <nav
          aria-label="Pages"
          className="mt-4 flex flex-wrap items-center gap-4"
        >
          {table.getCanPreviousPage() ? (
            <Button variant="quiet" onClick={() => table.previousPage()}>
              Previous page
            </Button>
          ) : null}
          <span>
            Page {pageIndex + 1} of {pageCount}
          </span>
          {table.getCanNextPage() ? (
            <Button variant="quiet" onClick={() => table.nextPage()}>
              Next page
            </Button>
          ) : null}
        </nav>
      ) : null}
    </>
  );
}
