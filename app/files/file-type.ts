/**
 * What a file really is, from its first bytes (its "magic number"), never from its name or the
 * type the browser claims (OWASP ASVS 4.0.3 V12.1, V12.2). Pure: runs anywhere.
 * Signatures: PNG, ISO/IEC 15948 (the 8-byte signature 89 50 4E 47 0D 0A 1A 0A); JPEG, ITU-T T.81
 * (SOI marker FF D8 followed by another marker FF); PDF, ISO 32000 ("%PDF-" header).
 */
export const SCAN_TYPES = ["image/png", "image/jpeg", "application/pdf"] as const;
export type ScanType = (typeof SCAN_TYPES)[number];

export const EXTENSIONS: Record<ScanType, string> = {
  "image/png": "png",
  "image/jpeg": "jpg",
  "application/pdf": "pdf",
};

const startsWith = (bytes: Uint8Array, signature: readonly number[]) =>
  bytes.length >= signature.length && signature.every((b, i) => bytes[i] === b);

export function sniffScanType(bytes: Uint8Array): ScanType | null {
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "image/png";
  if (startsWith(bytes, [0xff, 0xd8, 0xff])) return "image/jpeg";
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46, 0x2d])) return "application/pdf";
  return null;
}

export const MAX_UPLOAD_BYTES = 10 * 1024 * 1024;

export type UploadCheck = { ok: true; type: ScanType } | { ok: false; message: string };

/** The one check every scan or evidence upload passes: present, not empty, ≤ 10 MB, PNG/JPEG/PDF by content. */
export function checkScan(bytes: Uint8Array | null, name = "The file"): UploadCheck {
  if (!bytes) return { ok: false, message: "Choose a file to upload." };
  if (bytes.length === 0) return { ok: false, message: `${name} is empty. Choose the scan or photo again.` };
  if (bytes.length > MAX_UPLOAD_BYTES) {
    const mb = (bytes.length / 1024 / 1024).toFixed(1);
    return { ok: false, message: `${name} is ${mb} MB; the limit is 10 MB. Scan at a lower resolution or as a PDF.` };
  }
  const type = sniffScanType(bytes);
  if (!type) return { ok: false, message: `${name} is not a PNG, JPEG or PDF (checked by its content, not its name).` };
  return { ok: true, type };
}
