import type { Route } from "./+types/person";

export async function loader(_: Route.LoaderArgs) {
  return {};
}

export default function Page() {
  return <h1 className="text-3xl font-semibold">In progress</h1>;
}
