import { and, eq, gt, isNull } from "drizzle-orm";
import { createCookie } from "react-router";
import { env, type Env } from "~/config/env.server";
import { recordAudit } from "~/db/audit.server";
import { database } from "~/db/client.server";
import { organisations, people, personRoles, sessions } from "~/db/schema";
import type { Viewer } from "./context";
import { isRole } from "./roles";

export const SESSION_COOKIE_NAME = "tm_session";

let cookie: ReturnType<typeof createCookie> | undefined;
/**
 * The session cookie holds only a signed session id. React Router's cookie defaults set just
 * Path and SameSite, so HttpOnly and Secure are set here explicitly (OWASP ASVS 4.0.3 V3.4).
 */
export function buildSessionCookie(e: Env) {
  return createCookie(SESSION_COOKIE_NAME, {
    httpOnly: true,
    sameSite: "lax",
    path: "/",
    secure: e.production,
    secrets: [e.sessionSecret],
    maxAge: e.sessionDays * 24 * 60 * 60,
  });
}

export function sessionCookie() {
  cookie ??= buildSessionCookie(env());
  return cookie;
}

/** A Set-Cookie value that removes the session cookie. */
export async function clearSessionCookie(): Promise<string> {
  return sessionCookie().serialize("", { maxAge: 0, expires: new Date(0) });
}

export type SessionLookup = { viewer: Viewer | null; hadCookie: boolean };

export async function readSessionId(request: Request): Promise<{ id: string | null; hadCookie: boolean }> {
  const header = request.headers.get("Cookie");
  const hadCookie = !!header && header.split(/;\s*/).some((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`));
  if (!hadCookie) return { id: null, hadCookie };
  // A tampered value fails the signature check and parses as null: treated as signed out.
  const value = await sessionCookie().parse(header);
  return { id: typeof value === "string" && value ? value : null, hadCookie };
}

export async function loadViewer(sessionId: string, now: Date = new Date()): Promise<Viewer | null> {
  const { db } = await database();
  const [row] = await db
    .select({
      sessionId: sessions.id,
      personId: people.id,
      name: people.name,
      email: people.email,
      title: people.title,
      homeUnitId: people.homeUnitId,
      orgId: organisations.id,
      orgName: organisations.name,
      timeZone: organisations.timeZone,
    })
    .from(sessions)
    .innerJoin(people, eq(people.id, sessions.personId))
    .innerJoin(organisations, eq(organisations.id, sessions.orgId))
    .where(and(eq(sessions.id, sessionId), isNull(sessions.endedAt), gt(sessions.expiresAt, now), eq(people.active, true)))
    .limit(1);
  if (!row) return null;
  const roleRows = await db
    .select({ role: personRoles.role })
    .from(personRoles)
    .where(and(eq(personRoles.personId, row.personId), eq(personRoles.orgId, row.orgId)));
  return {
    sessionId: row.sessionId,
    person: { id: row.personId, name: row.name, email: row.email, title: row.title, homeUnitId: row.homeUnitId },
    org: { id: row.orgId, name: row.orgName, timeZone: row.timeZone },
    roles: roleRows.map((r) => r.role).filter(isRole),
  };
}

export async function getSession(request: Request): Promise<SessionLookup> {
  const { id, hadCookie } = await readSessionId(request);
  if (!id) return { viewer: null, hadCookie };
  return { viewer: await loadViewer(id), hadCookie };
}

/** A new session id at every sign-in (no fixation); returns the Set-Cookie value. */
export async function startSession(personId: string, orgId: string, request: Request, now: Date = new Date()): Promise<string> {
  const { write } = await database();
  const expiresAt = new Date(now.getTime() + env().sessionDays * 24 * 60 * 60 * 1000);
  const id = await write(async (tx) => {
    const [s] = await tx
      .insert(sessions)
      .values({ personId, orgId, expiresAt, userAgent: request.headers.get("User-Agent")?.slice(0, 300) ?? null })
      .returning({ id: sessions.id });
    await recordAudit(tx, { orgId, actorId: personId, action: "session.signed-in", entityType: "person", entityId: personId }, now);
    return s.id;
  }, { quiet: true }); // sessions and the audit log are in no cached organisation-wide read (client.server.ts)
  return sessionCookie().serialize(id);
}

/** Ends the session on the server, so a copied cookie stops working too. */
export async function endSession(viewer: Viewer, now: Date = new Date()): Promise<void> {
  const { write } = await database();
  await write(async (tx) => {
    await tx.update(sessions).set({ endedAt: now }).where(eq(sessions.id, viewer.sessionId));
    await recordAudit(tx, { orgId: viewer.org.id, actorId: viewer.person.id, action: "session.signed-out", entityType: "person", entityId: viewer.person.id }, now);
  }, { quiet: true });
}
