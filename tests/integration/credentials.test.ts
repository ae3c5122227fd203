/**
 * /credentials: recording a card with its scan, refusing impossible input without losing what is
 * saved, a manager's verification (who, when, how), who may fetch a scan, and organisation isolation.
 */
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import type { Viewer } from "~/auth/context";
import { auditEvents, credentials, credentialTypes, people } from "~/db/schema";
import * as credentialsRoute from "~/routes/credentials/index";
import * as scanRoute from "~/routes/credentials/scan";
import { plan, useTodayPlanTeamWorld } from "./today-plan-team-harness";
import { args, getRequest, TEST_ORIGIN } from "../setup/request";

type LoaderArgs = Parameters<typeof credentialsRoute.loader>[0];
type ActionArgs = Parameters<typeof credentialsRoute.action>[0];
type ScanArgs = Parameters<typeof scanRoute.loader>[0];

const world = useTodayPlanTeamWorld();

const PDF = new TextEncoder().encode("%PDF-1.4\n1 0 obj\n<<>>\nendobj\n%%EOF\n");
const EXE = new Uint8Array([0x4d, 0x5a, 0x90, 0x00, 0x03, 0x00]);

function multipart(fields: Record<string, string>, scan?: { bytes: Uint8Array; name: string; type?: string }): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  if (scan) form.append("scan", new File([new Uint8Array(scan.bytes)], scan.name, { type: scan.type ?? "application/pdf" }));
  return new Request(new URL("/credentials", TEST_ORIGIN), { method: "POST", body: form, headers: { Origin: TEST_ORIGIN } });
}

/** Runs an action; a thrown redirect or error response comes back as the Response. */
async function act(viewer: Viewer, request: Request): Promise<{ status: number; body: unknown; location: string | null }> {
  try {
    const out = (await credentialsRoute.action(args<ActionArgs>(request, viewer))) as unknown as { data?: unknown; init?: { status?: number } };
    return { status: out.init?.status ?? 200, body: out.data, location: null };
  } catch (thrown) {
    if (thrown instanceof Response) return { status: thrown.status, body: null, location: thrown.headers.get("Location") };
    const t = thrown as { data?: unknown; init?: { status?: number } };
    if (t && typeof t === "object" && "init" in t) return { status: t.init?.status ?? 500, body: t.data, location: null };
    throw thrown;
  }
}

async function typeId(viewer: Viewer, code: string): Promise<string> {
  const [row] = await world.db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(and(eq(credentialTypes.orgId, viewer.org.id), eq(credentialTypes.code, code)));
  return row.id;
}

async function count(personId: string): Promise<number> {
  return (await world.db.db.select({ id: credentials.id }).from(credentials).where(eq(credentials.personId, personId))).length;
}

async function scanStatus(viewer: Viewer, credentialId: string): Promise<number> {
  try {
    const res = (await scanRoute.loader(args<ScanArgs>(getRequest(`/credentials/${credentialId}/scan`), viewer, { credentialId }))) as Response;
    return res.status;
  } catch (thrown) {
    const t = thrown as { init?: { status?: number }; status?: number };
    return t.init?.status ?? t.status ?? 500;
  }
}

function errorsOf(body: unknown): Record<string, string[]> {
  return ((body as { error?: Record<string, string[]> }).error ?? {}) as Record<string, string[]>;
}

