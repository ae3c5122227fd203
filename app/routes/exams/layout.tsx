import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import { CautionFooter } from "~/components/caution";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:exams")];

export default function ExamsLayout() {
  return (
    <div className="flex flex-col gap-6">
      <Outlet />
      <CautionFooter />
    </div>
  );
}
