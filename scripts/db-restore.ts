/**
 * `npm run db:restore -- FILE [--to DATABASE]` — puts a backup made by `npm run db:backup` in
 * place of the database file. STOP THE SERVER FIRST: this command does not detect a running
 * server, and a server holding the old file open would keep writing to it (README "Backups and
 * restore" gives the steps).
 *
 * Before anything is touched the backup is checked:
 *   - it is a SQLite database file and `PRAGMA integrity_check` says ok;
 *   - its migration table (`__drizzle_migrations`) exists, and every migration it records is one
 *     this code has, with the same content hash (drizzle-orm's migrator: sha256 of the .sql file).
 *     A backup from newer code is refused; one from older code is accepted and the server
 *     applies the missing migrations when it starts.
 * Then, atomically: the backup is copied to a temporary file beside the database and flushed to
 * disk; the current database (if any) is kept beside it as `<name>.before-restore-<stamp>` (a
 * hard link, with its -wal moved along, so nothing of it is lost); the old -wal/-shm/-journal
 * files are removed (a stale WAL must never be replayed onto the restored file); and the
 * temporary file is renamed over the database — a reader sees the old file or the new one,
 * never half of either.
 */
import { createClient } from "@libsql/client";
import { createHash } from "node:crypto";
import { closeSync, copyFileSync, existsSync, fsyncSync, linkSync, openSync, readFileSync, readSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import url from "node:url";
import { parseArgs } from "node:util";
import { databaseFile, formatBytes, integrityOf } from "./db-backup";

export type BackupCheck = {
  integrity: string;
  /** Migrations recorded in the backup, all known to this code. */
  migrations: number;
  /** Migrations this code has that the backup lacks: the server applies them at start. */
  pending: string[];
};

type JournalEntry = { tag: string; when: number };

function codeMigrations(migrationsFolder: string): { tag: string; when: number; hash: string }[] {
  const journalPath = path.join(migrationsFolder, "meta", "_journal.json");
  if (!existsSync(journalPath)) throw new Error(`No migration journal at ${journalPath}.`);
  const journal = JSON.parse(readFileSync(journalPath, "utf8")) as { entries: JournalEntry[] };
  return journal.entries.map((e) => ({
    tag: e.tag,
    when: e.when,
    hash: createHash("sha256").update(readFileSync(path.join(migrationsFolder, `${e.tag}.sql`)).toString()).digest("hex"),
  }));
}

function isSqliteFile(file: string): boolean {
  const header = Buffer.alloc(16);
  const fd = openSync(file, "r");
  try {
    return readSync(fd, header, 0, 16, 0) === 16 && header.toString("latin1") === "SQLite format 3\0";
  } finally {
    closeSync(fd);
  }
}

/** Everything restore checks before touching the database. Throws with the reason when the backup is unfit. */
export async function checkBackup(file: string, migrationsFolder = path.resolve(process.env.MIGRATIONS_DIR ?? "drizzle")): Promise<BackupCheck> {
  if (!existsSync(file)) throw new Error(`There is no backup at ${file}.`);
  if (!statSync(file).isFile()) throw new Error(`${file} is not a file.`);
  if (!isSqliteFile(file)) throw new Error(`${file} is not a SQLite database (its first bytes are not "SQLite format 3").`);
  const integrity = await integrityOf(file);
  if (integrity !== "ok") throw new Error(`The backup fails PRAGMA integrity_check: ${integrity}`);

  const known = codeMigrations(migrationsFolder);
  const client = createClient({ url: `file:${file}` });
  let rows: { hash: string; createdAt: number }[];
  try {
    const table = await client.execute("SELECT name FROM sqlite_master WHERE type = 'table' AND name = '__drizzle_migrations'");
    if (table.rows.length === 0) throw new Error("The backup has no migration table (__drizzle_migrations): it is not a Tidemark database.");
    const result = await client.execute("SELECT hash, created_at FROM __drizzle_migrations ORDER BY created_at");
    rows = result.rows.map((r) => ({ hash: String(r[0]), createdAt: Number(r[1]) }));
  } finally {
    client.close();
  }
  if (rows.length === 0) throw new Error("The backup's migration table is empty: it was never migrated.");
  for (const row of rows) {
    const match = known.find((m) => m.when === row.createdAt);
    if (!match) {
      throw new Error(`The backup records a migration this code does not have (created_at ${row.createdAt}): it was made by a newer Tidemark. Restore it with that version.`);
    }
    if (match.hash !== row.hash) throw new Error(`Migration ${match.tag} in the backup differs from this code's (content hash): refusing to restore.`);
  }
  const latest = Math.max(...rows.map((r) => r.createdAt));
  return { integrity, migrations: rows.length, pending: known.filter((m) => m.when > latest).map((m) => m.tag) };
}

function fsyncFile(file: string): void {
  const fd = openSync(file, "r+");
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

function fsyncDir(dir: string): void {
  try {
    const fd = openSync(dir, "r");
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
  } catch {
    // Some file systems refuse to open a directory for fsync; the rename is still atomic.
  }
}

export type RestoreResult = BackupCheck & { target: string; bytes: number; keptAs: string | null };

/** Checks `backup`, then puts it in place of `target` (see the file's comment). The server must be stopped. */
export async function restoreDatabase(options: { backup: string; target: string; now?: Date; migrationsFolder?: string }): Promise<RestoreResult> {
  const backup = path.resolve(options.backup);
  const target = path.resolve(options.target);
  if (backup === target) throw new Error("The backup and the database are the same file.");
  const check = await checkBackup(backup, options.migrationsFolder);

  const temp = `${target}.restoring-${process.pid}`;
  rmSync(temp, { force: true });
  copyFileSync(backup, temp);
  fsyncFile(temp);

  let keptAs: string | null = null;
  if (existsSync(target)) {
    keptAs = `${target}.before-restore-${(options.now ?? new Date()).toISOString().replace(/\.\d{3}Z$/, "Z").replace(/:/g, "-")}`;
    linkSync(target, keptAs);
    if (existsSync(`${target}-wal`)) renameSync(`${target}-wal`, `${keptAs}-wal`);
  }
  for (const suffix of ["-wal", "-shm", "-journal"]) rmSync(`${target}${suffix}`, { force: true });
  renameSync(temp, target);
  fsyncDir(path.dirname(target));
  return { ...check, target, bytes: statSync(target).size, keptAs };
}

/** A path as typed relative to here when it is under here, otherwise in full. */
const shown = (file: string) => {
  const relative = path.relative(process.cwd(), file);
  return relative && !relative.startsWith("..") && !path.isAbsolute(relative) ? relative : file;
};

if (process.argv[1] && import.meta.url === url.pathToFileURL(path.resolve(process.argv[1])).href) {
  const usage = "Usage: npm run db:restore -- BACKUP_FILE [--to DATABASE_FILE]   (stop the server first)";
  let parsed: { values: { to?: string }; positionals: string[] };
  try {
    parsed = parseArgs({ options: { to: { type: "string" } }, allowPositionals: true });
  } catch (error) {
    console.error(`${error instanceof Error ? error.message : String(error)}\n${usage}`);
    process.exit(2);
  }
  if (parsed.positionals.length !== 1) {
    console.error(`Name exactly one backup file.\n${usage}`);
    process.exit(2);
  }
  try {
    const target = parsed.values.to ? path.resolve(parsed.values.to) : databaseFile(process.env.DATABASE_URL ?? "file:./data/tidemark.db");
    const result = await restoreDatabase({ backup: parsed.positionals[0], target });
    console.log(`Backup checked: PRAGMA integrity_check ${result.integrity}; ${result.migrations} migrations recorded, all known to this code.`);
    if (result.keptAs) console.log(`The previous database is kept as ${shown(result.keptAs)}.`);
    console.log(`Restored ${parsed.positionals[0]} to ${shown(result.target)} (${formatBytes(result.bytes)}).`);
    if (result.pending.length) console.log(`The server applies ${result.pending.length} newer migration(s) when it starts: ${result.pending.join(", ")}.`);
    console.log("Start the server now.");
  } catch (error) {
    console.error(`Restore refused: ${error instanceof Error ? error.message : String(error)}`);
    process.exit(1);
  }
}
