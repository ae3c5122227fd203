import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { openDatabase, setDatabaseForTests } from "~/db/client.server";
import { loader } from "~/routes/api/healthz";

import { args, getRequest } from "../setup/request";
import { useEmptyDatabase } from "../setup/db";

describe("GET /healthz", () => {
  it("answers 200 with status ok and db ok when the database reads", async () => {
    await useEmptyDatabase();
    const res = await loader(args<Parameters<typeof loader>[0]>(getRequest("/healthz"), null));
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ status: "ok", db: "ok" });
  });

  it("answers 503 with db error when the database cannot be read", async () => {
    // A database file without Tidemark's tables: the health query fails.
    const file = path.join(mkdtempSync(path.join(tmpdir(), "tidemark-broken-")), "b.db");
    setDatabaseForTests(openDatabase(`file:${file}`, { migrate: false }));
    const res = await loader(args<Parameters<typeof loader>[0]>(getRequest("/healthz"), null));
    expect(res.status).toBe(503);
    expect(await res.json()).toEqual({ status: "error", db: "error" });
  });
});
