import { NavLink, Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:admin")];

const TABS = [
  { to: "/admin", label: "Organisation", end: true },
  { to: "/admin/units", label: "Units", end: false },
  { to: "/admin/people", label: "People", end: false },
  { to: "/admin/references", label: "Regulatory references", end: false },
  { to: "/admin/audit", label: "Audit trail", end: false },
];

export default function AdminLayout() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-3xl font-semibold">Admin</h1>
        <nav aria-label="Admin" className="mt-3 border-b border-rule">
          <ul className="flex gap-1">
            {TABS.map((t) => (
              <li key={t.to}>
                <NavLink
                  to={t.to}
                  end={t.end}
                  className={({ isActive }) =>
                    `inline-flex min-h-11 items-center border-b-[3px] px-3 font-semibold no-underline ${isActive ? "border-sea text-ink" : "border-transparent text-sea"}`
                  }
                >
                  {t.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </div>
      <Outlet />
    </div>
  );
}
