/**
 * `npm run db:seed [-- --people N] [-- --today YYYY-MM-DD]`: migrates DATABASE_URL (default
 * file:./data/tidemark.db) and builds the demo scenario in it. Running it again with the same
 * flags leaves the same database.
 */
import path from "node:path";
import { parseArgs } from "node:util";
import { openDatabase } from "../app/db/client.server";
import { isIsoDate } from "./calendar";
import { KV_MIN_PEOPLE } from "./kestrel-valley";
import { defaultSeedDate, seed, type SeedSummary } from "./seed";

const USAGE = `Usage: npm run db:seed -- [--people N] [--today YYYY-MM-DD]
  --people N           build Kestrel Valley with N people (at least ${KV_MIN_PEOPLE}; default 42), same role mix
  --today YYYY-MM-DD   the demo day statuses are relative to (default: today in America/Chicago)`;

function fail(message: string): never {
  console.error(`${message}\n${USAGE}`);
  process.exit(2);
}

function parseOptions(argv: string[]): { people?: number; today: string } {
  let values: { people?: string; today?: string; help?: boolean };
  try {
    ({ values } = parseArgs({ args: argv, options: { people: { type: "string" }, today: { type: "string" }, help: { type: "boolean", short: "h" } } }));
  } catch (error) {
    fail(error instanceof Error ? error.message : String(error));
  }
  if (values.help) {
    console.log(USAGE);
    process.exit(0);
  }
  const today = values.today ?? defaultSeedDate();
  if (!isIsoDate(today)) fail(`--today must be a real date written YYYY-MM-DD, got "${today}".`);
  if (values.people === undefined) return { today };
  const people = Number(values.people);
  if (!Number.isInteger(people) || people < KV_MIN_PEOPLE) fail(`--people must be a whole number of at least ${KV_MIN_PEOPLE}, got "${values.people}".`);
  return { people, today };
}

const count = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function printSummary(url: string, summary: SeedSummary, ms: number): void {
  console.log(`Seeded ${url} for ${summary.today} in ${(ms / 1000).toFixed(1)} s.`);
  for (const org of summary.organisations) {
    const r = org.roles;
    const c = org.credentialStatus;
    console.log(
      `  ${org.name}: ${count(org.rows.people, "person", "people")} (${count(r.therapist, "therapist")}, ${count(r.preceptor, "preceptor")}, ${count(r.educator, "educator")}, ${count(r.manager, "manager")}, ${count(r.admin, "admin")}), ` +
        `${count(org.rows.units, "unit")}, ${count(org.rows.credentials, "credential")} (${c.current} current, ${c["due-soon"]} due soon, ${c.lapsed} lapsed), ` +
        `${count(org.rows.waivers, "waiver")}, ${count(org.rows.assignments, "assignment")}, ${count(org.rows.orientationPlans, "orientation plan")}` +
        (org.audited ? "; audit event recorded" : "; unchanged since the last seed"),
    );
  }
  console.log("Demo accounts (sign in with the e-mailed code):");
  for (const a of summary.demoAccounts) console.log(`  ${a.email.padEnd(32)} ${a.name} — ${a.roles.join(", ")}`);
  console.log("  admin@alderbay.test              Alder Bay Hospital — admin (a separate organisation; it has every role)");
}

const options = parseOptions(process.argv.slice(2));
const url = process.env.DATABASE_URL ?? "file:./data/tidemark.db";
const started = performance.now();
const database = await openDatabase(url);
try {
  // Uploads live in DATA_DIR/files, as app/files/store.server.ts keeps them.
  const filesDir = path.join(path.resolve(process.env.DATA_DIR ?? "data"), "files");
  const summary = await seed(database, { ...options, filesDir });
  printSummary(url, summary, performance.now() - started);
} finally {
  database.close();
}
