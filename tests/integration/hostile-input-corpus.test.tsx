/**
 * Hostile input, part 3 (issue 11, item 4): the corpus in tests/fixtures/hostile-strings.ts is
 * stored through real actions — a person's name through Admin, an item stem through the Bank —
 * and shown back: read verbatim from the database (after the documented normalisation: forms
 * trim surrounding white space, and an unpaired surrogate becomes U+FFFD when the form body is
 * UTF-8 encoded, `storedForm`), escaped in the Team matrix page's HTML, neutralised against
 * formula injection in the Team matrix CSV and the bank export CSV (OWASP, "CSV Injection") and
 * otherwise verbatim as papaparse reads it back, and present in the survey packet PDF as
 * poppler's pdftotext reads it.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import Papa from "papaparse";
import { renderToString } from "react-dom/server";
import { createStaticHandler, createStaticRouter, StaticRouterProvider } from "react-router";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { itemVersions, people } from "~/db/schema";
import * as person from "~/routes/admin/person";
import * as bankExport from "~/routes/bank/export";
import * as itemNew from "~/routes/bank/item-new";
import * as packetPdf from "~/routes/reports/packet-pdf";
import * as matrixExport from "~/routes/team/matrix-export";
import * as matrixPage from "~/routes/team/matrix";
import { HOSTILE_STRINGS, LONG_HOSTILE, storedForm } from "../fixtures/hostile-strings";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, viewerFor } from "../setup/request";
import { outcome } from "./admin-harness";

let db: Database;
let admin: Viewer;
let manager: Viewer;
let educator: Viewer;
let subject: typeof people.$inferSelect;

beforeAll(async () => {
  db = await useSeededDatabase();
  [admin, manager, educator] = await Promise.all(["admin", "manager", "educator"].map((r) => viewerFor(`${r}@kestrelvalley.test`)));
  [subject] = await db.db.select().from(people).where(eq(people.email, "therapist@kestrelvalley.test"));
});

/** Found by the matrix search (name or employee id), whatever the name becomes. */
const EMPLOYEE_ID = "HX-4242";

/** OWASP "CSV Injection": a cell starting with =, +, -, @, tab or carriage return. */
const FORMULA = /^[=+\-@\t\r]/;
/** The entities React and escape-html write for text. */
const decode = (html: string) => html.replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&quot;/g, '"').replace(/&#x27;|&#39;/g, "'").replace(/&amp;/g, "&");

async function rename(name: string) {
  const fields = { intent: "update-person", name, email: subject.email, hireDate: subject.hireDate ?? "2020-01-01", title: subject.title ?? "", employeeId: EMPLOYEE_ID };
  return outcome(person.action(args<never>(postForm(`/admin/people/${subject.id}`, fields), admin, { personId: subject.id })));
}

async function renderMatrix(search: string): Promise<string> {
  const data = await matrixPage.loader(args<never>(getRequest(`/team/matrix${search}`), educator));
  const handler = createStaticHandler([{ id: "page", path: "*", loader: () => data, Component: matrixPage.default as unknown as () => React.ReactElement }]);
  const context = await handler.query(new Request(`http://localhost/team/matrix${search}`));
  if (context instanceof Response) throw new Error(`unexpected response ${context.status}`);
  return renderToString(<StaticRouterProvider router={createStaticRouter(handler.dataRoutes, context)} context={context} hydrate={false} />);
}

function pdfText(bytes: ArrayBuffer): string {
  const file = path.join(mkdtempSync(path.join(tmpdir(), "tidemark-hostile-")), "packet.pdf");
  writeFileSync(file, new Uint8Array(bytes));
  const out = spawnSync("pdftotext", [file, "-"], { encoding: "utf8" });
  expect(out.status).toBe(0);
  return out.stdout;
}

describe("a person's name from the hostile corpus, stored through Admin and shown everywhere", () => {
  for (const h of HOSTILE_STRINGS) {
    it(`${h.name}: verbatim in the database, escaped in HTML, neutralised in CSV, present in the PDF`, async () => {
      const answer = await rename(h.value);
      expect(answer.status, JSON.stringify(answer.body)).toBe(302);
      const stored = storedForm(h.value.trim());
      if (h.loneSurrogate) expect(stored).toContain("\uFFFD");
      const [row] = await db.db.select().from(people).where(eq(people.id, subject.id));
      expect(row.name).toBe(stored);

      const search = `?q=${EMPLOYEE_ID}`;
      const html = await renderMatrix(search);
      expect(html, "the matrix shows the person").toContain(subject.id);
      expect(html).not.toContain("<script>alert(1)</script>");
      expect(html).not.toContain("<img src=x");
      expect(decode(html)).toContain(stored);

      const csv = await (await matrixExport.loader(args<never>(getRequest(`/team/matrix/export${search}`), educator))).text();
      const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true }).data;
      expect(rows.length).toBe(2);
      expect(rows[1][0]).toBe(FORMULA.test(stored) ? `'${stored}` : stored);

      const pdf = (await packetPdf.loader(args<never>(getRequest(`/reports/packet.pdf?person=${subject.id}`), educator))) as Response;
      expect(pdf.status).toBe(200);
      const text = pdfText(await pdf.arrayBuffer()).replace(/\s+/g, " ");
      if (h.latin) {
        // NFC: pdftotext writes a base letter and its combining mark as one composed character.
        expect(text.normalize("NFC")).toContain(stored.replace(/\s+/g, " ").trim().normalize("NFC"));
      } else {
        // Source Sans 3 (latin, latin-ext) has no Hebrew, Arabic or emoji glyphs, and format
        // characters (U+202E, U+200B, U+200D) are not drawn: the PDF shows the Latin words.
        for (const word of stored.match(/[A-Za-z]{3,}/g) ?? []) expect(text).toContain(word);
      }
    });
  }

  it("a 10,000-character name is refused on its field (names hold 120 characters), nothing saved", async () => {
    const [before] = await db.db.select().from(people).where(eq(people.id, subject.id));
    const answer = await rename(LONG_HOSTILE.value);
    expect(answer.status).toBe(400);
    expect((answer.body as { error: Record<string, string[]> }).error.name?.[0]).toMatch(/120 characters/);
    const [after] = await db.db.select().from(people).where(eq(people.id, subject.id));
    expect(after).toEqual(before);
  });
});

