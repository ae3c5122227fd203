import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { migrate } from "drizzle-orm/libsql/migrator";
import { mkdirSync } from "node:fs";
import path from "node:path";
import * as schema from "./schema";

export type Db = LibSQLDatabase<typeof schema>;
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
/** Either the database or an open transaction: read helpers accept both. */
export type DbOrTx = Db | Tx;

/** Busy timeout for every pooled connection (libSQL's `timeout` option applies it per connection). */
const BUSY_TIMEOUT_MS = 5000;

/** See `createWriter`: `quiet` marks a write that cannot change anything a cached read shows. */
export type WriteOptions = { quiet?: boolean };

export type Database = {
  client: Client;
  db: Db;
  /** Runs `fn` in a write transaction, one at a time (see `createWriter`). */
  write: <T>(fn: (tx: Tx) => Promise<T>, options?: WriteOptions) => Promise<T>;
  /** Counts the loud write transactions this process has run: read caches key on it. */
  generation: () => number;
  /** Counts the quiet ones (they leave read caches as they are). */
  quietWrites: () => number;
  close: () => void;
};

function ensureFolder(url: string) {
  if (!url.startsWith("file:")) return;
  const file = url.slice("file:".length).split("?")[0];
  if (file && file !== ":memory:") mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
}

/**
 * Concurrent write transactions on one libSQL client fail with SQLITE_BUSY or
 * TRANSACTION_ACTIVE under load (measured on this machine, shared/STACK.md), so every write
 * transaction goes through this one in-process queue. Reads go straight to the pool.
 *
 * Every write is counted, and the organisation-wide read caches (app/db/read-cache.server.ts)
 * key on the count, so a write makes them read again. A write may say `{ quiet: true }` when it
 * cannot change anything those cached reads show — today only an examinee's answer or flag
 * (`responses`) and the attempt's position and layout (app/db/queries/exam-attempts.server.ts),
 * and a session's start and end (`sessions` and the audit log). Quiet writes are counted apart,
 * so a class taking a timed exam (dozens of saves a second) does not keep the Team pages cold.
 * Anything that can change a status, a person, a unit, a requirement or a record — grading or
 * closing an attempt included, since a pass completes a requirement — stays loud (the default).
 * Marking a write quiet when it is not leaves a Team page stale for up to 30 s: when in doubt, loud.
 */
export function createWriter(db: Db) {
  let tail: Promise<unknown> = Promise.resolve();
  let loud = 0;
  let quiet = 0;
  function write<T>(fn: (tx: Tx) => Promise<T>, options: WriteOptions = {}): Promise<T> {
    const run = tail.then(() => db.transaction(fn)).finally(() => {
      // Counted on failure too: a rolled-back write may still have raced a cached read.
      if (options.quiet) quiet += 1;
      else loud += 1;
    });
    tail = run.catch(() => undefined);
    return run;
  }
  return { write, generation: () => loud, quietWrites: () => quiet };
}

export async function openDatabase(url: string, options: { migrate?: boolean } = {}): Promise<Database> {
  ensureFolder(url);
  const client = createClient({ url, timeout: BUSY_TIMEOUT_MS });
  // journal_mode persists in the file, so once is enough; foreign keys are on by default in
  // libSQL and the busy timeout comes from the client option above, for every connection.
  await client.execute("PRAGMA journal_mode = WAL");
  const db = drizzle(client, { schema });
  if (options.migrate !== false) {
    await migrate(db, { migrationsFolder: path.resolve(process.env.MIGRATIONS_DIR ?? "drizzle") });
  }
  const writer = createWriter(db);
  return { client, db, write: writer.write, generation: writer.generation, quietWrites: writer.quietWrites, close: () => client.close() };
}

let shared: Promise<Database> | undefined;

/** The app's database, opened (and migrated) once per process. */
export function database(): Promise<Database> {
  shared ??= openDatabase(process.env.DATABASE_URL ?? "file:./data/tidemark.db");
  return shared;
}

/** For tests: point the process at another database file. */
export function setDatabaseForTests(next: Promise<Database> | undefined) {
  shared = next;
}
