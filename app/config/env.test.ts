import { existsSync, mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { readEnv } from "./env.server";

const dir = () => mkdtempSync(path.join(tmpdir(), "tidemark-env-"));

describe("settings", () => {
  it("production without demo mode refuses to start without its secrets", () => {
    expect(() => readEnv({ NODE_ENV: "production", DATA_DIR: dir() })).toThrow(/SESSION_SECRET and TOTP_SECRET must be set/);
  });

  it("demo mode creates its secrets under the data folder once and keeps them", () => {
    const dataDir = dir();
    const first = readEnv({ NODE_ENV: "production", TIDEMARK_DEMO: "1", DATA_DIR: dataDir });
    expect(existsSync(path.join(dataDir, "secrets.json"))).toBe(true);
    expect(first.totpSecret).toMatch(/^[0-9a-f]{64}$/);
    const second = readEnv({ NODE_ENV: "production", TIDEMARK_DEMO: "1", DATA_DIR: dataDir });
    expect(second.sessionSecret).toBe(first.sessionSecret);
    expect(JSON.parse(readFileSync(path.join(dataDir, "secrets.json"), "utf8")).sessionSecret).toBe(first.sessionSecret);
  });

  it("refuses a TOTP secret that is not 64 hex characters, and a code lifetime over 10 minutes", () => {
    expect(() => readEnv({ SESSION_SECRET: "x", TOTP_SECRET: "abc", DATA_DIR: dir() })).toThrow(/64 hex/);
    expect(() => readEnv({ SESSION_SECRET: "x", TOTP_SECRET: "a".repeat(64), SIGN_IN_CODE_TTL_SECONDS: "601", DATA_DIR: dir() })).toThrow(/600/);
  });

  it("defaults: the embedded database file, the local e-mail fake on 3001", () => {
    const e = readEnv({ SESSION_SECRET: "x", TOTP_SECRET: "a".repeat(64), DATA_DIR: dir() });
    expect(e.databaseUrl).toBe("file:./data/tidemark.db");
    expect(e.resendBaseUrl).toBe("http://127.0.0.1:3001");
    expect(e.signInCodeTtlSeconds).toBe(600);
    expect(readEnv({ SESSION_SECRET: "x", TOTP_SECRET: "a".repeat(64), MAIL_FAKE_PORT: "4001", DATA_DIR: dir() }).resendBaseUrl).toBe("http://127.0.0.1:4001");
  });
});
