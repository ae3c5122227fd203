import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { SectionTabs, type SectionTab } from "~/components/section-tabs";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:reports")];

const TABS: SectionTab[] = [
  { to: "/reports", label: "Overview", end: true },
  { to: "/reports/compliance", label: "Compliance", end: false },
  { to: "/reports/expiries", label: "Expiries", end: false },
  { to: "/reports/completions", label: "Completions", end: false },
  { to: "/reports/packet", label: "Survey packet", end: false },
];

export default function ReportsLayout() {
  return (
    <div className="flex flex-col gap-6">
      <SectionTabs label="Reports" tabs={TABS} />
      <div>
        <Outlet />
      </div>
    </div>
  );
}
