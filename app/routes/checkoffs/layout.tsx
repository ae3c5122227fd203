import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { SectionTabs, type SectionTab } from "~/components/section-tabs";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:checkoffs")];

const TABS: SectionTab[] = [
  { to: "/checkoffs", label: "Check-offs", end: true },
  { to: "/checkoffs/orientation", label: "Orientation", end: false },
  { to: "/checkoffs/checklists", label: "Checklists", end: false },
  { to: "/checkoffs/signing-pin", label: "Signing PIN", end: false },
];

export default function CheckoffsLayout() {
  return (
    <div className="flex flex-col gap-6">
      <SectionTabs label="Check-offs" tabs={TABS} className="print:hidden" />
      <Outlet />
    </div>
  );
}
