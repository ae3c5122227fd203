/**
 * A private calendar feed (issue 10 §3). Public: calendar apps fetch it without a session, and
 * the unguessable token in the address is the key. Any token that does not open a feed — never
 * issued, reset, malformed, its person inactive — gets the same bare 404, so the answer tells a
 * guesser nothing.
 */
import { calendarResponse, renderCalendar } from "~/calendar/ics.server";
import { findFeedByToken, personFeedEvents, unitsFeedEvents } from "~/db/queries/calendar-feeds.server";
import type { Route } from "./+types/calendar-feed";

function bare404(): Response {
  return new Response("Not found", { status: 404, headers: { "Content-Type": "text/plain; charset=utf-8", "Cache-Control": "no-store" } });
}

export async function loader({ params }: Route.LoaderArgs) {
  // Calendar apps often ask for "…/token.ics"; the suffix is not part of the token.
  const token = (params.token ?? "").replace(/\.ics$/i, "");
  const owner = await findFeedByToken(token);
  if (!owner) return bare404();
  const now = new Date();
  if (owner.kind === "units") {
    return calendarResponse(renderCalendar(`Tidemark: expiries in ${owner.personName}'s units`, await unitsFeedEvents(owner, now), now));
  }
  return calendarResponse(renderCalendar(`Tidemark: ${owner.personName}`, await personFeedEvents(owner, now), now));
}
