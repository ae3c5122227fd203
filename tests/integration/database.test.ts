import { createClient } from "@libsql/client";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { openDatabase } from "~/db/client.server";
import { organisations } from "~/db/schema";

const tempUrl = () => `file:${path.join(mkdtempSync(path.join(tmpdir(), "tidemark-db-")), "t.db")}`;

describe("database connections", () => {
  it("WAL, foreign keys and the busy timeout hold on a fresh connection, not just the first", async () => {
    const url = tempUrl();
    const first = await openDatabase(url);
    first.close();
    // A brand-new client opened the way the app opens it: every pooled connection is configured.
    const again = await openDatabase(url, { migrate: false });
    const journal = await again.client.execute("PRAGMA journal_mode");
    const fk = await again.client.execute("PRAGMA foreign_keys");
    const busy = await again.client.execute("PRAGMA busy_timeout");
    expect(String(journal.rows[0][0]).toLowerCase()).toBe("wal");
    expect(Number(fk.rows[0][0])).toBe(1);
    expect(Number(busy.rows[0][0])).toBe(5000);
    again.close();
    // journal_mode persists in the file itself: even a bare client sees WAL.
    const bare = createClient({ url });
    expect(String((await bare.execute("PRAGMA journal_mode")).rows[0][0]).toLowerCase()).toBe("wal");
    bare.close();
  });

  it("foreign keys are enforced: a unit cannot point at a missing organisation", async () => {
    const db = await openDatabase(tempUrl());
    await expect(db.client.execute("INSERT INTO units (id, org_id, name, code, active, created_at, updated_at) VALUES ('u', 'nope', 'X', 'X', 1, 0, 0)")).rejects.toThrow(/FOREIGN KEY/);
    db.close();
  });

  it("200 concurrent write transactions through the writer queue all commit (none busy, none lost)", async () => {
    const db = await openDatabase(tempUrl());
    const results = await Promise.allSettled(
      Array.from({ length: 200 }, (_, i) =>
        db.write(async (tx) => {
          await tx.insert(organisations).values({ name: `Org ${i}`, slug: `org-${i}` });
          return i;
        }),
      ),
    );
    expect(results.filter((r) => r.status === "rejected")).toEqual([]);
    const count = await db.client.execute("SELECT count(*) FROM organisations");
    expect(Number(count.rows[0][0])).toBe(200);
    db.close();
  });

  it("a failed write rolls back alone and the queue keeps going", async () => {
    const db = await openDatabase(tempUrl());
    const failing = db.write(async (tx) => {
      await tx.insert(organisations).values({ name: "Half", slug: "half" });
      throw new Error("boom");
    });
    const next = db.write(async (tx) => tx.insert(organisations).values({ name: "Whole", slug: "whole" }));
    await expect(failing).rejects.toThrow("boom");
    await next;
    const rows = await db.client.execute("SELECT slug FROM organisations ORDER BY slug");
    expect(rows.rows.map((r) => r[0])).toEqual(["whole"]);
    db.close();
  });
});
