import { redirect } from "react-router";
import { viewerContext } from "~/auth/context";
import type { Route } from "./+types/home";

export async function loader({ context }: Route.LoaderArgs) {
  throw redirect(context.get(viewerContext) ? "/today" : "/login");
}
