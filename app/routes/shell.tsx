import { data, Form, NavLink, Outlet, useLoaderData } from "react-router";
import { readToast } from "~/auth/flash.server";
import { gate, requireViewer } from "~/auth/gate.server";
import { ROLE_LABELS, sectionsFor } from "~/auth/roles";
import { ProductMark } from "~/components/product-mark";
import type { Route } from "./+types/shell";

export const middleware: Route.MiddlewareFunction[] = [gate()];

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context);
  const { toast, headers } = await readToast(request);
  return data({
    toast,
    name: viewer.person.name,
    orgName: viewer.org.name,
    roles: viewer.roles.map((r) => ROLE_LABELS[r]),
    sections: sectionsFor(viewer.roles)
      .filter((s) => s.built)
      .map(({ id, label, path }) => ({ id, label, path })),
  }, { headers });
}

export default function Shell() {
  const { name, orgName, roles, sections, toast } = useLoaderData<typeof loader>();
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-card focus:px-3 focus:py-2"
      >
        Skip to main content
      </a>
      <header className="no-print border-b border-rule bg-card">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-3 px-4 py-3">
          <a href="/today" className="no-underline" aria-label="Tidemark, go to Today">
            <ProductMark compact />
          </a>
          <div className="flex items-center gap-4 text-sm">
            <span>
              <span className="font-semibold">{name}</span>
              <span className="text-muted"> · {orgName} · {roles.join(", ")}</span>
            </span>
            <Form method="post" action="/logout">
              <button type="submit" className="min-h-11 rounded-md px-3 font-semibold text-sea underline underline-offset-2 hover:bg-sea-wash">
                Sign out
              </button>
            </Form>
          </div>
        </div>
        <nav aria-label="Sections" className="mx-auto max-w-7xl px-2">
          <ul className="flex flex-wrap gap-1">
            {sections.map((s) => (
              <li key={s.id}>
                <NavLink
                  to={s.path}
                  className={({ isActive }) =>
                    `inline-flex min-h-11 items-center border-b-[3px] px-3 font-semibold no-underline ${
                      isActive ? "border-sea text-ink" : "border-transparent text-sea hover:border-rule"
                    }`
                  }
                >
                  {s.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-7xl flex-1 px-4 py-8 focus:outline-none">
        {toast ? (
          <p role="status" className="mb-6 rounded-md border-l-4 border-sea bg-sea-wash px-4 py-3 font-semibold">
            {toast}
          </p>
        ) : null}
        <Outlet />
      </main>
    </div>
  );
}
