import { NavLink, Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { CautionFooter } from "~/components/caution";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:bank")];

const TABS = [
  { to: "/bank", label: "Items", end: true },
  { to: "/bank/items/new", label: "Write an item", end: false },
  { to: "/bank/import", label: "Import", end: false },
];

export default function BankLayout() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-3xl font-semibold">Bank</h1>
        <nav aria-label="Bank" className="mt-3 border-b border-rule">
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
      </div>
      <Outlet />
      <CautionFooter />
    </div>
  );
}
