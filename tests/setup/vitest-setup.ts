/**
 * Vitest set-up for every test file: fixed secrets (no files written), a private data folder,
 * and an unexpected console.error fails the test (STYLE.md).
 */
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterEach, beforeEach, vi } from "vitest";

process.env.SESSION_SECRET ??= "test-session-secret-0123456789abcdef";
process.env.TOTP_SECRET ??= "a".repeat(64);
process.env.DATA_DIR ??= mkdtempSync(path.join(tmpdir(), "tidemark-test-data-"));
process.env.RESEND_API_KEY ??= "re_test_key";

let errors: unknown[][] = [];
beforeEach(() => {
  errors = [];
  vi.spyOn(console, "error").mockImplementation((...args: unknown[]) => {
    errors.push(args);
  });
});
afterEach(() => {
  vi.mocked(console.error).mockRestore();
  if (errors.length > 0) {
    const first = errors[0].map((a) => (a instanceof Error ? a.stack : String(a))).join(" ");
    throw new Error(`Unexpected console.error during the test: ${first}`);
  }
});
