/**
 * `npm run demo`: migrates, seeds the invented Kestrel Valley scenario, builds, and starts the
 * production build in demo mode on http://localhost:3000 (PORT overrides) together with the
 * local e-mail fake, whose messages the Outbox page shows.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";

process.env.NODE_ENV = "production";
process.env.TIDEMARK_DEMO = "1";
const port = Number(process.env.PORT ?? 3000);
const mailPort = Number(process.env.MAIL_FAKE_PORT ?? 3001);
process.env.RESEND_BASE_URL ??= `http://127.0.0.1:${mailPort}`;
process.env.PUBLIC_URL ??= `http://localhost:${port}`;

function run(step: string, command: string, args: string[]) {
  console.log(`\n▸ ${step}`);
  const result = spawnSync(command, args, { stdio: "inherit", env: process.env });
  if (result.status !== 0) {
    console.error(`✗ ${step} failed (exit ${result.status}).`);
    process.exit(result.status ?? 1);
  }
}

const bin = (name: string) => path.resolve("node_modules/.bin", name);
run("Seeding the demo organisations (migrations first)", bin("tsx"), ["seeds/run.ts"]);
if (!process.argv.includes("--no-build")) run("Building the production bundle", bin("react-router"), ["build"]);

const { startMailFake } = await import("../tools/mail-fake/mail-fake");
const mail = await startMailFake({ port: mailPort, dataDir: path.resolve(process.env.DATA_DIR ?? "data") });
// @ts-expect-error plain JavaScript module without types
const { startServer } = await import("./serve.mjs");
const server = await startServer({ port });

console.log(`
Tidemark demo is running: http://localhost:${port}
Demo outbox (sign-in codes): http://localhost:${port}/dev/outbox   (e-mail fake API: ${mail.url}/emails)

Sign in with any of these addresses; the code arrives in the outbox:
  therapist@kestrelvalley.test   therapist
  preceptor@kestrelvalley.test   therapist, preceptor
  educator@kestrelvalley.test    educator
  manager@kestrelvalley.test     manager
  admin@kestrelvalley.test       admin
  admin@alderbay.test            admin of the second organisation (Alder Bay Hospital)

Educational use only: follow the device's instructions for use, local policy and licensed clinical judgement.
Press Ctrl+C to stop.`);

const stop = () => {
  server.close(() => {
    void mail.close();
    process.exit(0);
  });
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
