import { Outlet } from "react-router";
import { gate } from "~/auth/gate.server";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:clearance")];

export default function ClearanceLayout() {
  return <Outlet />;
}
