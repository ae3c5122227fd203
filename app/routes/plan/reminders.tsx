import { requireViewer } from "~/auth/gate.server";
import type { Route } from "./+types/reminders";

// PLACEHOLDER: being built (issue 9).
export async function loader({ context }: Route.LoaderArgs) {
  requireViewer(context, "section:plan");
  return null;
}

export default function Page() {
  return <h1 className="text-3xl font-semibold">Reminders</h1>;
}
