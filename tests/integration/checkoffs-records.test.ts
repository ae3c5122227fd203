/**
 * Evidence uploads, the printable record and its PDF, orientation plans and checklist versions,
 * called as loaders and actions against a seeded copy of the demo database. Acceptance of issue 7.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, existsSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import type { Database } from "~/db/client.server";
import { addAddendum, acknowledgeCheckoff } from "~/db/queries/checkoffs-signing.server";
import { getCheckoffRecord } from "~/db/queries/checkoffs.server";
import { checkoffEvidence, checkoffs, files, orientationPlans } from "~/db/schema";
import { MAX_UPLOAD_BYTES } from "~/files/file-type";
import * as checkoffPage from "~/routes/checkoffs/checkoff";
import * as checklistPage from "~/routes/checkoffs/checklist";
import * as evidenceRoute from "~/routes/checkoffs/evidence";
import * as orientationPage from "~/routes/checkoffs/orientation";
import * as recordPdf from "~/routes/checkoffs/record-pdf";
import { useSeededDatabase } from "../setup/db";
import { args, getRequest, postForm, TEST_ORIGIN, viewerFor } from "../setup/request";
import { type ArgsOf, outcome } from "./admin-harness";
import { givePin, PINS, signedCheckoff } from "./checkoffs-harness";

let db: Database;
let therapist: Viewer;
let preceptor: Viewer;
let manager: Viewer;
let educator: Viewer;
let checkoffId: string;

beforeAll(async () => {
  db = await useSeededDatabase();
  therapist = await viewerFor("therapist@kestrelvalley.test");
  preceptor = await viewerFor("preceptor@kestrelvalley.test");
  manager = await viewerFor("manager@kestrelvalley.test");
  educator = await viewerFor("educator@kestrelvalley.test");
  await givePin(therapist, PINS.therapist);
  await givePin(preceptor, PINS.preceptor);
  checkoffId = await signedCheckoff(therapist, preceptor);
});

// Real file headers: PDF (ISO 32000 "%PDF-"), Windows executable ("MZ", Microsoft PE format).
const PDF = new TextEncoder().encode("%PDF-1.4\n1 0 obj\n<<>>\nendobj\ntrailer\n<<>>\n%%EOF\n");
const EXE = new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00, 0x00, 0x00, 0x04, 0x00]);

function upload(viewer: Viewer, name: string, bytes: Uint8Array, type = "application/pdf") {
  const form = new FormData();
  form.set("intent", "evidence");
  form.set("file", new File([new Uint8Array(bytes)], name, { type }));
  const request = new Request(new URL(`/checkoffs/${checkoffId}`, TEST_ORIGIN), { method: "POST", body: form, headers: { Origin: TEST_ORIGIN } });
  return outcome(checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(request, viewer, { checkoffId })));
}

const filesOnDisk = () => {
  const dir = path.join(process.env.DATA_DIR!, "files", therapist.org.id);
  return existsSync(dir) ? readdirSync(dir).length : 0;
};
const rowCounts = async () => ({
  files: (await db.db.select({ n: count() }).from(files))[0].n,
  evidence: (await db.db.select({ n: count() }).from(checkoffEvidence))[0].n,
  disk: filesOnDisk(),
});

describe("evidence uploads (OWASP ASVS 4.0.3 V12.1, V12.2)", () => {
  it.each([
    ["a renamed executable", "paper-checkoff.pdf", EXE, /not a PNG, JPEG or PDF \(checked by its content/],
    ["an empty file", "blank.pdf", new Uint8Array(0), /blank\.pdf is empty/],
    ["an oversize file", "huge.pdf", (() => { const b = new Uint8Array(MAX_UPLOAD_BYTES + 1); b.set(PDF); return b; })(), /limit is 10 MB/],
  ])("refuses %s with a clear message and saves nothing", async (_, name, bytes, message) => {
    const before = await rowCounts();
    const answer = await upload(therapist, name, bytes);
    expect(answer.status).toBe(400);
    expect((answer.body as { message: string }).message).toMatch(message);
    expect(await rowCounts()).toEqual(before);
  });

  it("refuses a body larger than the limit before reading it", async () => {
    const request = new Request(new URL(`/checkoffs/${checkoffId}`, TEST_ORIGIN), {
      method: "POST",
      body: "x",
      headers: { Origin: TEST_ORIGIN, "Content-Type": "multipart/form-data; boundary=x", "Content-Length": String(MAX_UPLOAD_BYTES * 2) },
    });
    const answer = await outcome(checkoffPage.action(args<ArgsOf<typeof checkoffPage.action>>(request, therapist, { checkoffId })));
    expect(answer.status).toBe(413);
    expect((answer.body as { message: string }).message).toMatch(/10 MB/);
  });

  it("an allowed file is stored and downloaded only by people who may see the check-off", async () => {
    const answer = await upload(therapist, "paper-checkoff-2025.pdf", PDF);
    expect(answer.status).toBe(302);
    const record = (await getCheckoffRecord(therapist.org.id, checkoffId))!;
    const [evidence] = record.evidence;
    expect(evidence).toMatchObject({ name: "paper-checkoff-2025.pdf", mimeType: "application/pdf" });
    const download = (viewer: Viewer) =>
      outcome(
        evidenceRoute.loader(args<ArgsOf<typeof evidenceRoute.loader>>(getRequest(`/checkoffs/${checkoffId}/evidence/${evidence.id}`), viewer, { checkoffId, evidenceId: evidence.id })),
      );
    for (const viewer of [therapist, preceptor, manager, educator]) {
      const res = (await evidenceRoute.loader(args<ArgsOf<typeof evidenceRoute.loader>>(getRequest("/"), viewer, { checkoffId, evidenceId: evidence.id }))) as Response;
      expect(res.status).toBe(200);
      expect(res.headers.get("Content-Disposition")).toBe('attachment; filename="paper-checkoff-2025.pdf"');
      expect(new Uint8Array(await res.arrayBuffer())).toEqual(PDF);
    }
    const otherTherapist = await viewerFor((await otherTherapistEmail())!);
    expect((await download(otherTherapist)).status).toBe(404);
    const alderBay = await viewerFor("admin@alderbay.test");
    expect((await download({ ...alderBay, roles: ["therapist", "preceptor", "manager"] })).status).toBe(404);
  });
});

async function otherTherapistEmail(): Promise<string | undefined> {
  const rows = await db.client.execute({
    sql: "SELECT p.email FROM people p JOIN person_roles r ON r.person_id = p.id WHERE p.org_id = ? AND r.role = 'therapist' AND p.id NOT IN (?, ?) AND p.id NOT IN (SELECT person_id FROM person_roles WHERE role IN ('preceptor','educator','manager')) LIMIT 1",
    args: [therapist.org.id, therapist.person.id, preceptor.person.id],
  });
  return rows.rows[0]?.email as string | undefined;
}

describe("the printable record", () => {
  it("the PDF carries every step, comment, signature with its meaning and time zone, the addendum and the caution, in Source Sans 3", async () => {
    await acknowledgeCheckoff(therapist, checkoffId, { email: null, pin: PINS.therapist });
    await addAddendum(preceptor, checkoffId, "Observed on the Adult ICU test lung with Zoë Łęcka (latin-ext glyphs).", { email: null, pin: PINS.preceptor });
    const res = (await recordPdf.loader(args<ArgsOf<typeof recordPdf.loader>>(getRequest(`/checkoffs/${checkoffId}/record.pdf`), manager, { checkoffId }))) as Response;
    expect(res.headers.get("Content-Type")).toBe("application/pdf");
    const dir = mkdtempSync(path.join(tmpdir(), "tidemark-pdf-"));
    const file = path.join(dir, "record.pdf");
    writeFileSync(file, new Uint8Array(await res.arrayBuffer()));
    // Parsed back by an independent reader: poppler's pdftotext and pdffonts (shared/TESTING.md).
    const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout.replace(/\s+/g, " ");
    const record = (await getCheckoffRecord(therapist.org.id, checkoffId))!;
    expect(text).toContain(record.checklist.title);
    for (const step of record.checklist.steps) expect(text).toContain(step.text.slice(0, 30));
    expect(text).toContain("Two identifiers checked");
    expect(text).toContain("Meaning: Observed and judged competent");
    expect(text).toContain("Meaning: Acknowledged by the therapist observed");
    expect(text).toContain("Meaning: Author of this addendum");
    expect(text).toContain(`(${therapist.org.timeZone})`);
    expect(text).toContain("Observed on the Adult ICU test lung with Zoë Łęcka (latin-ext glyphs).");
    expect(text).toContain("does not replace the device's instructions for use");
    const fonts = spawnSync("pdffonts", [file], { encoding: "utf8" }).stdout;
    expect(fonts).toMatch(/SourceSans3|Source ?Sans ?3/i);
  });

  it("a therapist who is not the check-off's cannot fetch its PDF", async () => {
    const other = await viewerFor((await otherTherapistEmail())!);
    expect((await outcome(recordPdf.loader(args<ArgsOf<typeof recordPdf.loader>>(getRequest("/"), other, { checkoffId })))).status).toBe(404);
  });
});

describe("orientation plans", () => {
  it("the preceptor sees their orientees' plans with target dates; the manager sees all three new hires", async () => {
    const mine = await orientationPage.loader(args<ArgsOf<typeof orientationPage.loader>>(getRequest("/checkoffs/orientation"), preceptor));
    expect(mine.orientees.length).toBe(2);
    expect(mine.orientees[0].items.every((i) => i.dueOn)).toBe(true);
    const all = await orientationPage.loader(args<ArgsOf<typeof orientationPage.loader>>(getRequest("/checkoffs/orientation"), manager));
    const active = await db.db.select().from(orientationPlans).where(eq(orientationPlans.status, "active"));
    expect(all.all.length).toBe(active.filter((p) => p.orgId === manager.org.id).length);
    expect(all.all.length).toBe(3);
  });
});

describe("checklist versions", () => {
  it("an edit after use makes a new version, and past check-offs keep theirs", async () => {
    const record = (await getCheckoffRecord(therapist.org.id, checkoffId))!;
    const checklistId = record.checklist.id;
    const fields = {
      title: record.checklist.title,
      skill: record.checklist.skill,
      method: record.checklist.method,
      steps: ["! Confirms identity with two identifiers", "Checks the circuit", "! Runs the pre-use check"].join("\n"),
      references: "Local procedure RC-12.",
    };
    const refused = await outcome(checklistPage.action(args<ArgsOf<typeof checklistPage.action>>(postForm(`/checkoffs/checklists/${checklistId}`, fields), therapist, { checklistId })));
    expect(refused.status).toBe(403);
    const saved = await outcome(checklistPage.action(args<ArgsOf<typeof checklistPage.action>>(postForm(`/checkoffs/checklists/${checklistId}`, fields), educator, { checklistId })));
    expect(saved.status).toBe(302);
    const detail = await checklistPage.loader(args<ArgsOf<typeof checklistPage.loader>>(getRequest("/"), educator, { checklistId }));
    expect(detail.checklist.current?.version).toBe(record.checklist.version + 1);
    expect(detail.checklist.current?.steps).toEqual([
      { text: "Confirms identity with two identifiers", critical: true },
      { text: "Checks the circuit", critical: false },
      { text: "Runs the pre-use check", critical: true },
    ]);
    const [old] = await db.db.select().from(checkoffs).where(eq(checkoffs.id, checkoffId));
    expect(old.checklistVersionId).toBe(record.checklist.versionId);
  });
});

describe("starting check-offs and writing checklists", () => {
  it("a preceptor starts a check-off for a therapist at the bedside, never for themself", async () => {
    const { startCheckoffFor } = await import("~/db/queries/checkoffs-write.server");
    const { listPublishedChecklists } = await import("~/db/queries/checkoffs.server");
    const [checklist] = await listPublishedChecklists(preceptor.org.id);
    const started = await startCheckoffFor(preceptor, therapist.person.id, checklist.id);
    expect(started.ok).toBe(true);
    if (started.ok) {
      const [row] = await db.db.select().from(checkoffs).where(eq(checkoffs.id, started.value));
      expect(row).toMatchObject({ personId: therapist.person.id, preceptorId: preceptor.person.id, status: "in-progress", checklistVersionId: checklist.versionId });
    }
    expect(await startCheckoffFor(preceptor, preceptor.person.id, checklist.id)).toMatchObject({ ok: false, status: 403 });
    expect(await startCheckoffFor(therapist, preceptor.person.id, checklist.id)).toMatchObject({ ok: false, status: 403 });
  });

  it("an educator adds a checklist with critical steps; a therapist is refused", async () => {
    const checklists = await import("~/routes/checkoffs/checklists");
    const fields = { title: "Prone positioning with the ventilator", skill: "Prone positioning", method: "simulation", steps: "! Secures the airway\nPlans the turn with the team", references: "" };
    const denied = await outcome(checklists.action(args<ArgsOf<typeof checklists.action>>(postForm("/checkoffs/checklists", fields), therapist)));
    expect(denied.status).toBe(403);
    const added = await outcome(checklists.action(args<ArgsOf<typeof checklists.action>>(postForm("/checkoffs/checklists", fields), educator)));
    expect(added.status).toBe(302);
    const list = await checklists.loader(args<ArgsOf<typeof checklists.loader>>(getRequest("/checkoffs/checklists"), therapist));
    expect(list.checklists.find((c) => c.title === fields.title)).toMatchObject({ skill: "Prone positioning", version: 1, steps: 2, critical: 1, uses: 0 });
    const empty = await outcome(checklists.action(args<ArgsOf<typeof checklists.action>>(postForm("/checkoffs/checklists", { ...fields, steps: "  \n " }), educator)));
    expect(empty.status).toBe(400);
  });
});
