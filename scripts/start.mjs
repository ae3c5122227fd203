/**
 * `npm start`: runs the production build (run `npm run build` first). Migrations run when the
 * app first opens its database, so a fresh file is ready on the first request.
 */
import { existsSync } from "node:fs";

if (!existsSync("build/server/index.js")) {
  console.error("No production build found. Run `npm run build` first.");
  process.exit(1);
}
await import("./serve.mjs").then(async (m) => {
  const server = await m.startServer();
  const address = server.address();
  console.log(`Tidemark is listening on http://localhost:${typeof address === "object" && address ? address.port : ""}`);
  const stop = () => server.close(() => process.exit(0));
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
});
