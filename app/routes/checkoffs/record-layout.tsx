import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import type { Route } from "./+types/record-layout";

/** The printable record, its PDF and its evidence: the same gate as the Check-offs section. */
export const middleware: Route.MiddlewareFunction[] = [gate("section:checkoffs")];

export default function RecordLayout() {
  return <Outlet />;
}
