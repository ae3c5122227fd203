import { createHash } from "node:crypto";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import { and, eq } from "drizzle-orm";
import { env } from "~/config/env.server";
import { database, type Tx } from "~/db/client.server";
import { files } from "~/db/schema";
import { checkScan, EXTENSIONS, MAX_UPLOAD_BYTES, type ScanType } from "./file-type";

/**
 * Uploaded scans and evidence live under DATA_DIR/files/<org>/, outside public/, and are only
 * ever served through `fileResponse` by a route that has checked who may see them.
 */
function filesRoot() {
  return path.join(env().dataDir, "files");
}

/** Refuses an oversize body before it is read into memory (multipart overhead allowed for). */
export function bodyTooLarge(request: Request, limit = MAX_UPLOAD_BYTES + 256 * 1024): boolean {
  const length = Number(request.headers.get("Content-Length") ?? "0");
  return Number.isFinite(length) && length > limit;
}

/** The bytes of a form's file field, or null when none was chosen. */
export async function fileBytes(form: FormData, field: string): Promise<{ bytes: Uint8Array; name: string } | null> {
  const value = form.get(field);
  if (!value || typeof value === "string") return null;
  if (value.size === 0 && !value.name) return null;
  return { bytes: new Uint8Array(await value.arrayBuffer()), name: value.name };
}

export type StoredFile = typeof files.$inferSelect;
export type StoreResult = { ok: true; file: StoredFile } | { ok: false; message: string };

/**
 * Checks and stores a scan: the bytes go to disk first (written to a temporary name, then
 * renamed), then the row is inserted in the caller's transaction. A failed transaction leaves
 * at most an orphan file on disk, never a row pointing at nothing.
 */
export async function storeScan(
  tx: Tx,
  input: { orgId: string; ownerId: string | null; purpose: StoredFile["purpose"]; bytes: Uint8Array | null; originalName?: string },
): Promise<StoreResult> {
  const check = checkScan(input.bytes);
  if (!check.ok) return check;
  const bytes = input.bytes as Uint8Array;
  const id = crypto.randomUUID();
  const relative = path.join(input.orgId, `${id}.${EXTENSIONS[check.type]}`);
  const absolute = path.join(filesRoot(), relative);
  await mkdir(path.dirname(absolute), { recursive: true });
  await writeFile(`${absolute}.part`, bytes);
  await rename(`${absolute}.part`, absolute);
  const [file] = await tx
    .insert(files)
    .values({
      id,
      orgId: input.orgId,
      ownerId: input.ownerId,
      purpose: input.purpose,
      mimeType: check.type,
      sizeBytes: bytes.length,
      sha256: createHash("sha256").update(bytes).digest("hex"),
      storagePath: relative,
      originalName: input.originalName?.slice(0, 200) ?? null,
    })
    .returning();
  return { ok: true, file };
}

export async function findFile(orgId: string, fileId: string): Promise<StoredFile | null> {
  const { db } = await database();
  const [row] = await db.select().from(files).where(and(eq(files.orgId, orgId), eq(files.id, fileId))).limit(1);
  return row ?? null;
}

/**
 * The file as a download: its checked type, `Content-Disposition: attachment` and nosniff, so a
 * browser never renders an upload as a page. Call only after checking who may see it.
 */
export async function fileResponse(file: StoredFile, downloadName?: string): Promise<Response> {
  const bytes = await readFile(path.join(filesRoot(), file.storagePath));
  const name = (downloadName ?? file.originalName ?? `file.${EXTENSIONS[file.mimeType as ScanType] ?? "bin"}`).replace(/[^\w.\- ]+/g, "_");
  return new Response(bytes, {
    headers: {
      "Content-Type": file.mimeType,
      "Content-Length": String(bytes.length),
      "Content-Disposition": `attachment; filename="${name}"`,
      "X-Content-Type-Options": "nosniff",
      "Cache-Control": "private, no-store",
    },
  });
}
