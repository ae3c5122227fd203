/**
 * Seeded credential scans: a one-page PDF per scan, its `files` row (as storeScan writes it:
 * checked type, size, SHA-256, a path under the organisation's folder) and the credential
 * pointing at it. The bytes are derived from the row alone, so the seed stays deterministic and
 * `writeSeededFiles` can put them on disk (DATA_DIR/files/…) after the database is written.
 */
import { createHash } from "node:crypto";
import { mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import type { OrgContext } from "./catalogue";
import type { Dataset } from "./dataset";

/**
 * A minimal one-page PDF with one line of text: header, four objects, a cross-reference table
 * with each object's byte offset, and the trailer (ISO 32000-1:2008, §7.5 "File Structure").
 */
export function seededScanPdf(line: string): Uint8Array {
  const text = line.replace(/[^\x20-\x7e]/g, "?").replace(/([\\()])/g, "\\$1");
  const stream = `BT /F1 14 Tf 72 720 Td (${text}) Tj ET`;
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
    `<< /Length ${stream.length} >>\nstream\n${stream}\nendstream`,
    "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
  ];
  let body = "%PDF-1.4\n";
  const offsets: number[] = [];
  objects.forEach((object, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${object}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, "0")} 00000 n \n`).join("")}`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return new TextEncoder().encode(body);
}

/** The line printed on a seeded scan: made from the stored name, so the bytes follow from the row. */
const lineOf = (originalName: string) => `Demo scan: ${originalName}`;

/** Attaches a seeded scan to a credential already in the dataset. */
export function addSeededScan(ctx: OrgContext, credentialId: string, label: string): void {
  const credential = ctx.data.credentials.find((c) => c.id === credentialId);
  if (!credential) throw new Error(`no seeded credential ${credentialId} to attach a scan to`);
  const id = ctx.id("file", "scan", credentialId);
  const originalName = `${label}.pdf`;
  const bytes = seededScanPdf(lineOf(originalName));
  ctx.data.files.push({
    id,
    orgId: ctx.orgId,
    ownerId: credential.personId,
    purpose: "credential-scan",
    mimeType: "application/pdf",
    sizeBytes: bytes.length,
    sha256: createHash("sha256").update(bytes).digest("hex"),
    storagePath: path.join(ctx.orgId, `${id}.pdf`),
    originalName,
    createdAt: credential.createdAt,
  });
  credential.scanFileId = id;
}

/** Writes the seeded scans' bytes under `filesDir` (DATA_DIR/files), where fileResponse reads them. */
export async function writeSeededFiles(filesDir: string, datasets: readonly Dataset[]): Promise<number> {
  let written = 0;
  for (const data of datasets) {
    for (const file of data.files) {
      if (file.purpose !== "credential-scan" || !file.originalName) continue;
      const absolute = path.join(filesDir, file.storagePath);
      await mkdir(path.dirname(absolute), { recursive: true });
      await writeFile(absolute, seededScanPdf(lineOf(file.originalName)));
      written += 1;
    }
  }
  return written;
}
