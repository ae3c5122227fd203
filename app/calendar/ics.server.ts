/**
 * Writes calendar events as an iCalendar (RFC 5545) document with ical-generator, and answers
 * the feed request: text/calendar, private caching (the address itself is the key).
 */
import ical from "ical-generator";
import type { CalendarEvent } from "~/domain/calendar/events";

export function renderCalendar(name: string, events: readonly CalendarEvent[], now: Date): string {
  const calendar = ical({
    name,
    prodId: { company: "Tidemark", product: "Tidemark", language: "EN" },
    // Calendar apps refresh a subscription at their own pace; this asks for about twice a day.
    ttl: 12 * 60 * 60,
  });
  for (const e of events) {
    // DATE values as 'YYYY-MM-DD' strings: ical-generator writes them as DTSTART;VALUE=DATE
    // without passing through a Date, so no process time zone can move the day.
    calendar.createEvent({ id: e.uid, start: e.start, end: e.end, allDay: true, summary: e.summary, description: e.description, url: e.url, stamp: now });
  }
  return calendar.toString();
}

export function calendarResponse(body: string): Response {
  return new Response(body, {
    status: 200,
    headers: {
      "Content-Type": "text/calendar; charset=utf-8",
      "Cache-Control": "private, max-age=300",
      "X-Content-Type-Options": "nosniff",
    },
  });
}