describe("recording a credential", () => {
  it("saves a card with a PDF scan, proposes valid-through from the type's rule, and My plan shows it", async () => {
    const me = world.viewers.therapist;
    const bls = await typeId(me, "basic-life-support");
    const before = await count(me.person.id);
    const res = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: bls, number: "BLS-NEW-1", issuer: "Training centre", issuedOn: "2026-11-20" }, { bytes: PDF, name: "card.pdf" }));
    expect(res.status).toBe(302);
    expect(await count(me.person.id)).toBe(before + 1);
    const [saved] = await world.db.db.select().from(credentials).where(and(eq(credentials.personId, me.person.id), eq(credentials.number, "BLS-NEW-1")));
    // AHA "Course Card Information": two years through the end of the month of issue.
    expect(saved.validThrough).toBe("2028-11-30");
    expect(saved.scanFileId).not.toBeNull();
    const rows = (await plan(me)).rows;
    const row = rows.find((r) => r.title.startsWith("Basic life support"))!;
    expect(row).toMatchObject({ result: { status: "current", date: "2028-11-30" }, credential: { verified: false } });
    // Its holder may download the scan, as an attachment with nosniff.
    const resp = (await scanRoute.loader(args<ScanArgs>(getRequest(`/credentials/${saved.id}/scan`), me, { credentialId: saved.id }))) as Response;
    expect(resp.headers.get("Content-Disposition")).toMatch(/^attachment/);
    expect(resp.headers.get("X-Content-Type-Options")).toBe("nosniff");
  });

  it("keeps the card's own valid-through date when it differs from the rule", async () => {
    const me = world.viewers.therapist;
    const res = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: await typeId(me, "state-licence"), number: "RC-OWN", issuedOn: "2026-06-01", validThrough: "2028-05-31" }));
    expect(res.status).toBe(302);
    const [saved] = await world.db.db.select().from(credentials).where(eq(credentials.number, "RC-OWN"));
    expect(saved.validThrough).toBe("2028-05-31");
  });

  it.each([
    ["expiry before issue", { issuedOn: "2026-05-01", validThrough: "2026-04-30" }, "validThrough", /before the issue date/],
    ["31 February", { issuedOn: "2026-02-31" }, "issuedOn", /no such day/],
    ["an unknown type", { issuedOn: "2026-05-01", credentialTypeId: "no-such-type" }, "credentialTypeId", /not one of your organisation/],
  ] as const)("refuses %s with a clear message and saves nothing", async (_c, fields, field, message) => {
    const me = world.viewers.therapist;
    const before = await count(me.person.id);
    const res = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: await typeId(me, "basic-life-support"), number: "KEEP-ME", ...fields }));
    expect(res.status).toBe(400);
    expect(errorsOf(res.body)[field]?.join(" ")).toMatch(message);
    // What was typed comes back so nothing is lost.
    expect((res.body as { initialValue: Record<string, string> }).initialValue.number).toBe("KEEP-ME");
    expect(await count(me.person.id)).toBe(before);
  });

  it("refuses a renamed executable and an empty file, keeping every saved credential", async () => {
    const me = world.viewers.therapist;
    const bls = await typeId(me, "basic-life-support");
    const before = await count(me.person.id);
    const exe = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: bls, issuedOn: "2026-11-20" }, { bytes: EXE, name: "card.pdf" }));
    expect(exe.status).toBe(400);
    expect(errorsOf(exe.body).scan.join(" ")).toMatch(/not a PNG, JPEG or PDF/);
    const empty = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: bls, issuedOn: "2026-11-20" }, { bytes: new Uint8Array(), name: "card.png", type: "image/png" }));
    expect(empty.status).toBe(400);
    expect(errorsOf(empty.body).scan.join(" ")).toMatch(/empty/);
    expect(await count(me.person.id)).toBe(before);
  });

  it("refuses a scan just over 10 MB with the form's entries kept, and a far larger body before reading it", async () => {
    const me = world.viewers.therapist;
    const before = await count(me.person.id);
    const big = new Uint8Array(10 * 1024 * 1024 + 1);
    big.set(new TextEncoder().encode("%PDF-1.4\n"));
    const over = await act(me, multipart({ intent: "record-credential", personId: me.person.id, credentialTypeId: await typeId(me, "basic-life-support"), number: "KEEP-BIG", issuedOn: "2026-11-20" }, { bytes: big, name: "big.pdf" }));
    expect(over.status).toBe(400);
    expect(errorsOf(over.body).scan.join(" ")).toMatch(/larger than 10 MB/);
    expect((over.body as { initialValue: Record<string, string> }).initialValue.number).toBe("KEEP-BIG");
    expect(await count(me.person.id)).toBe(before);
    const req = new Request(new URL("/credentials", TEST_ORIGIN), { method: "POST", body: "x", headers: { Origin: TEST_ORIGIN, "Content-Length": String(30 * 1024 * 1024) } });
    const res = await act(me, req);
    expect(res.status).toBe(413);
    expect(errorsOf(res.body).scan.join(" ")).toMatch(/10 MB/);
  });

  it("a therapist cannot record a credential for someone else", async () => {
    const me = world.viewers.therapist;
    const other = world.viewers.preceptor;
    const res = await act(me, multipart({ intent: "record-credential", personId: other.person.id, credentialTypeId: await typeId(me, "basic-life-support"), issuedOn: "2026-11-20" }));
    expect(res.status).toBe(404);
  });
});

