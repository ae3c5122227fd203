import { redirect } from "react-router";
import { viewerContext } from "~/auth/context";
import { clearSessionCookie, endSession } from "~/auth/session.server";
import type { Route } from "./+types/logout";

/** Sign-out is a POST only: a GET (a link, a prefetch, an image) must never end a session. */
export async function loader(_: Route.LoaderArgs) {
  throw redirect("/today");
}

export async function action({ context }: Route.ActionArgs) {
  const viewer = context.get(viewerContext);
  if (viewer) await endSession(viewer);
  throw redirect("/login?signed-out", { headers: { "Set-Cookie": await clearSessionCookie() } });
}
