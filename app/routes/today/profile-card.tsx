/** "Who you are" on Today: the person's record as the organisation holds it. */
import type { ReactNode } from "react";
import { ROLE_LABELS } from "~/auth/roles";
import { CalendarDate } from "~/components/calendar-date";
import type { TodayData } from "./index";

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="border-b border-rule py-2 last:border-b-0">
      <dt className="text-sm text-muted">{term}</dt>
      <dd>{children}</dd>
    </div>
  );
}

const notRecorded = <span className="text-muted">Not recorded</span>;

export function ProfileCard({ profile, orgName, timeZone }: { profile: TodayData["profile"]; orgName: string; timeZone: string }) {
  return (
    <section aria-labelledby="today-who" className="self-start rounded-lg border border-rule bg-card px-5 py-4">
      <h2 id="today-who" className="text-xl font-semibold">
        Who you are
      </h2>
      <dl className="mt-2">
        <Row term="Name">
          {profile.name}
          {profile.credentialLetters ? <span className="text-muted">, {profile.credentialLetters}</span> : null}
        </Row>
        <Row term="Title">{profile.title ?? notRecorded}</Row>
        <Row term="Employee id">{profile.employeeId ?? notRecorded}</Row>
        <Row term="Organisation">
          {orgName}
          <span className="block text-sm text-muted">Dates are shown in its time zone, {timeZone}.</span>
        </Row>
        <Row term="Home unit">{profile.homeUnit?.name ?? notRecorded}</Row>
        <Row term="Other units">{profile.otherUnits.length > 0 ? profile.otherUnits.map((u) => u.name).join(", ") : <span className="text-muted">None</span>}</Row>
        {profile.managedUnits.length > 0 ? <Row term="Units you manage">{profile.managedUnits.map((u) => u.name).join(", ")}</Row> : null}
        <Row term="Roles">{profile.roles.length > 0 ? profile.roles.map((r) => ROLE_LABELS[r]).join(", ") : notRecorded}</Row>
        <Row term="Hire date">{profile.hireDate ? <CalendarDate value={profile.hireDate} /> : notRecorded}</Row>
      </dl>
    </section>
  );
}
