/**
 * The question bank's loaders and actions on a seeded copy of the demo database: writing an
 * item, the review rule (a second educator publishes), versioning that leaves the published
 * version untouched, the audit trail, organisation scoping, and import that saves nothing until
 * the educator chooses — plus the export → import round trip of the demo bank.
 */
import { and, count, desc, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { verifyAuditChain } from "~/db/audit.server";
import type { Database } from "~/db/client.server";
import { auditEvents, items, itemVersions, people, personRoles } from "~/db/schema";
import { exportJson, parseJsonImport, exportCsv, parseCsvImport } from "~/domain/bank/interchange";
import * as exportRoute from "~/routes/bank/export";
import * as importRoute from "~/routes/bank/import";
import * as indexRoute from "~/routes/bank/index";
import * as itemRoute from "~/routes/bank/item";
import * as editRoute from "~/routes/bank/item-edit";
import * as newRoute from "~/routes/bank/item-new";
import * as versionRoute from "~/routes/bank/item-version";
import { DEMO_BANK } from "../../seeds/bank";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";
import { type ArgsOf, fieldErrors, outcome } from "./admin-harness";

let db: Database;
let educator: Viewer;
let second: Viewer;
let therapist: Viewer;
let otherOrg: Viewer;

beforeAll(async () => {
  db = await useSeededDatabase();
  educator = await viewerFor("educator@kestrelvalley.test");
  const others = await db.db
    .select({ email: people.email })
    .from(people)
    .innerJoin(personRoles, eq(personRoles.personId, people.id))
    .where(and(eq(personRoles.role, "educator"), eq(people.orgId, educator.org.id)));
  second = await viewerFor(others.map((o) => o.email).find((e) => e !== educator.person.email)!);
  therapist = await viewerFor("therapist@kestrelvalley.test");
  // An educator of another organisation (the demo's second organisation has none, so one is made up in memory).
  otherOrg = { ...(await viewerFor("admin@alderbay.test")), roles: ["educator"] };
});

const NUMERIC = {
  kind: "numeric",
  stem: "Tidal volume 450 mL, plateau 25 cmH2O, PEEP 10 cmH2O. What is the static compliance?",
  topics: "lung-mechanics",
  answer: "30",
  unit: "mL/cmH2O",
  tolerance: "0.5",
  decimals: "0",
  rationale: "Cstat = Vt / (Pplat − PEEP) = 450 / 15 = 30 mL/cmH2O.",
  reference: "Hess DR, Kacmarek RM. Essentials of Mechanical Ventilation. 4th ed. 2019.",
};

const create = (viewer: Viewer, fields: Record<string, string | string[]>) =>
  outcome(newRoute.action(args<ArgsOf<typeof newRoute.action>>(postForm("/bank/items/new", fields), viewer)));
const step = (viewer: Viewer, itemId: string, intent: string) =>
  outcome(itemRoute.action(args<ArgsOf<typeof itemRoute.action>>(postForm(`/bank/items/${itemId}`, { intent }), viewer, { itemId })));
const edit = (viewer: Viewer, itemId: string, fields: Record<string, string | string[]>) =>
  outcome(editRoute.action(args<ArgsOf<typeof editRoute.action>>(postForm(`/bank/items/${itemId}/edit`, fields), viewer, { itemId })));
const itemPage = (viewer: Viewer, itemId: string) => outcome(itemRoute.loader(args<ArgsOf<typeof itemRoute.loader>>(getRequest(`/bank/items/${itemId}`), viewer, { itemId })));

function upload(fileName: string, content: string, type: string, extra: Record<string, string> = {}) {
  const form = new FormData();
  form.set("intent", "check-file");
  form.set("file", new File([content], fileName, { type }));
  for (const [k, v] of Object.entries(extra)) form.set(k, v);
  return new Request(new URL("/bank/import", TEST_ORIGIN), { method: "POST", body: form, headers: { Origin: TEST_ORIGIN } });
}
const importAction = (viewer: Viewer, request: Request) => outcome(importRoute.action(args<ArgsOf<typeof importRoute.action>>(request, viewer)));
const itemCount = async () => (await db.db.select({ n: count() }).from(items).where(eq(items.orgId, educator.org.id)))[0].n;
const lastEvent = async () => (await db.db.select().from(auditEvents).orderBy(desc(auditEvents.seq)).limit(1))[0];

describe("who may use the bank", () => {
  it("a therapist is refused the list, an item (published or not) and the export", async () => {
    expect((await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest("/bank"), therapist)))).status).toBe(403);
    const [draft] = await db.db.select({ id: items.id }).from(items).where(and(eq(items.orgId, educator.org.id), eq(items.status, "draft"))).limit(1);
    expect((await itemPage(therapist, draft.id)).status).toBe(403);
    expect((await outcome(exportRoute.loader(args<ArgsOf<typeof exportRoute.loader>>(getRequest("/bank/export?format=json"), therapist)))).status).toBe(403);
  });

  it("an educator of another organisation finds none of Kestrel Valley's items", async () => {
    const [any] = await db.db.select({ id: items.id }).from(items).where(eq(items.orgId, educator.org.id)).limit(1);
    expect((await itemPage(otherOrg, any.id)).status).toBe(404);
    const list = await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest("/bank"), otherOrg)));
    // Alder Bay keeps its own copy of the demo bank (seeds/alder-bay.ts): the list is exactly its
    // own items, and none of Kestrel Valley's.
    const rows = (list.body as { rows: { id: string }[] }).rows;
    const kvIds = new Set((await db.db.select({ id: items.id }).from(items).where(eq(items.orgId, educator.org.id))).map((r) => r.id));
    const abIds = (await db.db.select({ id: items.id }).from(items).where(eq(items.orgId, otherOrg.org.id))).map((r) => r.id);
    expect(abIds).toHaveLength(DEMO_BANK.length);
    expect(rows.map((r) => r.id).sort()).toEqual([...abIds].sort());
    expect(rows.some((r) => kvIds.has(r.id))).toBe(false);
  });

  it("lists the demo bank and filters by topic, type and status", async () => {
    const all = (await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest("/bank"), educator)))).body as Awaited<ReturnType<typeof indexRoute.loader>>;
    expect(all.rows.length).toBe(DEMO_BANK.length);
    const waveform = (await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest("/bank?type=waveform-point&topic=waveform-reading"), educator)))).body as typeof all;
    expect(waveform.rows.length).toBeGreaterThanOrEqual(5);
    expect(waveform.rows.every((r) => r.type === "waveform-point" && r.topics.includes("waveform-reading"))).toBe(true);
    const inReview = (await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest("/bank?status=in-review"), educator)))).body as typeof all;
    expect(inReview.rows.length).toBeGreaterThan(0);
    expect(inReview.rows.every((r) => r.status === "in-review")).toBe(true);
  });
});

