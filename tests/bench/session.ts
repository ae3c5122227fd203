/**
 * The benchmark's own world: a fresh database file holding the large organisation
 * (issue 2, item 7: `--people 2000`) and a signed-in manager, without going through the
 * e-mailed code — the sign-in page is measured as a page, not as a flow.
 *
 * The session is a real row in `sessions` and the cookie is signed the way the app signs it
 * (React Router's createCookie, the app's cookie name, the same secret), so the server reads
 * it with its own code: a wrong signature would show up as a redirect to /login, which
 * run.ts refuses to measure.
 */
import { existsSync, rmSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { createCookie } from "react-router";
import { SESSION_COOKIE_NAME } from "~/auth/session.server";
import { openDatabase } from "~/db/client.server";
import { people, sessions } from "~/db/schema";
import { DEMO_ACCOUNTS } from "../../seeds/kestrel-valley";
import { seed } from "../../seeds/seed";

export type BenchDatabase = {
  databaseUrl: string;
  people: number;
  today: string;
  seedMs: number;
  manager: { id: string; name: string; email: string };
  sessionId: string;
};

/** Deletes the bench database file (and its WAL companions). Only ever a file under data/bench. */
export function removeBenchDatabase(dbFile: string): void {
  const resolved = path.resolve(dbFile);
  // Guard: this function must never delete the demo or e2e database by a wrong argument.
  if (path.relative(path.resolve("data", "bench"), path.dirname(resolved)) !== "") {
    throw new Error(`Refusing to delete ${resolved}: the bench database lives directly in data/bench/.`);
  }
  for (const suffix of ["", "-wal", "-shm", "-journal"]) {
    const file = resolved + suffix;
    if (existsSync(file)) rmSync(file);
  }
}

/**
 * Builds the large organisation in `dbFile` from scratch (migrations, then the demo seed
 * with `people` in Kestrel Valley) and opens a session for the manager, valid for a day.
 */
export async function prepareBenchDatabase(options: { dbFile: string; people: number; today: string; now?: Date }): Promise<BenchDatabase> {
  removeBenchDatabase(options.dbFile);
  const databaseUrl = `file:${path.relative(process.cwd(), path.resolve(options.dbFile))}`;
  const started = performance.now();
  const database = await openDatabase(databaseUrl);
  try {
    await seed(database, { today: options.today, people: options.people });
    const seedMs = performance.now() - started;
    const [manager] = await database.db
      .select({ id: people.id, name: people.name, email: people.email, orgId: people.orgId })
      .from(people)
      .where(eq(people.email, DEMO_ACCOUNTS.manager))
      .limit(1);
    if (!manager) throw new Error(`The seed did not create ${DEMO_ACCOUNTS.manager}.`);
    const now = options.now ?? new Date();
    const sessionId = await database.write(async (tx) => {
      const [row] = await tx
        .insert(sessions)
        .values({ personId: manager.id, orgId: manager.orgId, expiresAt: new Date(now.getTime() + 24 * 60 * 60 * 1000), userAgent: "tidemark-bench" })
        .returning({ id: sessions.id });
      return row.id;
    });
    return {
      databaseUrl,
      people: options.people,
      today: options.today,
      seedMs,
      manager: { id: manager.id, name: manager.name, email: manager.email },
      sessionId,
    };
  } finally {
    database.close();
  }
}

/**
 * The `Cookie` request header a browser would send after signing in: `tm_session=<signed id>`.
 * Only the name and the secrets matter for the signature; the other attributes go to
 * Set-Cookie, which a request header does not carry.
 */
export async function sessionCookieHeader(sessionId: string, sessionSecret: string): Promise<string> {
  const cookie = createCookie(SESSION_COOKIE_NAME, { secrets: [sessionSecret], path: "/", sameSite: "lax", httpOnly: true });
  const setCookie = await cookie.serialize(sessionId);
  return setCookie.split(";")[0];
}
