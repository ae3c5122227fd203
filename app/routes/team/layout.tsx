import { Outlet, useLoaderData } from "react-router";
import { gate, requireViewer } from "~/auth/gate.server";
import { can, type Permission } from "~/auth/roles";
import { SectionTabs, type SectionTab } from "~/components/section-tabs";
import type { Route } from "./+types/layout";

export const middleware: Route.MiddlewareFunction[] = [gate("section:team")];

const TABS: (SectionTab & { permission: Permission })[] = [
  { to: "/team", label: "People", end: true, permission: "team:read" },
  { to: "/team/matrix", label: "Compliance", end: false, permission: "team:read" },
  { to: "/team/requirements", label: "Requirements", end: false, permission: "team:read" },
  { to: "/team/accommodations", label: "Exam time", end: false, permission: "exams:accommodate" },
];

/** Only the tabs the viewer's roles open (the pages check again in their own loaders). */
export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:team");
  return { tabs: TABS.filter((t) => can(viewer.roles, t.permission)).map(({ to, label, end }) => ({ to, label, end })) };
}

export default function TeamLayout() {
  const { tabs } = useLoaderData<typeof loader>();
  return (
    <div className="flex flex-col gap-6">
      <SectionTabs label="Team" tabs={tabs} />
      <div>
        <Outlet />
      </div>
    </div>
  );
}
