/**
 * The production server as a child process of the bench: `node tests/bench/serve-child.mjs
 * <build>` (scripts/serve.mjs's startServer) started directly — one process, killable by its
 * PID (STACK.md "Background servers") — bound to loopback only, stopped with SIGTERM (SIGKILL
 * after a grace period), and ending by itself when the bench dies (its stdin closes).
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createWriteStream } from "node:fs";
import http from "node:http";
import net from "node:net";
import path from "node:path";

export type BenchServer = {
  pid: number;
  baseUrl: string;
  port: number;
  logFile: string;
  stop: () => Promise<void>;
};

export type HttpAnswer = { status: number; headers: http.IncomingHttpHeaders; body: string };

/** One GET without keep-alive, so no socket keeps the server from closing afterwards. */
export function httpGet(url: string, headers: Record<string, string> = {}, timeoutMs = 10_000): Promise<HttpAnswer> {
  return new Promise((resolve, reject) => {
    const request = http.get(url, { headers, agent: false, timeout: timeoutMs }, (response) => {
      let body = "";
      response.setEncoding("utf8");
      response.on("data", (chunk: string) => (body += chunk));
      response.on("end", () => resolve({ status: response.statusCode ?? 0, headers: response.headers, body }));
    });
    request.on("timeout", () => request.destroy(new Error(`GET ${url} timed out after ${timeoutMs} ms`)));
    request.on("error", reject);
  });
}

/** `preferred` when it is free on 127.0.0.1, otherwise a free port the system picks. */
export async function choosePort(preferred: number): Promise<number> {
  const tryListen = (port: number) =>
    new Promise<number | null>((resolve) => {
      const probe = net.createServer();
      probe.once("error", () => resolve(null));
      probe.listen(port, "127.0.0.1", () => {
        const address = probe.address();
        const chosen = typeof address === "object" && address ? address.port : null;
        probe.close(() => resolve(chosen));
      });
    });
  const free = await tryListen(preferred);
  if (free !== null) return free;
  const any = await tryListen(0);
  if (any === null) throw new Error("No free loopback port for the bench server.");
  return any;
}

function waitForExit(child: ChildProcess, ms: number): Promise<boolean> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(true);
  return new Promise((resolve) => {
    const timer = setTimeout(() => resolve(false), ms);
    child.once("exit", () => {
      clearTimeout(timer);
      resolve(true);
    });
  });
}

async function waitForHealth(baseUrl: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let last = "no answer yet";
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited with status ${child.exitCode} before /healthz answered.`);
    try {
      const answer = await httpGet(`${baseUrl}/healthz`, {}, 2000);
      if (answer.status === 200) return;
      last = `${answer.status} ${answer.body.slice(0, 200)}`;
    } catch (error) {
      last = error instanceof Error ? error.message : String(error);
    }
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`GET /healthz did not answer 200 within ${timeoutMs / 1000} s (last: ${last}).`);
}

export async function startBenchServer(options: {
  projectRoot: string;
  serverEntry: string;
  port: number;
  env: Record<string, string>;
  logFile: string;
}): Promise<BenchServer> {
  const log = createWriteStream(options.logFile, { flags: "w" });
  const child = spawn(process.execPath, [path.join(options.projectRoot, "tests", "bench", "serve-child.mjs"), options.serverEntry], {
    cwd: options.projectRoot,
    // Only what the server needs, plus PATH/HOME: nothing from the caller's shell leaks in.
    env: { PATH: process.env.PATH ?? "", HOME: process.env.HOME ?? "", ...options.env, PORT: String(options.port), HOST: "127.0.0.1" },
    // stdin stays open for the server's lifetime: its end tells the server the bench is gone.
    stdio: ["pipe", "pipe", "pipe"],
  });
  child.stdout?.pipe(log);
  child.stderr?.pipe(log);
  if (child.pid === undefined) throw new Error("The server process did not start.");
  const baseUrl = `http://127.0.0.1:${options.port}`;

  let stopped: Promise<void> | undefined;
  const stop = () => {
    stopped ??= (async () => {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill("SIGTERM");
        // serve-child.mjs closes the listener and exits once requests in flight finish.
        if (!(await waitForExit(child, 5000))) {
          child.kill("SIGKILL");
          await waitForExit(child, 2000);
        }
      }
      log.end();
    })();
    return stopped;
  };
  // Last resort when the bench itself dies: never leave the server behind.
  process.once("exit", () => {
    if (child.exitCode === null && child.signalCode === null) child.kill("SIGKILL");
  });

  try {
    await waitForHealth(baseUrl, child, 30_000);
  } catch (error) {
    await stop();
    throw error;
  }
  return { pid: child.pid, baseUrl, port: options.port, logFile: options.logFile, stop };
}
