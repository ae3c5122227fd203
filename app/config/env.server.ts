import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";

/**
 * Every setting Tidemark reads from the environment, with its default. README's
 * "Configuration" table lists the same names; keep them in step.
 */
export type Env = {
  production: boolean;
  demoMode: boolean;
  databaseUrl: string;
  dataDir: string;
  sessionSecret: string;
  /** 64 hex characters, as the one-time-code strategy requires. */
  totpSecret: string;
  /** Lifetime of an e-mailed sign-in code, seconds (10 minutes at most). */
  signInCodeTtlSeconds: number;
  sessionDays: number;
  mailTransport: "resend" | "smtp";
  resendApiKey: string;
  resendBaseUrl: string;
  smtpUrl: string;
  mailFrom: string;
  mailFakePort: number;
  publicUrl: string;
};

type Secrets = { sessionSecret: string; totpSecret: string };

function loadOrCreateSecrets(dataDir: string): Secrets {
  const file = path.join(dataDir, "secrets.json");
  if (existsSync(file)) return JSON.parse(readFileSync(file, "utf8")) as Secrets;
  mkdirSync(dataDir, { recursive: true });
  const secrets: Secrets = {
    sessionSecret: randomBytes(32).toString("hex"),
    totpSecret: randomBytes(32).toString("hex"),
  };
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const production = source.NODE_ENV === "production";
  const demoMode = source.TIDEMARK_DEMO === "1" || source.TIDEMARK_DEMO === "true";
  const dataDir = path.resolve(source.DATA_DIR ?? "data");
  let sessionSecret = source.SESSION_SECRET ?? "";
  let totpSecret = source.TOTP_SECRET ?? "";
  if (!sessionSecret || !totpSecret) {
    if (production && !demoMode) {
      throw new Error(
        "SESSION_SECRET and TOTP_SECRET must be set in production (TOTP_SECRET: 64 hex characters). " +
          "Demo mode (TIDEMARK_DEMO=1) creates and keeps its own under data/.",
      );
    }
    const secrets = loadOrCreateSecrets(dataDir);
    sessionSecret ||= secrets.sessionSecret;
    totpSecret ||= secrets.totpSecret;
  }
  if (!/^[0-9a-f]{64}$/i.test(totpSecret)) throw new Error("TOTP_SECRET must be exactly 64 hex characters.");
  const ttl = Number(source.SIGN_IN_CODE_TTL_SECONDS ?? 600);
  if (!Number.isFinite(ttl) || ttl < 1 || ttl > 600) {
    throw new Error("SIGN_IN_CODE_TTL_SECONDS must be between 1 and 600 (codes live 10 minutes at most).");
  }
  const mailFakePort = Number(source.MAIL_FAKE_PORT ?? 3001);
  const port = Number(source.PORT ?? 3000);
  return {
    production,
    demoMode,
    databaseUrl: source.DATABASE_URL ?? "file:./data/tidemark.db",
    dataDir,
    sessionSecret,
    totpSecret: totpSecret.toLowerCase(),
    signInCodeTtlSeconds: ttl,
    sessionDays: Number(source.SESSION_DAYS ?? 7),
    mailTransport: source.MAIL_TRANSPORT === "smtp" ? "smtp" : "resend",
    resendApiKey: source.RESEND_API_KEY ?? "re_local_fake_key",
    resendBaseUrl: source.RESEND_BASE_URL ?? `http://127.0.0.1:${mailFakePort}`,
    smtpUrl: source.SMTP_URL ?? "smtp://127.0.0.1:2525",
    mailFrom: source.MAIL_FROM ?? "Tidemark <no-reply@tidemark.test>",
    mailFakePort,
    publicUrl: (source.PUBLIC_URL ?? `http://localhost:${port}`).replace(/\/$/, ""),
  };
}

let cached: Env | undefined;
/** The process's settings, read once. Tests call `readEnv` with their own values instead. */
export function env(): Env {
  cached ??= readEnv();
  return cached;
}
