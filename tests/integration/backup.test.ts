/**
 * `npm run db:backup` and `npm run db:restore` (issue 11, item 3) on a seeded copy of the demo
 * database: the backup is a consistent copy holding every committed write, checked with
 * PRAGMA integrity_check; the restore checks a backup before it touches anything, puts it in
 * place in one rename, keeps the database it replaces, and never lets a stale WAL be replayed
 * onto the restored file.
 *
 * Sources: SQLite, "VACUUM" (sqlite.org/lang_vacuum.html, 2024) — VACUUM INTO writes "a
 * consistent snapshot of the original database" to a new file and fails if the file exists;
 * SQLite, "Pragma statements: integrity_check" (sqlite.org/pragma.html) — returns the single row
 * "ok" when no problem is found; SQLite, "Write-Ahead Logging" (sqlite.org/wal.html) — a WAL
 * file belongs to its database, and "How To Corrupt An SQLite Database File"
 * (sqlite.org/howtocorrupt.html, §1.4 "Mispairing database files and hot journals").
 * The migration table's hash is drizzle-orm's (sha256 of the .sql file; drizzle-orm 0.45 migrator).
 */
import { createHash } from "node:crypto";
import { copyFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createClient } from "@libsql/client";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { openDatabase, type Database } from "~/db/client.server";
import { people, sessions } from "~/db/schema";
import { backupDatabase, backupFileName, integrityOf } from "../../scripts/db-backup";
import { checkBackup, restoreDatabase } from "../../scripts/db-restore";
import { useSeededDatabase } from "../setup/db";

let db: Database;
let dbFile: string;
let therapistId: string;
let orgId: string;
const dir = mkdtempSync(path.join(tmpdir(), "tidemark-backup-test-"));

/** Whole-file comparison (vitest's deep equality over megabyte buffers is far too slow). */
const sha256 = (file: string) => createHash("sha256").update(readFileSync(file)).digest("hex");

async function fileOf(database: Database): Promise<string> {
  const list = await database.client.execute("PRAGMA database_list");
  return String(list.rows.find((r) => r.name === "main")!.file);
}

/** A session row, written through the app's one writer queue (as sign-in writes it). */
async function addSession(userAgent: string): Promise<string> {
  return db.write(async (tx) => {
    const [row] = await tx.insert(sessions).values({ personId: therapistId, orgId, expiresAt: new Date(Date.now() + 3600_000), userAgent }).returning({ id: sessions.id });
    return row.id;
  });
}

async function sessionAgents(file: string): Promise<string[]> {
  const client = createClient({ url: `file:${file}` });
  try {
    const rows = await client.execute("SELECT user_agent FROM sessions WHERE user_agent LIKE 'backup-test-%' ORDER BY user_agent");
    return rows.rows.map((r) => String(r.user_agent));
  } finally {
    client.close();
  }
}

async function execOn(file: string, sql: string): Promise<void> {
  const client = createClient({ url: `file:${file}` });
  try {
    await client.execute(sql);
  } finally {
    client.close();
  }
}

beforeAll(async () => {
  db = await useSeededDatabase();
  dbFile = await fileOf(db);
  const [therapist] = await db.db.select({ id: people.id, orgId: people.orgId }).from(people).where(eq(people.email, "therapist@kestrelvalley.test"));
  therapistId = therapist.id;
  orgId = therapist.orgId;
});

describe("db:backup", () => {
  it("copies every committed write while the app's connection stays open, and checks the copy", async () => {
    await addSession("backup-test-1");
    await addSession("backup-test-2");
    const out = path.join(dir, "one.db");
    const result = await backupDatabase({ databaseUrl: `file:${dbFile}`, out });
    // Written after the backup: must not be in it (a snapshot, not a live file).
    await addSession("backup-test-3");

    expect(result).toMatchObject({ path: out, integrity: "ok", bytes: statSync(out).size });
    expect(await integrityOf(out)).toBe("ok");
    expect(await sessionAgents(out)).toEqual(["backup-test-1", "backup-test-2"]);
    expect(await sessionAgents(dbFile)).toEqual(["backup-test-1", "backup-test-2", "backup-test-3"]);
    // The app's own data came across whole: the same people, row for row.
    const count = async (file: string) => {
      const client = createClient({ url: `file:${file}` });
      const r = await client.execute("SELECT count(*) AS n, group_concat(id) AS ids FROM (SELECT id FROM people ORDER BY id)");
      client.close();
      return r.rows[0];
    };
    expect(await count(out)).toEqual(await count(dbFile));
    // No temporary file is left beside it.
    expect(readdirSync(dir).filter((f) => f.startsWith("one.db"))).toEqual(["one.db"]);
  });

  it("names a backup by the UTC time in the folder given, and never overwrites a file", async () => {
    const now = new Date("2026-12-02T19:04:05.678Z");
    expect(backupFileName("/srv/tidemark/data/tidemark.db", now)).toBe("tidemark-2026-12-02T19-04-05Z.db");
    const folder = path.join(dir, "backups");
    const first = await backupDatabase({ databaseUrl: `file:${dbFile}`, dir: folder, now });
    expect(first.path).toBe(path.join(folder, `${path.basename(dbFile, ".db")}-2026-12-02T19-04-05Z.db`));
    await expect(backupDatabase({ databaseUrl: `file:${dbFile}`, dir: folder, now })).rejects.toThrow(/already exists/);
    await expect(backupDatabase({ databaseUrl: "libsql://db.example.test", out: path.join(dir, "x.db") })).rejects.toThrow(/not a local file/);
    await expect(backupDatabase({ databaseUrl: `file:${path.join(dir, "missing.db")}`, out: path.join(dir, "y.db") })).rejects.toThrow(/no database/);
  });
});

