import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { SectionTabs, type SectionTab } from "~/components/section-tabs";
import { CautionFooter } from "~/components/caution";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:bank")];

const TABS: SectionTab[] = [
  { to: "/bank", label: "Items", end: true },
  { to: "/bank/items/new", label: "Write an item", end: false },
  { to: "/bank/import", label: "Import", end: false },
  { to: "/bank/exams", label: "Exams", end: false },
];

export default function BankLayout() {
  return (
    <div className="flex flex-col gap-6">
      <div>
        <h1 className="text-3xl font-semibold">Bank</h1>
        <SectionTabs label="Bank" tabs={TABS} className="mt-3" />
      </div>
      <Outlet />
      <CautionFooter />
    </div>
  );
}