describe("writing, reviewing and versioning an item", () => {
  let itemId = "";

  it("refuses an incomplete form with errors on its fields", async () => {
    const result = await create(educator, { ...NUMERIC, stem: "", answer: "thirty", topics: [] });
    expect(result.status).toBe(400);
    expect(fieldErrors(result.body, "stem")).toEqual(["Enter the stem."]);
    expect(fieldErrors(result.body, "answer")).toEqual(["Enter the answer as a number."]);
  });

  it("saves a draft at version 1, audited", async () => {
    const result = await create(educator, NUMERIC);
    expect(result.status).toBe(302);
    itemId = result.location!.split("/").pop()!;
    const event = await lastEvent();
    expect(event).toMatchObject({ action: "item.created", entityId: itemId, actorId: educator.person.id });
  });

  it("the writer sends it to review but cannot publish it; a second educator can", async () => {
    expect((await step(educator, itemId, "send-to-review")).status).toBe(302);
    const refused = await step(educator, itemId, "publish");
    expect(refused.status).toBe(409);
    expect((refused.body as { error: Record<string, string[]> }).error[""][0]).toMatch(/second educator/);
    expect((await step(second, itemId, "publish")).status).toBe(302);
    const [v1] = await db.db.select().from(itemVersions).where(eq(itemVersions.itemId, itemId));
    expect(v1.reviewedBy).toBe(second.person.id);
    expect(v1.publishedAt).not.toBeNull();
    expect((await lastEvent()).action).toBe("item.publish");
  });

  it("editing the published item makes version 2; version 1 stays exactly as it was and readable", async () => {
    const [before] = await db.db.select().from(itemVersions).where(and(eq(itemVersions.itemId, itemId), eq(itemVersions.version, 1)));
    const result = await edit(second, itemId, { ...NUMERIC, stem: "Vt 450 mL, Pplat 25, PEEP 10 cmH2O: static compliance?" });
    expect(result.status).toBe(302);
    const [after] = await db.db.select().from(itemVersions).where(and(eq(itemVersions.itemId, itemId), eq(itemVersions.version, 1)));
    expect(after).toEqual(before);
    const page = (await itemPage(educator, itemId)).body as Awaited<ReturnType<typeof itemRoute.loader>>;
    expect(page.item.currentVersion).toBe(2);
    expect(page.item.status).toBe("draft");
    expect(page.item.liveVersion).toBe(1);
    const v1 = (await outcome(versionRoute.loader(args<ArgsOf<typeof versionRoute.loader>>(getRequest(`/bank/items/${itemId}/versions/1`), educator, { itemId, version: "1" })))).body as Awaited<ReturnType<typeof versionRoute.loader>>;
    expect(v1.content.stem).toBe(NUMERIC.stem);
    expect(v1.published).toBe(true);
    expect((await lastEvent()).action).toBe("item.versioned");
  });

  it("retires only when asked twice, and can return it to published", async () => {
    const [published] = await db.db.select({ id: items.id }).from(items).where(and(eq(items.orgId, educator.org.id), eq(items.status, "published"))).limit(1);
    expect((await step(educator, published.id, "retire")).status).toBe(400);
    const confirmed = await outcome(itemRoute.action(args<ArgsOf<typeof itemRoute.action>>(postForm(`/bank/items/${published.id}`, { intent: "retire", confirm: "yes" }), educator, { itemId: published.id })));
    expect(confirmed.status).toBe(302);
    expect((await lastEvent()).action).toBe("item.retire");
    expect((await step(educator, published.id, "restore")).status).toBe(302);
    const [row] = await db.db.select({ status: items.status }).from(items).where(eq(items.id, published.id));
    expect(row.status).toBe("published");
  });

  it("refuses an unknown intent and keeps the audit chain whole", async () => {
    expect((await step(educator, itemId, "delete-everything")).status).toBe(400);
    expect(await verifyAuditChain(db.db)).toMatchObject({ whole: true });
  });
});

