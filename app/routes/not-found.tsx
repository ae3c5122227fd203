import { notFound } from "~/auth/gate.server";
import type { Route } from "./+types/not-found";

export async function loader(_: Route.LoaderArgs) {
  notFound();
}

export default function NotFound() {
  return null;
}
