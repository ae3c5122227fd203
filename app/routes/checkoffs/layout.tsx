import { NavLink, Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:checkoffs")];

const TABS = [
  { to: "/checkoffs", label: "Check-offs", end: true },
  { to: "/checkoffs/orientation", label: "Orientation", end: false },
  { to: "/checkoffs/checklists", label: "Checklists", end: false },
  { to: "/checkoffs/signing-pin", label: "Signing PIN", end: false },
];

export default function CheckoffsLayout() {
  return (
    <div className="flex flex-col gap-6">
      <nav aria-label="Check-offs" className="border-b border-rule print:hidden">
        <ul className="flex flex-wrap gap-1">
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
      <Outlet />
    </div>
  );
}