describe("an item stem from the hostile corpus, stored through the Bank and exported", () => {
  const item = { kind: "single", topics: "cycle-variables", rationale: "Volume cycles it.", reference: "Chatburn 2014", options: "Volume\nPressure", correct: "1" };
  const stems = [...HOSTILE_STRINGS.map((h) => h.value), LONG_HOSTILE.value.slice(0, 2000)];

  it("each stem reads back verbatim, and the bank CSV neutralises formulas and re-imports to the same stem", async () => {
    for (const stem of stems) {
      const answer = await outcome(itemNew.action(args<never>(postForm("/bank/items/new", { ...item, stem }), educator)));
      expect(answer.status, JSON.stringify(answer.body)?.slice(0, 300)).toBe(302);
    }
    const saved = await db.db.select({ stem: itemVersions.stem }).from(itemVersions);
    const savedStems = new Set(saved.map((r) => r.stem));
    for (const stem of stems) expect(savedStems.has(storedForm(stem.trim())), JSON.stringify(stem.slice(0, 40))).toBe(true);

    const csv = await ((await bankExport.loader(args<never>(getRequest("/bank/export?format=csv&status=draft"), educator))) as Response).text();
    const rows = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true }).data;
    for (const stem of stems) {
      const stored = storedForm(stem.trim());
      const expected = FORMULA.test(stored) ? `'${stored}` : stored;
      expect(rows.some((r) => r.stem === expected), JSON.stringify(expected.slice(0, 40))).toBe(true);
    }
    // No cell of the export starts a formula.
    for (const r of rows) for (const v of Object.values(r)) expect(FORMULA.test(v), JSON.stringify(v.slice(0, 40))).toBe(false);
    const { parseCsvImport } = await import("~/domain/bank/interchange");
    const back = parseCsvImport(csv);
    expect(back.errors).toEqual([]);
    const backStems = new Set(back.rows.map((r) => r.content!.stem));
    for (const stem of stems) expect(backStems.has(storedForm(stem.trim()))).toBe(true);
  });

  it("a 10,000-character stem is refused on its field (stems hold 2,000 characters)", async () => {
    const answer = await outcome(itemNew.action(args<never>(postForm("/bank/items/new", { ...item, stem: LONG_HOSTILE.value }), educator)));
    expect(answer.status).toBe(400);
    expect((answer.body as { error: Record<string, string[]> }).error.stem?.[0]).toMatch(/2000 characters/);
  });
});
