import { existsSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { files, organisations } from "~/db/schema";
import { fileResponse, findFile, storeScan } from "~/files/store.server";
import { useEmptyDatabase } from "../setup/db";

let db: Database;
let orgId: string;
beforeAll(async () => {
  db = await useEmptyDatabase();
  orgId = await db.write(async (tx) => (await tx.insert(organisations).values({ name: "Files Org", slug: "files-org" }).returning())[0].id);
});

const PDF = new TextEncoder().encode("%PDF-1.4\n1 0 obj\n<<>>\nendobj\n%%EOF\n");

describe("stored scans", () => {
  it("stores a checked file outside public/ and serves it as an attachment with nosniff", async () => {
    const result = await db.write((tx) => storeScan(tx, { orgId, ownerId: null, purpose: "credential-scan", bytes: PDF, originalName: "card <1>.pdf" }));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const onDisk = path.join(process.env.DATA_DIR!, "files", result.file.storagePath);
    expect(existsSync(onDisk)).toBe(true);
    expect(onDisk).not.toContain(`${path.sep}public${path.sep}`);
    const res = await fileResponse((await findFile(orgId, result.file.id))!);
    expect(res.headers.get("Content-Type")).toBe("application/pdf");
    expect(res.headers.get("Content-Disposition")).toBe('attachment; filename="card _1_.pdf"');
    expect(res.headers.get("X-Content-Type-Options")).toBe("nosniff");
    expect(new Uint8Array(await res.arrayBuffer())).toEqual(PDF);
  });

  it("refuses a renamed executable and writes no row", async () => {
    const before = (await db.db.select().from(files)).length;
    const result = await db.write((tx) =>
      storeScan(tx, { orgId, ownerId: null, purpose: "credential-scan", bytes: new Uint8Array([0x4d, 0x5a, 0x90, 0]), originalName: "card.pdf" }),
    );
    expect(result).toMatchObject({ ok: false });
    expect((await db.db.select().from(files)).length).toBe(before);
  });

  it("finds a file only within its own organisation", async () => {
    const result = await db.write((tx) => storeScan(tx, { orgId, ownerId: null, purpose: "other", bytes: PDF }));
    if (!result.ok) throw new Error("store failed");
    expect(await findFile("another-org", result.file.id)).toBeNull();
  });
});
