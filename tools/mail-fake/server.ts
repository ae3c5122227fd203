// `npm run mail:fake`: the local e-mail fake on 127.0.0.1, MAIL_FAKE_PORT (default 3001),
// keeping messages under DATA_DIR/outbox (default data/outbox). Settings come from the
// app's own reader so the app and the fake always agree on port and folder.
import { readEnv } from "../../app/config/env.server";
import { startMailFake } from "./mail-fake";

const settings = readEnv();
const fake = await startMailFake({ port: settings.mailFakePort, dataDir: settings.dataDir }).catch((error: NodeJS.ErrnoException) => {
  if (error.code !== "EADDRINUSE") throw error;
  console.error(`Port ${settings.mailFakePort} is already in use. Stop the other process or set MAIL_FAKE_PORT.`);
  process.exit(1);
});
console.log(`E-mail fake listening on ${fake.url} — messages: ${fake.url}/emails, files: ${settings.dataDir}/outbox`);

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.once(signal, () => {
    fake.close().then(() => process.exit(0), () => process.exit(1));
  });
}
