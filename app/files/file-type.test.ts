import { describe, expect, it } from "vitest";
import { checkScan, MAX_UPLOAD_BYTES, sniffScanType } from "./file-type";

const bytes = (...b: number[]) => new Uint8Array(b);
// Real file headers: PNG signature (ISO/IEC 15948), JPEG SOI + APP0 (ITU-T T.81), PDF header (ISO 32000).
const PNG = bytes(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13);
const JPEG = bytes(0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46, 0x49, 0x46);
const PDF = new TextEncoder().encode("%PDF-1.7\n%âãÏÓ\n");
// An ELF executable and a Windows executable renamed to .png: refused by content.
const ELF = bytes(0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0);
const EXE = bytes(0x4d, 0x5a, 0x90, 0, 3, 0, 0, 0);

describe("uploads are judged by content", () => {
  it.each([
    ["PNG", PNG, "image/png"],
    ["JPEG", JPEG, "image/jpeg"],
    ["PDF", PDF, "application/pdf"],
  ] as const)("recognises a %s by its signature", (_, data, type) => {
    expect(sniffScanType(data)).toBe(type);
    expect(checkScan(data)).toEqual({ ok: true, type });
  });

  it("refuses executables whatever their name, with a message saying why", () => {
    for (const data of [ELF, EXE]) {
      const result = checkScan(data, "card.png");
      expect(result).toEqual({ ok: false, message: "card.png is not a PNG, JPEG or PDF (checked by its content, not its name)." });
    }
  });

  it("refuses an empty file and a missing one", () => {
    expect(checkScan(new Uint8Array(0))).toMatchObject({ ok: false, message: expect.stringMatching(/empty/) });
    expect(checkScan(null)).toMatchObject({ ok: false, message: "Choose a file to upload." });
  });

  it("accepts exactly 10 MB and refuses one byte more", () => {
    const atLimit = new Uint8Array(MAX_UPLOAD_BYTES);
    atLimit.set(PDF);
    expect(checkScan(atLimit).ok).toBe(true);
    const over = new Uint8Array(MAX_UPLOAD_BYTES + 1);
    over.set(PDF);
    expect(checkScan(over)).toMatchObject({ ok: false, message: expect.stringMatching(/limit is 10 MB/) });
  });

  it("a truncated signature is not enough", () => {
    expect(sniffScanType(PNG.slice(0, 4))).toBeNull();
  });
});
