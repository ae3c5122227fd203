/**
 * Tidemark's production server: react-router-serve's set-up (compression, immutable hashed
 * assets, the request handler), plus what it lacks:
 *   - first, the build's own security middleware (app/security/server.ts): a CSP nonce per
 *     request and the header set on every response, assets and errors included; an oversize
 *     body refused 413 before it is read;
 *   - the client's address, passed to the app in x-tidemark-client for per-client rate limits
 *     (any such header sent by a client is replaced). Behind a reverse proxy set TRUST_PROXY to
 *     the number of proxies in front (Express "trust proxy"): the address is then the one the
 *     outermost trusted proxy saw, taken from the right of X-Forwarded-For, which a client
 *     cannot forge.
 * Usage: node scripts/serve.mjs [build/server/index.js]
 */
import path from "node:path";
import url from "node:url";
import { createRequestHandler } from "@react-router/express";
import { mkdirSync } from "node:fs";
import { createClient } from "@libsql/client";
import compression from "compression";
import { drizzle } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import express from "express";

process.env.NODE_ENV = process.env.NODE_ENV ?? "production";

/** Applies the committed migrations before the first request is taken. */
export async function migrateDatabase(databaseUrl = process.env.DATABASE_URL ?? "file:./data/tidemark.db") {
  if (databaseUrl.startsWith("file:")) mkdirSync(path.dirname(path.resolve(databaseUrl.slice(5).split("?")[0])), { recursive: true });
  const client = createClient({ url: databaseUrl });
  await client.execute("PRAGMA journal_mode = WAL");
  await migrate(drizzle(client), { migrationsFolder: path.resolve(process.env.MIGRATIONS_DIR ?? "drizzle") });
  client.close();
}

/** TRUST_PROXY: how many reverse proxies stand in front (0, the default: none). */
function trustedProxies() {
  const raw = process.env.TRUST_PROXY ?? "0";
  const hops = Number(raw);
  if (!Number.isInteger(hops) || hops < 0) throw new Error(`TRUST_PROXY must be the number of proxies in front (0, 1, 2…), not "${raw}".`);
  return hops;
}

export async function startServer({ port = Number(process.env.PORT ?? 3000), host = process.env.HOST ?? "0.0.0.0", buildPath = "build/server/index.js" } = {}) {
  await migrateDatabase();
  const build = await import(url.pathToFileURL(path.resolve(buildPath)).href);
  const app = express();
  app.disable("x-powered-by");
  app.set("trust proxy", trustedProxies());
  const publicUrl = process.env.PUBLIC_URL ?? "";
  app.use(build.entry.module.securityMiddleware({ production: process.env.NODE_ENV === "production", https: publicUrl.startsWith("https:") }));
  app.use(compression());
  const clientDir = path.resolve(path.dirname(buildPath), "..", "client");
  app.use("/assets", express.static(path.join(clientDir, "assets"), { immutable: true, maxAge: "1y" }));
  app.use(express.static(clientDir, { maxAge: "1h" }));
  app.use((req, _res, next) => {
    req.headers["x-tidemark-client"] = req.ip ?? req.socket.remoteAddress ?? "unknown";
    next();
  });
  app.all("*", createRequestHandler({ build, mode: process.env.NODE_ENV }));
  return new Promise((resolve) => {
    const server = app.listen(port, host, () => resolve(server));
  });
}

if (import.meta.url === url.pathToFileURL(process.argv[1]).href) {
  const server = await startServer({ buildPath: process.argv[2] ?? "build/server/index.js" });
  const address = server.address();
  console.log(`Tidemark is listening on http://localhost:${typeof address === "object" && address ? address.port : ""}`);
  // SIGTERM: stop taking new connections, let requests in flight finish, then exit.
  // close() drops the keep-alive connections idle at that moment (Node ≥ 19) but not those that
  // become idle when their request ends, which would hold the process until keepAliveTimeout:
  // replies after the signal say Connection: close, and idle connections are closed every 50 ms
  // until the last request has ended (tests/faults/run.ts checks it under load).
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    server.prependListener("request", (_req, res) => res.setHeader("Connection", "close"));
    server.close(() => process.exit(0));
    server.closeIdleConnections();
    setInterval(() => server.closeIdleConnections(), 50).unref();
  };
  process.on("SIGTERM", stop);
  process.on("SIGINT", stop);
}
