import { notFound, requireViewer } from "~/auth/gate.server";
import type { Route } from "./+types/expiries-csv";

// PLACEHOLDER: being built (issue 9).
export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "reports:read");
  notFound();
}
