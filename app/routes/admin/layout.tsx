import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { SectionTabs, type SectionTab } from "~/components/section-tabs";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:admin")];

const TABS: SectionTab[] = [
  { to: "/admin", label: "Organisation", end: true },
  { to: "/admin/units", label: "Units", end: false },
  { to: "/admin/people", label: "People", end: false },
  { to: "/admin/roster", label: "Roster import", end: false },
  { to: "/admin/references", label: "Regulatory references", end: false },
  { to: "/admin/reminders", label: "Reminders", end: false },
  { to: "/admin/audit", label: "Audit trail", end: false },
  { to: "/admin/api", label: "API", end: false },
];

export default function AdminLayout() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-3xl font-semibold">Admin</h1>
        <SectionTabs label="Admin" tabs={TABS} className="mt-3" />
      </div>
      <Outlet />
    </div>
  );
}
