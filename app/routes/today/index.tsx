import { Link, useLoaderData } from "react-router";
import { notFound, requireViewer } from "~/auth/gate.server";
import { can, type Role } from "~/auth/roles";
import { CautionFooter } from "~/components/caution";
import { CalendarDate } from "~/components/calendar-date";
import { PlanTable } from "~/components/plan-table";
import {
  countForEducator,
  countForUnits,
  countOrganisation,
  getOrientationPlan,
  getProfile,
  listOrientees,
  statusOptionsFor,
} from "~/db/queries/people.server";
import { getPlan } from "~/db/queries/plan.server";
import { outstandingStatus } from "~/domain/status";
import { OrientationSection } from "./orientation-section";
import { ProfileCard } from "./profile-card";
import { RoleLines } from "./role-lines";
import type { Route } from "./+types/index";

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:today");
  const orgId = viewer.org.id;
  const timeZone = viewer.org.timeZone;
  const options = await statusOptionsFor(orgId, timeZone);
  const profile = await getProfile(orgId, viewer.person.id);
  if (!profile) notFound("We could not find your record in this organisation.");
  const has = (role: Role) => viewer.roles.includes(role);

  const [plan, orientation, unitCounts, educator, orientees, organisation] = await Promise.all([
    getPlan(orgId, viewer.person.id, timeZone, options),
    getOrientationPlan(orgId, viewer.person.id),
    has("manager") ? countForUnits(orgId, profile.managedUnits, options) : null,
    has("educator") ? countForEducator(orgId, viewer.person.id, options.today) : null,
    has("preceptor") ? listOrientees(orgId, viewer.person.id) : null,
    has("admin") ? countOrganisation(orgId) : null,
  ]);
  const rows = plan ?? [];
  return {
    today: options.today,
    reminderDays: options.reminderDays,
    timeZone,
    orgName: viewer.org.name,
    profile,
    canSeePlan: can(viewer.roles, "section:plan"),
    canSeeTeam: can(viewer.roles, "section:team"),
    canSeeClearance: can(viewer.roles, "section:clearance"),
    credentials: rows.filter((r) => r.kind === "credential"),
    // Open work: exams and check-offs not yet done (a met one carries a valid-through date instead).
    work: rows.filter((r) => r.kind !== "credential" && r.dateMeaning === "due"),
    orientation: orientation && {
      ...orientation,
      items: orientation.items.map((item) => ({
        id: item.id,
        kind: item.kind,
        title: item.title,
        dueOn: item.dueOn,
        completedAt: item.completedAt ? item.completedAt.toISOString() : null,
        status: item.completedAt ? null : outstandingStatus(item.dueOn, options),
      })),
    },
    lines: { unitCounts, educator, orientees, organisation },
  };
}

export type TodayData = Awaited<ReturnType<typeof loader>>;

export default function Today() {
  const data = useLoaderData<typeof loader>();
  const { profile, credentials, work, orientation } = data;
  const firstName = profile.name.split(/\s+/)[0];
  const nothingRecorded = credentials.length === 0 && work.length === 0 && !orientation;
  return (
    <>
      <p className="text-sm font-semibold text-muted">
        <CalendarDate value={data.today} long />
      </p>
      <h1 className="mt-1 text-3xl font-semibold">Welcome, {firstName}</h1>

      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <div className="flex flex-col gap-6">
          <RoleLines lines={data.lines} orgName={data.orgName} canSeeTeam={data.canSeeTeam} />

          {nothingRecorded ? (
            <section aria-labelledby="today-empty" className="rounded-lg border border-rule bg-card px-6 py-8">
              <h2 id="today-empty" className="text-xl font-semibold">
                Nothing is recorded about you yet
              </h2>
              <p className="mt-2">
                No licences, cards, exams or check-offs are on file for you. When your manager records a licence or a
                life-support card, or your educator assigns an exam or a check-off, it appears here with its dates, so you
                can see at a glance what is current and what falls due next.
              </p>
            </section>
          ) : null}

          {work.length > 0 ? (
            <section aria-labelledby="today-work" className="rounded-lg border border-rule bg-card px-4 py-4">
              <h2 id="today-work" className="text-xl font-semibold">
                Your open work
              </h2>
              <PlanTable rows={work} dateHeader="Due" caption="Exams and check-offs assigned to you, soonest first" />
              <p className="mt-3 flex flex-wrap gap-x-6 gap-y-2">
                {work.some((r) => r.kind === "exam") ? (
                  <Link to="/exams" className="font-semibold">
                    Take or resume your exams
                  </Link>
                ) : null}
                {work.some((r) => r.kind === "checklist") ? (
                  <Link to="/checkoffs" className="font-semibold">
                    Ask a preceptor for a check-off
                  </Link>
                ) : null}
              </p>
            </section>
          ) : null}

          {credentials.length > 0 ? (
            <section aria-labelledby="today-credentials" className="rounded-lg border border-rule bg-card px-4 py-4">
              <h2 id="today-credentials" className="text-xl font-semibold">
                Your credentials
              </h2>
              <PlanTable rows={credentials} showKind={false} dateHeader="Valid through" caption={`Licences and cards on file, soonest to lapse first. “Due soon” means within ${data.reminderDays} days.`} />
            </section>
          ) : null}

          {orientation ? <OrientationSection plan={orientation} timeZone={data.timeZone} /> : null}

          {data.canSeePlan && !nothingRecorded ? (
            <p>
              <Link to="/plan" className="font-semibold">
                See everything in your plan, in due-date order
              </Link>
            </p>
          ) : null}
          {data.canSeeClearance ? (
            <p>
              <Link to="/clearance" className="font-semibold">
                The Clearance board: who is cleared for what today
              </Link>
            </p>
          ) : null}
        </div>

        <ProfileCard profile={profile} orgName={data.orgName} timeZone={data.timeZone} />
      </div>
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Today · Tidemark" }];
