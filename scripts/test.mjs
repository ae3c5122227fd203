/**
 * `npm test`: the whole suite, in the order a reviewer trusts it — types, unit and integration
 * tests, the production build, the crash and durability run on that build (SIGKILL mid-write,
 * backup under load, SIGTERM under load), then the browser tests in Debian's chromium. Stops at the first
 * failing step and exits with its status. Installs what the tests need from Debian's packages
 * when it is missing and we are root — chromium (browser tests) and poppler-utils (pdftotext and
 * pdfinfo read our PDFs back) — otherwise prints the one command to run.
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

/** Debian packages the suite needs, each with a file that shows it is installed. */
const APT_NEEDS = [
  { pkg: "chromium", file: CHROMIUM, why: "the browser tests" },
  { pkg: "poppler-utils", file: "/usr/bin/pdftotext", why: "reading PDFs back in the tests" },
];

function ensureAptPackages() {
  const missing = APT_NEEDS.filter((n) => !existsSync(n.file));
  if (missing.length === 0) return;
  const names = missing.map((n) => n.pkg).join(" ");
  header(`Installing Debian's ${names} (needed by ${missing.map((n) => n.why).join(" and ")})`);
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot) {
    console.error(`${missing.map((n) => n.file).join(", ")} missing. Install once, then run npm test again:\n\n  sudo apt-get update && sudo apt-get install -y ${names}\n`);
    process.exit(1);
  }
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  run("apt-get update", "apt-get", ["update"], { env });
  run(`apt-get install ${names}`, "apt-get", ["install", "-y", ...missing.map((n) => n.pkg)], { env });
  const still = missing.filter((n) => !existsSync(n.file));
  if (still.length > 0) {
    console.error(`apt-get finished but ${still.map((n) => n.file).join(", ")} is still missing.`);
    process.exit(1);
  }
}

ensureAptPackages();
run("Typecheck (react-router typegen + tsc)", "npm", ["run", "typecheck"]);
run("Unit and integration tests (vitest)", bin("vitest"), ["run"]);
run("Production build (react-router build)", bin("react-router"), ["build"]);
run("Crash and durability (npm run test:faults)", "npm", ["run", "test:faults", "--", "--build", "build"]);
run("Browser tests (Playwright, Debian's chromium)", bin("playwright"), ["test"]);
header("All checks passed");
