import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import type { Database } from "~/db/client.server";
import { cachedRead, MAX_AGE_MS } from "~/db/read-cache.server";
import { people } from "~/db/schema";
import { countForUnits, getProfile, statusOptionsFor } from "~/db/queries/people.server";
import { useSeededDatabase } from "../setup/db";
import { viewerFor } from "../setup/request";

let db: Database;
beforeAll(async () => {
  db = await useSeededDatabase();
});

describe("read cache for organisation-wide counts", () => {
  it("serves a repeat read from memory, and recomputes after any write through the queue", async () => {
    let computed = 0;
    const read = () => cachedRead(db, "k", async () => ++computed, 1_000);
    expect(await read()).toBe(1);
    expect(await read()).toBe(1);
    await db.write(async () => undefined);
    expect(await read()).toBe(2);
  });

  it("recomputes after its maximum age, for writes made by another process", async () => {
    let computed = 0;
    const at = (t: number) => cachedRead(db, "age", async () => ++computed, t);
    expect(await at(0)).toBe(1);
    expect(await at(MAX_AGE_MS - 1)).toBe(1);
    expect(await at(MAX_AGE_MS)).toBe(2);
  });

  it("a manager's counts move as soon as a person on their units is deactivated", async () => {
    const manager = await viewerFor("manager@kestrelvalley.test");
    const therapist = await viewerFor("therapist@kestrelvalley.test");
    const options = await statusOptionsFor(manager.org.id, manager.org.timeZone);
    const profile = (await getProfile(manager.org.id, manager.person.id))!;
    const before = await countForUnits(manager.org.id, profile.managedUnits, options);
    await db.write((tx) => tx.update(people).set({ active: false }).where(eq(people.id, therapist.person.id)));
    const after = await countForUnits(manager.org.id, profile.managedUnits, options);
    expect(after.people).toBe(before.people - 1);
    await db.write((tx) => tx.update(people).set({ active: true }).where(eq(people.id, therapist.person.id)));
    expect((await countForUnits(manager.org.id, profile.managedUnits, options)).people).toBe(before.people);
  });
});
