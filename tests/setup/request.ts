/** Calling loaders and actions as functions with a real Request and a signed-in viewer. */
import { and, eq } from "drizzle-orm";
import { RouterContextProvider } from "react-router";
import { viewerContext, type Viewer } from "~/auth/context";
import { isRole } from "~/auth/roles";
import { database } from "~/db/client.server";
import { organisations, people, personRoles } from "~/db/schema";

export const TEST_ORIGIN = "http://localhost:3000";

/** The viewer for a seeded person, as the session middleware would build it. */
export async function viewerFor(email: string): Promise<Viewer> {
  const { db } = await database();
  const [row] = await db
    .select({ person: people, org: organisations })
    .from(people)
    .innerJoin(organisations, eq(organisations.id, people.orgId))
    .where(eq(people.email, email));
  if (!row) throw new Error(`No seeded person ${email}`);
  const roles = await db
    .select({ role: personRoles.role })
    .from(personRoles)
    .where(and(eq(personRoles.personId, row.person.id), eq(personRoles.orgId, row.org.id)));
  return {
    sessionId: `test-session-${row.person.id}`,
    person: { id: row.person.id, name: row.person.name, email: row.person.email, title: row.person.title, homeUnitId: row.person.homeUnitId },
    org: { id: row.org.id, name: row.org.name, timeZone: row.org.timeZone },
    roles: roles.map((r) => r.role).filter(isRole),
  };
}

export function contextFor(viewer: Viewer | null): RouterContextProvider {
  const context = new RouterContextProvider();
  context.set(viewerContext, viewer);
  return context;
}

export function getRequest(pathname: string): Request {
  return new Request(new URL(pathname, TEST_ORIGIN));
}

/** A same-origin form POST, as a Tidemark page would send it. */
export function postForm(pathname: string, fields: Record<string, string | string[]>): Request {
  const body = new URLSearchParams();
  for (const [k, v] of Object.entries(fields)) for (const one of Array.isArray(v) ? v : [v]) body.append(k, one);
  return new Request(new URL(pathname, TEST_ORIGIN), {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: TEST_ORIGIN },
  });
}

/** Args for a route module's loader or action (cast once here, not in every test). */
export function args<T>(request: Request, viewer: Viewer | null, params: Record<string, string> = {}): T {
  return { request, params, context: contextFor(viewer) } as unknown as T;
}
