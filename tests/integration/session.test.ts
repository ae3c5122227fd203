import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { buildSessionCookie, clearSessionCookie, endSession, getSession, startSession } from "~/auth/session.server";
import { readEnv } from "~/config/env.server";
import type { Database } from "~/db/client.server";
import { organisations, people, personRoles } from "~/db/schema";
import { useEmptyDatabase } from "../setup/db";

let db: Database;
let personId: string;
let orgId: string;
beforeAll(async () => {
  db = await useEmptyDatabase();
  await db.write(async (tx) => {
    const [org] = await tx.insert(organisations).values({ name: "Test Org", slug: "test-org" }).returning();
    orgId = org.id;
    const [p] = await tx.insert(people).values({ orgId, email: "sam@test.test", name: "Sam Test" }).returning();
    personId = p.id;
    await tx.insert(personRoles).values({ personId, orgId, role: "manager" });
  });
});

const cookiePair = (setCookie: string) => setCookie.split(";")[0];
const withCookie = (cookie: string) => new Request("http://localhost:3000/today", { headers: { Cookie: cookie } });

describe("session cookie", () => {
  it("is HttpOnly, SameSite=Lax, Path=/ (and Secure in production)", async () => {
    const set = await startSession(personId, orgId, new Request("http://localhost:3000/login/code"));
    expect(set).toMatch(/HttpOnly/i);
    expect(set).toMatch(/SameSite=Lax/i);
    expect(set).toMatch(/Path=\//);
    const production = readEnv({ NODE_ENV: "production", SESSION_SECRET: "s".repeat(32), TOTP_SECRET: "b".repeat(64) });
    expect(await buildSessionCookie(production).serialize("id")).toMatch(/; Secure/);
  });

  it("carries only a signed session id, and finds the person with their roles", async () => {
    const set = await startSession(personId, orgId, new Request("http://localhost:3000/login/code"));
    expect(set).not.toContain("sam@test.test");
    const { viewer } = await getSession(withCookie(cookiePair(set)));
    expect(viewer?.person.email).toBe("sam@test.test");
    expect(viewer?.roles).toEqual(["manager"]);
  });

  it("a tampered cookie is treated as signed out (and noticed, so it can be cleared)", async () => {
    const set = await startSession(personId, orgId, new Request("http://localhost:3000/login/code"));
    const pair = cookiePair(set);
    const tampered = pair.slice(0, -3) + (pair.endsWith("abc") ? "xyz" : "abc");
    const result = await getSession(withCookie(tampered));
    expect(result).toEqual({ viewer: null, hadCookie: true });
    expect(await clearSessionCookie()).toMatch(/Expires=Thu, 01 Jan 1970/);
  });

  it("signing out ends the session on the server: the same cookie stops working", async () => {
    const set = await startSession(personId, orgId, new Request("http://localhost:3000/login/code"));
    const { viewer } = await getSession(withCookie(cookiePair(set)));
    await endSession(viewer!);
    expect((await getSession(withCookie(cookiePair(set)))).viewer).toBeNull();
  });

  it("a deactivated person's session stops working", async () => {
    const set = await startSession(personId, orgId, new Request("http://localhost:3000/login/code"));
    await db.write((tx) => tx.update(people).set({ active: false }).where(eq(people.id, personId)));
    expect((await getSession(withCookie(cookiePair(set)))).viewer).toBeNull();
    await db.write((tx) => tx.update(people).set({ active: true }).where(eq(people.id, personId)));
  });
});
