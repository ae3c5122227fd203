/**
 * `npm run db:backup` — an online backup of the database file while the app keeps serving.
 *
 *   npm run db:backup                      → data/backups/tidemark-<UTC timestamp>.db
 *   npm run db:backup -- --out FILE        → FILE (refused if it exists)
 *
 * How: `VACUUM INTO` on a separate connection (SQLite, "VACUUM": "The VACUUM INTO command is
 * transactional in the sense that the generated output database is a consistent snapshot of
 * the original database"). In WAL mode it is a read transaction: the server's writes carry on
 * while it runs and land after the snapshot. The connection has a busy timeout, for the moment a
 * checkpoint or a migration holds a lock. The copy is written under a temporary name, checked
 * with `PRAGMA integrity_check` on a connection of its own, and only then renamed to its final
 * name; a copy that fails the check is deleted and the command exits 1.
 *
 * Restore: `npm run db:restore -- FILE` (scripts/db-restore.ts; README "Backups and restore").
 */
import { createClient } from "@libsql/client";
import { existsSync, mkdirSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import url from "node:url";
import { parseArgs } from "node:util";

/** How long the backup's connection waits for a lock before giving up (ms). */
export const BACKUP_BUSY_TIMEOUT_MS = 10_000;
export const DEFAULT_BACKUP_DIR = path.join("data", "backups");

export type BackupResult = { path: string; bytes: number; integrity: string; ms: number };

/** The file behind a `file:` DATABASE_URL; a remote libSQL server is backed up by its own tools. */
export function databaseFile(databaseUrl: string): string {
  if (!databaseUrl.startsWith("file:")) {
    throw new Error(`DATABASE_URL is ${databaseUrl.split(":")[0]}:…, not a local file; back up a libSQL server with its own tools.`);
  }
  const file = databaseUrl.slice("file:".length).split("?")[0];
  if (!file || file === ":memory:") throw new Error(`DATABASE_URL names no database file (${databaseUrl}).`);
  return path.resolve(file);
}

/** `tidemark-2026-12-02T19-04-05Z.db`: sorts by time, no characters a file system dislikes. */
export function backupFileName(databasePath: string, now = new Date()): string {
  const stamp = now.toISOString().replace(/\.\d{3}Z$/, "Z").replace(/:/g, "-");
  return `${path.basename(databasePath, path.extname(databasePath))}-${stamp}.db`;
}

/** `PRAGMA integrity_check` of one database file on a fresh connection: "ok" or the problems found. */
export async function integrityOf(file: string): Promise<string> {
  if (!existsSync(file)) throw new Error(`${file} does not exist.`);
  const client = createClient({ url: `file:${file}`, timeout: BACKUP_BUSY_TIMEOUT_MS });
  try {
    const result = await client.execute("PRAGMA integrity_check");
    return result.rows.map((row) => String(row[0])).join("; ");
  } catch (error) {
    // A file damaged enough that the check itself cannot run (SQLITE_CORRUPT, SQLITE_NOTADB).
    return `the check could not run: ${error instanceof Error ? error.message : String(error)}`;
  } finally {
    client.close();
  }
}

/** A SQL string literal (VACUUM INTO takes an expression, not a bound parameter in every version). */
const sqlString = (s: string) => `'${s.replace(/'/g, "''")}'`;

/**
 * Copies the database behind `databaseUrl` to `out` (or a timestamped file in `dir`), checks the
 * copy, and returns where it is. Throws, leaving no file at `out`, when anything fails.
 */
export async function backupDatabase(options: { databaseUrl: string; out?: string; dir?: string; now?: Date }): Promise<BackupResult> {
  const started = performance.now();
  const source = databaseFile(options.databaseUrl);
  if (!existsSync(source)) throw new Error(`There is no database at ${source} to back up.`);
  const out = path.resolve(options.out ?? path.join(options.dir ?? DEFAULT_BACKUP_DIR, backupFileName(source, options.now)));
  if (out === source) throw new Error("The backup cannot be written over the database itself.");
  if (existsSync(out)) throw new Error(`${out} already exists; choose another --out (a backup never overwrites a file).`);
  mkdirSync(path.dirname(out), { recursive: true });
  const partial = `${out}.partial-${process.pid}`;
  rmSync(partial, { force: true });

  const client = createClient({ url: `file:${source}`, timeout: BACKUP_BUSY_TIMEOUT_MS });
  try {
    await client.execute(`VACUUM INTO ${sqlString(partial)}`);
  } catch (error) {
    rmSync(partial, { force: true });
    throw new Error(`VACUUM INTO failed: ${error instanceof Error ? error.message : String(error)}`);
  } finally {
    client.close();
  }

  const integrity = await integrityOf(partial);
  if (integrity !== "ok") {
    rmSync(partial, { force: true });
    throw new Error(`The copy failed PRAGMA integrity_check (${integrity}); nothing was kept.`);
  }
  renameSync(partial, out);
  return { path: out, bytes: statSync(out).size, integrity, ms: performance.now() - started };
}

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MB`;
}

if (process.argv[1] && import.meta.url === url.pathToFileURL(path.resolve(process.argv[1])).href) {
  let flags: { out?: string };
  try {
    ({ values: flags } = parseArgs({ options: { out: { type: "string" } } }));
  } catch (error) {
    console.error(`${error instanceof Error ? error.message : String(error)}\nUsage: npm run db:backup [-- --out FILE]`);
    process.exit(2);
  }
  const databaseUrl = process.env.DATABASE_URL ?? "file:./data/tidemark.db";
  try {
    const result = await backupDatabase({ databaseUrl, out: flags.out });
    console.log(`Backed up ${databaseFile(databaseUrl)}`);
    const relative = path.relative(process.cwd(), result.path);
    console.log(`  to ${relative && !relative.startsWith("..") ? relative : result.path} (${formatBytes(result.bytes)}, ${result.bytes} bytes) in ${(result.ms / 1000).toFixed(1)} s`);
    console.log(`  PRAGMA integrity_check on the copy: ${result.integrity} — backup ok`);
  } catch (error) {
    console.error(`Backup failed: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  }
}
