import { Link } from "react-router";
import { notFound } from "~/auth/gate.server";
import { ProductMark } from "~/components/product-mark";
import { env } from "~/config/env.server";
import type { Route } from "./+types/fault";

/**
 * Demo mode only: a deliberate server error, so a newcomer (and the header tests in
 * tests/e2e/security-headers.spec.ts) can see what a 500 looks like and what it carries.
 */
export async function loader({ request }: Route.LoaderArgs) {
  if (!env().demoMode) notFound();
  if (new URL(request.url).searchParams.get("raise") === "1") {
    throw new Error("A deliberate server error, asked for at /dev/fault?raise=1 (demo mode only).");
  }
  return null;
}

export default function Fault() {
  return (
    <div className="mx-auto max-w-3xl px-4 py-8">
      <ProductMark />
      <main id="main">
        <h1 className="mt-6 text-3xl font-semibold">Deliberate server error</h1>
        <p className="mt-2">
          Demo mode only. The link below asks the server for a page whose loader fails, and shows the error page a person would see (nothing is written).
        </p>
        <p className="mt-4">
          <Link className="font-semibold underline" to="?raise=1">
            Raise a server error
          </Link>
        </p>
      </main>
    </div>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Deliberate server error · Tidemark" }];
