import { data, Link, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { forbidden, requireViewer } from "~/auth/gate.server";
import { AskTwice } from "~/components/admin/ask-twice";
import { CautionFooter } from "~/components/caution";
import { formatInstantDate } from "~/components/calendar-date";
import { TextField } from "~/components/ui/field";
import { ensureFeed, feedAddress, mayHaveUnitsFeed, resetFeed, UNITS_FEED_DAYS } from "~/db/queries/calendar-feeds.server";
import { listManagedUnits } from "~/db/queries/team.server";
import type { Route } from "./+types/calendar";

const CALENDAR_INTENTS = { resetPerson: "reset-person-feed", resetUnits: "reset-units-feed" } as const;

export async function loader({ context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:plan");
  const orgId = viewer.org.id;
  // The address is made on the first visit: a person who never opens this page has none.
  const mine = await ensureFeed(orgId, viewer.person.id, "person");
  const manager = mayHaveUnitsFeed(viewer.roles);
  const units = manager ? await ensureFeed(orgId, viewer.person.id, "units") : null;
  const managedUnits = manager ? await listManagedUnits(orgId, viewer.person.id) : [];
  return {
    timeZone: viewer.org.timeZone,
    unitsFeedDays: UNITS_FEED_DAYS,
    person: { address: feedAddress(mine.token), since: formatInstantDate(mine.createdAt, viewer.org.timeZone) },
    units: units ? { address: feedAddress(units.token), since: formatInstantDate(units.createdAt, viewer.org.timeZone), names: managedUnits.map((u) => u.name) } : null,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "section:plan");
  const formData = await request.formData();
  const intent = formData.get("intent");
  if (intent !== CALENDAR_INTENTS.resetPerson && intent !== CALENDAR_INTENTS.resetUnits) {
    throw data({ message: "That button does not do anything here. Reload the page and try again." }, { status: 400 });
  }
  if (formData.get("confirm") !== "yes") {
    return data({ status: "error" as const, error: { "": ["Confirm the reset with the second button: the old address stops working at once."] } }, { status: 400 });
  }
  if (intent === CALENDAR_INTENTS.resetUnits) {
    if (!mayHaveUnitsFeed(viewer.roles)) forbidden("Only a manager has a calendar of their units' expiries.");
    await resetFeed(viewer.org.id, viewer.person.id, "units");
    return redirectWithToast("/plan/calendar", "Your units' calendar has a new address. The old one no longer works: subscribe again with the new one.");
  }
  await resetFeed(viewer.org.id, viewer.person.id, "person");
  return redirectWithToast("/plan/calendar", "Your calendar has a new address. The old one no longer works: subscribe again with the new one.");
}

export default function PlanCalendar() {
  const { timeZone, person, units, unitsFeedDays } = useLoaderData<typeof loader>();
  return (
    <>
      <p className="text-sm">
        <Link to="/plan" className="underline">
          My plan
        </Link>
      </p>
      <h1 className="mt-2 text-3xl font-semibold">My calendar</h1>
      <p className="mt-2 max-w-3xl text-muted">
        Subscribe to this private address in your calendar app (“add calendar from URL” or “subscribe”). It shows your due dates, the
        last day each card, licence or completed exam is valid, and when your assigned exams are open — as all-day events on the
        dates of your organisation’s calendar ({timeZone}). Your calendar app refreshes it on its own schedule, often every few hours.
      </p>

      <FeedSection
        id="person-feed"
        heading="My dates"
        address={person.address}
        since={person.since}
        intent={CALENDAR_INTENTS.resetPerson}
        what="your calendar"
      />

      {units ? (
        <FeedSection
          id="units-feed"
          heading="Expiries in my units"
          address={units.address}
          since={units.since}
          intent={CALENDAR_INTENTS.resetUnits}
          what="your units’ calendar"
          detail={
            units.names.length > 0
              ? `Credentials and requirements of the people in ${units.names.join(", ")} whose last valid day falls in the next ${unitsFeedDays} days.`
              : `You manage no units yet, so this calendar is empty. Once you do, it lists what lapses there in the next ${unitsFeedDays} days.`
          }
        />
      ) : null}
      <CautionFooter />
    </>
  );
}

function FeedSection({ id, heading, address, since, intent, what, detail }: { id: string; heading: string; address: string; since: string; intent: string; what: string; detail?: string }) {
  return (
    <section aria-labelledby={`${id}-heading`} className="mt-8 max-w-3xl rounded-lg border border-rule bg-card px-6 py-6">
      <h2 id={`${id}-heading`} className="text-xl font-semibold">
        {heading}
      </h2>
      {detail ? <p className="mt-2">{detail}</p> : null}
      <TextField
        id={`${id}-address`}
        label="Private address"
        hint={`Anyone who has this address can read this calendar, so keep it to yourself. In use since ${since}.`}
        value={address}
        readOnly
        onFocus={(e) => e.currentTarget.select()}
        className="mt-4 flex flex-col gap-1"
      />
      <div className="mt-4">
        <AskTwice
          id={`${id}-reset`}
          triggerLabel="Reset the address"
          question={`Reset the address of ${what}? The current address stops working at once; you will need to subscribe again with the new one.`}
          confirmLabel="Yes, reset the address"
          intent={intent}
        />
      </div>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "My calendar · Tidemark" }];
