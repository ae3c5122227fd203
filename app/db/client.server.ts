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

export type Database = {
  client: Client;
  db: Db;
  /** Runs `fn` in a write transaction, one at a time (see `createWriter`). */
  write: <T>(fn: (tx: Tx) => Promise<T>) => Promise<T>;
  /** Counts the write transactions this process has committed: read caches key on it. */
  generation: () => number;
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
 */
export function createWriter(db: Db) {
  let tail: Promise<unknown> = Promise.resolve();
  let committed = 0;
  function write<T>(fn: (tx: Tx) => Promise<T>): Promise<T> {
    const run = tail.then(() => db.transaction(fn)).finally(() => {
      // Counted on failure too: a rolled-back write may still have raced a cached read.
      committed += 1;
    });
    tail = run.catch(() => undefined);
    return run;
  }
  return { write, generation: () => committed };
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
  return { client, db, write: writer.write, generation: writer.generation, close: () => client.close() };
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
