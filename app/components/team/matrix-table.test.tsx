/**
 * The Team matrix's TanStack table as the server renders it (two people × three requirements),
 * and the wiring of its header and page buttons to the next view's address. The buttons are
 * pressed through TanStack's own toggle and page APIs on the instance the page renders, so the
 * test covers the library's sort cycle, not only our mapping.
 */
import { renderToString } from "react-dom/server";
import { MemoryRouter } from "react-router";
import { describe, expect, it } from "vitest";
import {
  encodeCells,
  matrixSearch,
  parseMatrixSearch,
  type MatrixSearch,
} from "~/routes/team/matrix-params";
import {
  MatrixTable,
  searchForSorting,
  sortingFromSearch,
  useMatrixTable,
  type MatrixView,
} from "./matrix-table";

const columns = [
  { id: "req-bls", name: "Basic life support" },
  { id: "req-vent", name: "Ventilator check-off" },
  { id: "req-lic", name: "State licence" },
];

function view(search: string, over: Partial<MatrixView> = {}): MatrixView {
  return {
    search: parseMatrixSearch(new URLSearchParams(search)),
    columns,
    // Deliberately not in name order: the server's order must be kept (manual sorting).
    rows: [
      {
        id: "p-zoe",
        name: "Zoe Example",
        homeUnit: "Adult ICU",
        cells: encodeCells([
          ["lapsed", "2026-04-30", "v", null],
          null,
          ["waived", "2026-01-15", "d", "2027-03-31"],
        ]),
      },
      {
        id: "p-ada",
        name: "Ada Example",
        homeUnit: null,
        cells: encodeCells([
          ["current", "2028-03-31", "v", null],
          ["due-soon", "2026-12-20", "d", null],
          ["not-started", null, "d", null],
        ]),
      },
    ],
    page: 1,
    pageCount: 1,
    matching: 2,
    ...over,
  };
}

function render(v: MatrixView, go: (s: MatrixSearch) => void = () => {}) {
  // React separates adjacent text with empty comments; drop them so the text reads as on screen.
  return renderToString(
    <MemoryRouter>
      <MatrixTable view={v} go={go} />
    </MemoryRouter>,
  ).replaceAll("<!-- -->", "");
}

type Table = ReturnType<typeof useMatrixTable>;

/** The table instance the page would hold for a view, and the addresses `go` was asked for. */
function tableFor(v: MatrixView) {
  const asked: string[] = [];
  let table: Table | undefined;
  function Capture() {
    table = useMatrixTable(v, (s) => asked.push(matrixSearch(s)));
    return null;
  }
  renderToString(<Capture />);
  if (!table) throw new Error("the table was not built");
  return { table, asked };
}

/** A header button press as TanStack handles it. */
function press(t: Table, columnId: string) {
  const handler = t.getColumn(columnId)?.getToggleSortingHandler();
  if (!handler) throw new Error(`no sort handler on ${columnId}`);
  handler(undefined);
}