describe("a manager's verification and who may see a scan", () => {
  it("the manager records a card for a person on their unit; that person's colleague cannot fetch the scan; the manager verifies it (who, when, how)", async () => {
    const manager = world.viewers.manager;
    const holder = world.viewers.preceptor;
    const res = await act(manager, multipart({ intent: "record-credential", personId: holder.person.id, credentialTypeId: await typeId(manager, "advanced-cardiac-life-support"), number: "ACLS-MGR", issuedOn: "2026-10-03" }, { bytes: PDF, name: "acls.pdf" }));
    expect(res.status).toBe(302);
    const [saved] = await world.db.db.select().from(credentials).where(eq(credentials.number, "ACLS-MGR"));
    expect(saved.personId).toBe(holder.person.id);

    expect(await scanStatus(holder, saved.id)).toBe(200);
    expect(await scanStatus(manager, saved.id)).toBe(200);
    // Another therapist: not found (same answer as a scan that does not exist).
    expect(await scanStatus(world.viewers.therapist, saved.id)).toBe(404);
    // Another organisation's manager and admin: not found.
    expect(await scanStatus(world.viewers.abManager, saved.id)).toBe(404);

    const verify = await act(manager, multipart({ intent: "verify-credential", credentialId: saved.id, method: "Online lookup with the issuing body" }));
    expect(verify.status).toBe(302);
    const [after] = await world.db.db.select().from(credentials).where(eq(credentials.id, saved.id));
    expect(after).toMatchObject({ verifiedBy: manager.person.id, verificationMethod: "Online lookup with the issuing body" });
    expect(after.verifiedAt).toBeInstanceOf(Date);
    const events = await world.db.db.select().from(auditEvents).where(and(eq(auditEvents.entityId, saved.id), eq(auditEvents.action, "credential.verified")));
    expect(events).toHaveLength(1);
  });

  it("a therapist cannot verify, and another organisation's manager cannot verify or load ours", async () => {
    const [some] = await world.db.db.select({ id: credentials.id, personId: credentials.personId }).from(credentials).where(eq(credentials.orgId, world.viewers.manager.org.id)).limit(1);
    expect((await act(world.viewers.therapist, multipart({ intent: "verify-credential", credentialId: some.id, method: "Online lookup with the issuing body" }))).status).toBe(403);
    expect((await act(world.viewers.abManager, multipart({ intent: "verify-credential", credentialId: some.id, method: "Online lookup with the issuing body" }))).status).toBe(404);
    const load = async (viewer: Viewer, search: string) => {
      try {
        await credentialsRoute.loader(args<LoaderArgs>(getRequest(`/credentials${search}`), viewer));
        return 200;
      } catch (thrown) {
        return (thrown as { init?: { status?: number } }).init?.status ?? 500;
      }
    };
    expect(await load(world.viewers.abManager, `?person=${some.personId}`)).toBe(404);
    expect(await load(world.viewers.therapist, `?person=${some.personId === world.viewers.therapist.person.id ? world.viewers.preceptor.person.id : some.personId}`)).toBe(404);
    expect(await load(world.viewers.manager, `?person=${some.personId}`)).toBe(200);
  });

  it("the loader shows Alder Bay's people only their own credential types", async () => {
    const data = (await credentialsRoute.loader(args<LoaderArgs>(getRequest("/credentials"), world.viewers.abManager))) as Awaited<ReturnType<typeof credentialsRoute.loader>>;
    const ids = data.types.map((t) => t.id);
    const ours = await world.db.db.select({ id: credentialTypes.id }).from(credentialTypes).where(eq(credentialTypes.orgId, world.viewers.manager.org.id));
    expect(ids.some((id) => ours.some((o) => o.id === id))).toBe(false);
    const names = await world.db.db.select({ id: people.id }).from(people).where(eq(people.orgId, world.viewers.manager.org.id));
    expect(data.managed.some((p) => names.some((n) => n.id === p.id))).toBe(false);
  });
});
