/**
 * Integration tests run against a real SQLite file: one migrated and seeded base per worker,
 * copied for each test file, so tests never share a database or touch the demo one.
 */
import { copyFileSync, existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { openDatabase, setDatabaseForTests, type Database } from "~/db/client.server";
import { seed } from "../../seeds/seed";

/** The demo day the tests' seed is built for, so statuses are stable. */
export const TEST_TODAY = "2026-12-02";

const workerDir = mkdtempSync(path.join(tmpdir(), `tidemark-it-${process.env.VITEST_POOL_ID ?? "0"}-`));
let base: Promise<string> | undefined;

async function buildBase(): Promise<string> {
  const file = path.join(workerDir, "base.db");
  if (!existsSync(file)) {
    const db = await openDatabase(`file:${file}`);
    await seed(db, { today: TEST_TODAY });
    await db.client.execute("PRAGMA wal_checkpoint(TRUNCATE)");
    db.close();
  }
  return file;
}

/** A fresh copy of the seeded base, made the app's database for this test file. */
export async function useSeededDatabase(): Promise<Database> {
  base ??= buildBase();
  const source = await base;
  const file = path.join(workerDir, `copy-${Date.now()}-${Math.random().toString(36).slice(2)}.db`);
  copyFileSync(source, file);
  const db = openDatabase(`file:${file}`);
  setDatabaseForTests(db);
  return db;
}

/** An empty migrated database, made the app's database. */
export async function useEmptyDatabase(): Promise<Database> {
  const db = openDatabase(`file:${path.join(workerDir, `empty-${Date.now()}-${Math.random().toString(36).slice(2)}.db`)}`);
  setDatabaseForTests(db);
  return db;
}
