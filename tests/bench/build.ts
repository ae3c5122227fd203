/**
 * A fresh production build of the current working tree, made in a folder of the bench's own.
 *
 * Why not build/: other sessions serve build/ (the browser suite's servers on 3100/3102,
 * `npm run demo`) while they work. Rebuilding it in place empties build/client, so their open
 * pages lose their hashed scripts mid-test; and their rebuilds would change what this run
 * measures. So the bench copies the sources git knows about (tracked and untracked, not
 * ignored — exactly what `react-router build` would see) to a temporary folder outside the
 * project (inside it, tsconfig's include pattern would make `tsc` type-check the copy), links
 * node_modules, and runs the same `react-router build` there, every run; the folder is removed
 * at the end. STACK.md measured about 3 s for the build on an idle machine, so the figures can
 * always describe the current code.
 */
import { spawn, spawnSync } from "node:child_process";
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync, symlinkSync } from "node:fs";
import os from "node:os";
import path from "node:path";

export type BenchBuild = {
  /** Root of the private copy; its build/ holds server/index.js and client/. */
  root: string;
  serverEntry: string;
  clientDir: string;
  files: number;
  buildMs: number;
  /** Deletes the temporary copy (safe to call twice). */
  remove: () => void;
};

/** Files git would hand to a fresh clone plus the ones not committed yet, minus ignored ones. */
function workingTreeFiles(projectRoot: string): string[] {
  const listed = spawnSync("git", ["ls-files", "-z", "--cached", "--others", "--exclude-standard"], { cwd: projectRoot, encoding: "utf8" });
  if (listed.status !== 0) throw new Error(`git ls-files failed: ${listed.stderr}`);
  return listed.stdout
    .split("\0")
    .filter(Boolean)
    // Deleted but still in the index: nothing to copy.
    .filter((file) => existsSync(path.join(projectRoot, file)) && statSync(path.join(projectRoot, file)).isFile());
}

function run(command: string, args: string[], cwd: string): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { cwd, env: { ...process.env, NODE_ENV: "production" }, stdio: ["ignore", "pipe", "pipe"] });
    let output = "";
    child.stdout.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.stderr.on("data", (chunk: Buffer) => (output += chunk.toString()));
    child.on("error", reject);
    child.on("close", (code) => resolve({ code, output }));
  });
}

const PREFIX = "tidemark-bench-";

const isAlive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
};

/** Copies left by a bench that was killed outright (its PID is in the folder's name). */
function removeStaleCopies(): void {
  for (const name of readdirSync(os.tmpdir())) {
    const pid = Number(/^tidemark-bench-(\d+)-/.exec(name)?.[1]);
    if (pid && pid !== process.pid && !isAlive(pid)) rmSync(path.join(os.tmpdir(), name), { recursive: true, force: true });
  }
}

export async function buildPrivateCopy(projectRoot: string): Promise<BenchBuild> {
  removeStaleCopies();
  const root = mkdtempSync(path.join(os.tmpdir(), `${PREFIX}${process.pid}-`));
  const remove = () => rmSync(root, { recursive: true, force: true });
  // Last resort when the bench dies before removing it.
  process.once("exit", remove);
  try {
    const files = workingTreeFiles(projectRoot);
    for (const file of files) {
      const target = path.join(root, file);
      mkdirSync(path.dirname(target), { recursive: true });
      cpSync(path.join(projectRoot, file), target);
    }
    symlinkSync(path.join(projectRoot, "node_modules"), path.join(root, "node_modules"), "dir");

    const started = performance.now();
    const result = await run(process.execPath, [path.join(projectRoot, "node_modules", "@react-router", "dev", "bin.js"), "build"], root);
    const buildMs = performance.now() - started;
    const serverEntry = path.join(root, "build", "server", "index.js");
    if (result.code !== 0 || !existsSync(serverEntry)) {
      const tail = result.output.trim().split("\n").slice(-25).join("\n");
      throw new Error(`react-router build failed (exit ${result.code}):\n${tail}`);
    }
    return { root, serverEntry, clientDir: path.join(root, "build", "client"), files: files.length, buildMs, remove };
  } catch (error) {
    remove();
    throw error;
  }
}