describe("the Team matrix table", () => {
  it("renders one row per person with the name as row header, the home unit, and each cell's status and requirement", () => {
    const html = render(view(""));
    expect(html).toContain('data-testid="matrix"');
    expect(html).toContain(
      '<caption class="sr-only">Status of each requirement for each person; each cell opens its evidence</caption>',
    );
    expect(html.match(/data-testid="matrix-row"/g)).toHaveLength(2);
    // Row order as the server sent it.
    expect(html.indexOf("Zoe Example")).toBeLessThan(
      html.indexOf("Ada Example"),
    );
    expect(html).toMatch(/<th scope="row"[^>]*>Zoe Example<\/th>/);
    expect(html).toMatch(/<th scope="row"[^>]*>Ada Example<\/th>/);
    // One row header per row: the e2e spec finds the person by `ancestor::tr/th`.
    expect(html.match(/<th scope="row"/g)).toHaveLength(2);
    expect(html).toMatch(
      /<th scope="row"[^>]*>Zoe Example<\/th><td class="px-3 py-2 whitespace-nowrap">Adult ICU<\/td>/,
    );
    expect(html).toMatch(
      /<th scope="row"[^>]*>Ada Example<\/th><td class="px-3 py-2 whitespace-nowrap">—<\/td>/,
    );
    // Requirement headers in the columns' order.
    const heads = [...html.matchAll(/<th scope="col"[^>]*>([^<]*)<\/th>/g)].map(
      (m) => m[1],
    );
    expect(heads).toEqual(columns.map((c) => c.name));
    // Each row's status cells follow the requirement headers' order.
    const cells = [...html.matchAll(/<td data-status="([a-z-]+)">/g)].map((m) => m[1]);
    expect(cells).toEqual(["lapsed", "not-applicable", "waived", "current", "due-soon", "not-started"]);
  });

  // WCAG 2.2, 2.4.4 Link Purpose (In Context) (W3C, 2023): a link's purpose may come from the
  // headers of its table cell, so each cell's link says the status and its date, and the person
  // and the requirement are its row and column headers.
  it("links each applicable cell to its evidence, says the status in words with its date, and says when a requirement does not apply", () => {
    const html = render(view("q=ex&status=lapsed"));
    expect(html).toContain('href="/team/people/p-zoe/requirements/req-bls"');
    // Dates as "31 Mar 2028" (app/components/calendar-date.tsx), never shifted by a time zone.
    const links = [...html.matchAll(/<a href="([^"]+)">(.*?)<\/a>/g)]
      .filter((m) => m[1].startsWith("/team/people/"))
      .map((m) => `${m[1]} → ${m[2].replace(/<[^>]+>/g, "")}`);
    expect(links).toEqual([
      "/team/people/p-zoe/requirements/req-bls → Lapsed, valid through 30 Apr 2026",
      "/team/people/p-zoe/requirements/req-lic → Waived, waived through 31 Mar 2027",
      "/team/people/p-ada/requirements/req-bls → Current, valid through 31 Mar 2028",
      "/team/people/p-ada/requirements/req-vent → Due soon, due 20 Dec 2026",
      "/team/people/p-ada/requirements/req-lic → Not started",
    ]);
    // No cell carries a drawing: the stylesheet draws each status's shape (status-mark.test.ts).
    expect(html).not.toContain("<svg");
    expect(html).toContain(
      '<td data-status="not-applicable"><span aria-hidden="true">—</span><span class="sr-only">Does not apply</span></td>',
    );
  });

  // The rows are written as markup (matrixRowHtml): a hostile name or unit must arrive as text.
  it("shows a hostile name and unit as text, never as markup", () => {
    const hostile = "<img src=x onerror=alert(1)> & \"quoted\" 'single' \u202Eevil";
    const html = render(
      view("", {
        rows: [{ id: "p-x", name: hostile, homeUnit: "<b>Unit</b>", cells: encodeCells([["lapsed", "2026-04-30", "v", null], null, null]) }],
        matching: 1,
      }),
    );
    expect(html).not.toContain("<img");
    expect(html).not.toContain("<b>Unit");
    expect(html).toContain("&lt;img src=x onerror=alert(1)&gt; &amp; &quot;quoted&quot; &#39;single&#39; \u202Eevil");
    expect(html).toContain("&lt;b&gt;Unit&lt;/b&gt;");
  });

  // WAI-ARIA 1.2, "aria-sort" (W3C Recommendation, 2023): the sortable headers say how they are
  // sorted; the requirement headers cannot be sorted and carry no aria-sort.
  it("marks the sorted header with aria-sort in its direction and the other sortable one none", () => {
    const unitDesc = render(view("sort=unit&dir=desc"));
    expect(unitDesc.match(/aria-sort="[a-z]+"/g)).toEqual([
      'aria-sort="none"',
      'aria-sort="descending"',
    ]);
    expect(unitDesc).toMatch(
      /<th scope="col" aria-sort="descending" class="px-3 py-2"><button type="button" class="min-h-11 font-semibold text-sea underline">Home unit<\/button><\/th>/,
    );
    const byName = render(view(""));
    expect(byName).toMatch(
      /<th scope="col" aria-sort="ascending"[^>]*><button[^>]*>Person<\/button>/,
    );
    // Sorted by lapsed credentials (an address-only sort): neither header claims the order.
    expect(render(view("sort=lapsed&dir=desc")).match(/aria-sort="[a-z]+"/g)).toEqual([
      'aria-sort="none"',
      'aria-sort="none"',
    ]);
  });

  // The expected addresses are the rule of the hand-written table this replaced (matrix.tsx at
  // e79e853): pressing the sorted column's header while ascending sorts it descending; any
  // other press sorts that column ascending; filters stay and the page goes back to 1.
  it.each([
    ["", "name", "?dir=desc"],
    ["dir=desc", "name", ""],
    ["", "unit", "?sort=unit"],
    ["sort=unit", "unit", "?sort=unit&dir=desc"],
    ["sort=unit&dir=desc", "unit", "?sort=unit"],
    ["sort=unit&dir=desc", "name", ""],
    [
      "q=ada&unit=u1&role=therapist&status=lapsed&sort=lapsed&dir=desc&page=3",
      "name",
      "?q=ada&unit=u1&role=therapist&status=lapsed",
    ],
    ["q=ada&dir=desc&page=2", "unit", "?q=ada&sort=unit"],
  ])("from ?%s, pressing the %s header asks for %j", (from, col, to) => {
    const { table, asked } = tableFor(view(from, { page: 3, pageCount: 4 }));
    press(table, col);
    expect(asked).toEqual([to]);
  });

  it("cannot sort by a requirement column", () => {
    const { table } = tableFor(view(""));
    expect(table.getColumn("requirement:req-bls")?.getCanSort()).toBe(false);
    expect(table.getColumn("name")?.getCanSort()).toBe(true);
  });

  it("maps sorting state to the address and back", () => {
    const s = parseMatrixSearch(new URLSearchParams("q=ada&sort=unit&dir=desc&page=4"));
    expect(sortingFromSearch(s)).toEqual([{ id: "unit", desc: true }]);
    expect(matrixSearch(searchForSorting(s, [{ id: "name", desc: false }]))).toBe("?q=ada");
    // An empty state (never produced, sorting removal is off) falls back to the default view.
    expect(matrixSearch(searchForSorting(s, []))).toBe("?q=ada");
  });

  it("pages through the server's pages, keeping filters and sort", () => {
    const v = view("q=ex&sort=unit&page=2", { page: 2, pageCount: 3, matching: 120 });
    const { table, asked } = tableFor(v);
    expect(table.getCanPreviousPage()).toBe(true);
    expect(table.getCanNextPage()).toBe(true);
    table.nextPage();
    table.previousPage();
    expect(asked).toEqual(["?q=ex&sort=unit&page=3", "?q=ex&sort=unit"]);

    const html = render(v);
    expect(html).toMatch(/<nav aria-label="Pages"[^>]*>.*Previous page.*Page 2 of 3.*Next page.*<\/nav>/);
    const first = render(view("", { page: 1, pageCount: 3, matching: 120 }));
    expect(first).toContain("Page 1 of 3");
    expect(first).not.toContain("Previous page");
    expect(first).toContain("Next page");
    const last = render(view("page=3", { page: 3, pageCount: 3, matching: 120 }));
    expect(last).not.toContain("Next page");
    expect(render(view(""))).not.toContain('aria-label="Pages"');
  });
});
