import { sql } from "drizzle-orm";
import { database } from "~/db/client.server";
import type { Route } from "./+types/healthz";

/** GET /healthz: 200 {"status":"ok","db":"ok"}, or 503 with "db":"error" when the database cannot be read. */
export async function loader(_: Route.LoaderArgs) {
  const headers = { "Content-Type": "application/json", "Cache-Control": "no-store" };
  try {
    const { db } = await database();
    await db.run(sql`SELECT count(*) FROM organisations`);
    return new Response(JSON.stringify({ status: "ok", db: "ok" }), { status: 200, headers });
  } catch {
    return new Response(JSON.stringify({ status: "error", db: "error" }), { status: 503, headers });
  }
}
