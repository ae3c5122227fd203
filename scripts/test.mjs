/**
 * `npm test`: the whole suite, in the order a reviewer trusts it — types, unit and integration
 * tests, the production build, then the browser tests in Debian's chromium. Stops at the first
 * failing step and exits with its status. Installs chromium from apt when it is missing and
 * we are root; otherwise prints the one command to run.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import path from "node:path";

const CHROMIUM = "/usr/bin/chromium";
const bin = (name) => path.resolve("node_modules/.bin", name);

function header(title) {
  const line = "═".repeat(Math.max(60, title.length + 4));
  console.log(`\n${line}\n  ${title}\n${line}`);
}

function run(title, command, args, options = {}) {
  header(title);
  const started = Date.now();
  const result = spawnSync(command, args, { stdio: "inherit", ...options });
  const status = result.status ?? (result.signal ? 1 : 0);
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (result.error) console.error(`✗ ${title}: could not start ${command}: ${result.error.message}`);
  if (status !== 0 || result.error) {
    console.error(`\n✗ ${title} failed (exit ${status}${result.signal ? `, signal ${result.signal}` : ""}) after ${seconds} s.`);
    process.exit(status || 1);
  }
  console.log(`✓ ${title} (${seconds} s)`);
}

function ensureChromium() {
  if (existsSync(CHROMIUM)) return;
  header("Installing Debian's chromium (needed by the browser tests)");
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot) {
    console.error(`${CHROMIUM} is missing. Install it once, then run npm test again:\n\n  sudo apt-get update && sudo apt-get install -y chromium\n`);
    process.exit(1);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  run("apt-get update", "apt-get", ["update"], { env });
  run("apt-get install chromium", "apt-get", ["install", "-y", "chromium"], { env });
  if (!existsSync(CHROMIUM)) {
    console.error(`apt-get finished but ${CHROMIUM} is still missing.`);
    process.exit(1);
  }
}

ensureChromium();
run("Typecheck (react-router typegen + tsc)", "npm", ["run", "typecheck"]);
run("Unit and integration tests (vitest)", bin("vitest"), ["run"]);
run("Production build (react-router build)", bin("react-router"), ["build"]);
run("Browser tests (Playwright, Debian's chromium)", bin("playwright"), ["test"]);
header("All checks passed");
