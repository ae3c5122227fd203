import { useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { can } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { PlanList } from "~/components/checkoffs/orientation-plans";
import { listOrientationPlans } from "~/db/queries/checkoffs-orientation.server";
import { calendarDateIn } from "~/domain/status";
import type { Route } from "./+types/orientation";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:checkoffs");
  const orgId = viewer.org.id;
  const seesAll = can(viewer.roles, "team:read");
  const [own, orientees, all] = await Promise.all([
    listOrientationPlans(orgId, { kind: "person", personId: viewer.person.id }),
    can(viewer.roles, "checkoffs:observe") ? listOrientationPlans(orgId, { kind: "preceptor", preceptorId: viewer.person.id }) : Promise.resolve([]),
    seesAll ? listOrientationPlans(orgId, { kind: "all" }) : Promise.resolve([]),
  ]);
  return { own, orientees, all, seesAll, today: calendarDateIn(viewer.org.timeZone, new Date()) };
}

export default function Orientation() {
  const { own, orientees, all, seesAll, today } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Orientation</h1>
      <p className="max-w-3xl text-muted">
        A new hire's plan: checklists and exams with target dates and an assigned preceptor. The plan is complete when every part is.
        “Current” marks a part that is done; “Lapsed” one past its target date.
      </p>
      {own.length > 0 ? <PlanList heading="My orientation plan" plans={own} today={today} /> : null}
      {orientees.length > 0 ? <PlanList heading="My orientees" plans={orientees} today={today} /> : null}
      {seesAll ? <PlanList heading="Everyone in orientation" plans={all} today={today} /> : null}
      {own.length === 0 && orientees.length === 0 && !seesAll ? <p>You have no orientation plan, and no orientees.</p> : null}
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Orientation · Check-offs · Tidemark" }];