describe("db:restore", () => {
  it("puts the backup in place, keeps the old file and its WAL, and drops the stale -wal/-shm", async () => {
    const backup = path.join(dir, "for-restore.db");
    await backupDatabase({ databaseUrl: `file:${dbFile}`, out: backup });
    // The database to be replaced: a copy that went on to receive writes, with a WAL beside it.
    const target = path.join(dir, "live.db");
    copyFileSync(backup, target);
    await execOn(target, "PRAGMA journal_mode = WAL");
    const live = await openDatabase(`file:${target}`, { migrate: false });
    await live.client.execute("INSERT INTO sessions (id, person_id, org_id, expires_at, created_at, user_agent) SELECT 'later-session', person_id, org_id, expires_at, created_at, 'backup-test-later' FROM sessions LIMIT 1");
    live.close();
    writeFileSync(`${target}-wal`, Buffer.alloc(4096, 7)); // a WAL that does not belong to the backup
    writeFileSync(`${target}-shm`, Buffer.alloc(32768, 0));

    const now = new Date("2026-12-02T20:00:00Z");
    const result = await restoreDatabase({ backup, target, now });
    expect(result).toMatchObject({ integrity: "ok", pending: [], target, keptAs: `${target}.before-restore-2026-12-02T20-00-00Z` });
    expect(result.migrations).toBe(JSON.parse(readFileSync("drizzle/meta/_journal.json", "utf8")).entries.length);
    expect(existsSync(`${target}-shm`)).toBe(false);
    expect(existsSync(`${target}-wal`)).toBe(false);
    // The old database is kept, with the WAL it had.
    expect(existsSync(result.keptAs!)).toBe(true);
    expect(readFileSync(`${result.keptAs}-wal`).equals(Buffer.alloc(4096, 7))).toBe(true);
    // The restored file is the backup, byte for byte, and opens as the app opens it.
    expect(sha256(target)).toBe(sha256(backup));
    expect(await sessionAgents(target)).toEqual(await sessionAgents(backup));
    const reopened = await openDatabase(`file:${target}`);
    const [row] = await reopened.db.select({ email: people.email }).from(people).where(eq(people.id, therapistId));
    reopened.close();
    expect(row.email).toBe("therapist@kestrelvalley.test");
    expect(await integrityOf(target)).toBe("ok");
    expect(readdirSync(dir).filter((f) => f.includes(".restoring-"))).toEqual([]);
  });

  it("accepts a backup from older code and names the migrations the server will apply", async () => {
    const older = path.join(dir, "older.db");
    await backupDatabase({ databaseUrl: `file:${dbFile}`, out: older });
    const journal = JSON.parse(readFileSync("drizzle/meta/_journal.json", "utf8")) as { entries: { tag: string; when: number }[] };
    const last = journal.entries[journal.entries.length - 1];
    await execOn(older, `DELETE FROM __drizzle_migrations WHERE created_at = ${last.when}`);
    expect((await checkBackup(older)).pending).toEqual([last.tag]);
  });

  it("refuses a backup that is not whole or not ours, before touching the database", async () => {
    const target = path.join(dir, "untouched.db");
    copyFileSync(dbFile, target);
    const before = sha256(target);
    const good = path.join(dir, "good.db");
    await backupDatabase({ databaseUrl: `file:${dbFile}`, out: good });

    const notSqlite = path.join(dir, "notes.db");
    writeFileSync(notSqlite, "these are not the pages of a database\n".repeat(200));
    await expect(restoreDatabase({ backup: notSqlite, target })).rejects.toThrow(/not a SQLite database/);

    const foreign = path.join(dir, "foreign.db");
    await execOn(foreign, "CREATE TABLE notes (id INTEGER PRIMARY KEY, text TEXT)");
    await expect(restoreDatabase({ backup: foreign, target })).rejects.toThrow(/no migration table/);

    const newer = path.join(dir, "newer.db");
    copyFileSync(good, newer);
    await execOn(newer, "INSERT INTO __drizzle_migrations (hash, created_at) VALUES ('f00d', 4102444800000)");
    await expect(restoreDatabase({ backup: newer, target })).rejects.toThrow(/newer Tidemark/);

    const altered = path.join(dir, "altered.db");
    copyFileSync(good, altered);
    await execOn(altered, "UPDATE __drizzle_migrations SET hash = 'f00d' WHERE created_at = (SELECT min(created_at) FROM __drizzle_migrations)");
    await expect(restoreDatabase({ backup: altered, target })).rejects.toThrow(/differs from this code's/);

    // Damage: one page in the middle overwritten (a torn or corrupted copy).
    const damaged = path.join(dir, "damaged.db");
    const bytes = readFileSync(good);
    const pageSize = bytes.readUInt16BE(16) === 1 ? 65536 : bytes.readUInt16BE(16);
    const page = Math.floor(bytes.length / pageSize / 2);
    bytes.fill(0xa5, page * pageSize, (page + 1) * pageSize);
    writeFileSync(damaged, bytes);
    await expect(restoreDatabase({ backup: damaged, target })).rejects.toThrow(/fails PRAGMA integrity_check:[\s\S]*(malformed|corrupt|page)/i);

    await expect(restoreDatabase({ backup: path.join(dir, "absent.db"), target })).rejects.toThrow(/no backup/);
    // Nothing was touched.
    expect(sha256(target)).toBe(before);
    expect(readdirSync(dir).filter((f) => f.startsWith("untouched.db"))).toEqual(["untouched.db"]);
  });
});
