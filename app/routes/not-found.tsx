import { viewerContext } from "~/auth/context";
import { notFound } from "~/auth/gate.server";
import type { Route } from "./+types/not-found";

export async function loader({ context }: Route.LoaderArgs) {
  notFound(undefined, !!context.get(viewerContext));
}

export default function NotFound() {
  return null;
}
