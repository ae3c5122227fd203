/**
 * The bench's production server: scripts/serve.mjs's own startServer (the same middleware,
 * migrations and request handler as `npm start`), plus one thing the bench needs — it exits
 * when its parent goes away. The bench holds this process's stdin; if the bench is killed
 * outright (SIGKILL, or tsx's forced kill on a double Ctrl-C) the pipe closes and the server
 * ends too, so no server is ever left behind on the port.
 * Usage (by tests/bench/server.ts): node tests/bench/serve-child.mjs <build/server/index.js>
 */
import { startServer } from "../../scripts/serve.mjs";

const server = await startServer({ port: Number(process.env.PORT), host: "127.0.0.1", buildPath: process.argv[2] });
console.log(`Tidemark (bench) is listening on http://127.0.0.1:${process.env.PORT}`);

let stopping = false;
const stop = () => {
  if (stopping) return;
  stopping = true;
  // Requests in flight finish; idle keep-alive sockets are closed by close() on Node ≥ 19.
  server.close(() => process.exit(0));
  setTimeout(() => process.exit(0), 3000).unref();
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
process.stdin.on("end", stop);
process.stdin.on("close", stop);
process.stdin.resume();
