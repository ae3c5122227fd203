import { defineConfig, devices } from "@playwright/test";
import { APP_URL, MAIL_PORT, MAIL_URL, SHORT_TTL_PORT, SHORT_TTL_SECONDS, SHORT_TTL_URL, APP_PORT, E2E_DATA_DIR, appServerEnv } from "./tests/fixtures/e2e-env";

/**
 * Browser tests: Debian's chromium (never a downloaded browser) against the production build
 * with its own fresh database and e-mail fake. `npm test` builds first; `npm run test:e2e`
 * expects a current build/.
 *
 * Servers start one after another in this order (Playwright runs them as sequential set-up
 * tasks, each waiting for its URL): the main app first, because its command wipes and seeds
 * data/e2e (the outbox folder included) before serving; then the e-mail fake, whose outbox is
 * that fresh folder; then the short-lived-code server on the same, already migrated database.
 */
const tsx = "node_modules/.bin/tsx";
const shutdown = { signal: "SIGTERM" as const, timeout: 5_000 };

export default defineConfig({
  testDir: "tests/e2e",
  // Two cores here: the app, the fake and two browsers share them. Files run in parallel,
  // tests within a file in order.
  workers: 2,
  fullyParallel: false,
  retries: 0,
  forbidOnly: !!process.env.CI,
  reporter: "list",
  timeout: 30_000,
  expect: { timeout: 7_000 },
  use: {
    baseURL: APP_URL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      // Without the networking flags Chromium floods the closed network (shared/STACK.md).
      args: [
        "--headless",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
      ],
    },
  },
  projects: [{ name: "chromium", use: { ...devices["Desktop Chrome"] } }],
  webServer: [
    {
      name: "app",
      command: `${tsx} tests/fixtures/e2e-prepare.ts && node scripts/serve.mjs`,
      url: `${APP_URL}/healthz`,
      env: appServerEnv(APP_PORT),
      timeout: 180_000,
      reuseExistingServer: false,
      stdout: "ignore",
      stderr: "pipe",
      gracefulShutdown: shutdown,
    },
    {
      name: "mail",
      command: `${tsx} tools/mail-fake/server.ts`,
      url: `${MAIL_URL}/emails`,
      env: { ...appServerEnv(APP_PORT), MAIL_FAKE_PORT: String(MAIL_PORT), DATA_DIR: E2E_DATA_DIR },
      timeout: 60_000,
      reuseExistingServer: false,
      stdout: "ignore",
      stderr: "pipe",
      gracefulShutdown: shutdown,
    },
    {
      name: "app-short-codes",
      command: "node scripts/serve.mjs",
      url: `${SHORT_TTL_URL}/healthz`,
      env: appServerEnv(SHORT_TTL_PORT, { SIGN_IN_CODE_TTL_SECONDS: String(SHORT_TTL_SECONDS) }),
      timeout: 60_000,
      reuseExistingServer: false,
      stdout: "ignore",
      stderr: "pipe",
      gracefulShutdown: shutdown,
    },
  ],
});