describe("import and export", () => {
  it("a file with bad rows shows every error by row and field and saves nothing until the educator chooses", async () => {
    const before = await itemCount();
    const good = DEMO_BANK[0].content;
    const file = exportJson([good, { ...good, stem: "" }, { ...good, topics: ["nonsense" as never] }]);
    const checked = await importAction(educator, upload("items.json", file, "application/json"));
    expect(checked.status).toBe(200);
    const body = checked.body as { stage: string; valid: number; total: number; errors: { row: number; field: string }[]; payload: string };
    expect(body).toMatchObject({ stage: "checked", valid: 1, total: 3 });
    expect(body.errors.map((e) => `${e.row}:${e.field}`)).toEqual(["2:stem", "3:topics.0"]);
    expect(await itemCount()).toBe(before);
    const form = new FormData();
    form.set("intent", "import-valid");
    form.set("payload", body.payload);
    form.set("fileName", "items.json");
    const saved = await importAction(educator, new Request(new URL("/bank/import", TEST_ORIGIN), { method: "POST", body: form, headers: { Origin: TEST_ORIGIN } }));
    expect(saved.status).toBe(302);
    expect(await itemCount()).toBe(before + 1);
    expect((await lastEvent()).action).toBe("item.imported");
  });

  it("refuses a file of the wrong type or over the size limit, with a clear message", async () => {
    const wrong = await importAction(educator, upload("items.pdf", "%PDF-1.7", "application/pdf"));
    expect(wrong.status).toBe(415);
    expect((wrong.body as { message: string }).message).toMatch(/not a CSV or JSON file/);
    const big = await importAction(educator, upload("items.csv", "type,topics\n" + "x".repeat(1_100_000), "text/csv"));
    expect(big.status).toBe(413);
    expect((big.body as { message: string }).message).toMatch(/at most 1 MB/);
  });

  it("the demo bank exported as JSON and CSV imports back identical", async () => {
    const res = await exportRoute.loader(args<ArgsOf<typeof exportRoute.loader>>(getRequest("/bank/export?format=json"), educator));
    expect(res.headers.get("Content-Type")).toMatch(/application\/json/);
    const file = await res.text();
    const parsed = parseJsonImport(file);
    expect(parsed.errors).toEqual([]);
    expect(exportJson(parsed.rows.map((r) => r.content!))).toBe(file);
    const csvRes = await exportRoute.loader(args<ArgsOf<typeof exportRoute.loader>>(getRequest("/bank/export?format=csv"), educator));
    const csv = await csvRes.text();
    const back = parseCsvImport(csv);
    expect(back.errors).toEqual([]);
    expect(exportCsv(back.rows.map((r) => r.content!))).toBe(csv);
    expect(exportJson(back.rows.map((r) => r.content!))).toBe(file);
    // Every demo item is in the export (plus the items written by the tests above).
    const stems = new Set(parsed.rows.map((r) => r.content!.stem));
    for (const d of DEMO_BANK) expect(stems.has(d.content.stem)).toBe(true);
  });
});

describe("search", () => {
  it("matches words of the stem or the reference, taking % and _ literally", async () => {
    const list = async (q: string) =>
      ((await outcome(indexRoute.loader(args<ArgsOf<typeof indexRoute.loader>>(getRequest(`/bank?q=${encodeURIComponent(q)}`), educator)))).body as Awaited<ReturnType<typeof indexRoute.loader>>).rows;
    expect((await list("double-triggered")).length).toBeGreaterThan(0);
    expect((await list("Pepe PE")).length).toBeGreaterThan(0);
    expect(await list("%")).toHaveLength(DEMO_BANK.filter((d) => d.content.stem.includes("%") || d.content.reference.includes("%")).length);
  });
});
