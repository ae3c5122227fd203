import { requireViewer } from "~/auth/gate.server";
import type { Route } from "./+types/completions";

// PLACEHOLDER: being built (issue 9).
export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "reports:read");
  return null;
}

export default function Page() {
  return <h1 className="text-3xl font-semibold">Reports</h1>;
}
