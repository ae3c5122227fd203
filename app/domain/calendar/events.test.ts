import { describe, expect, it } from "vitest";
import type { PlanRow } from "~/domain/status/plan";
import { examWindowEvents, expiryEvents, planEvents } from "./events";

const row = (over: Partial<PlanRow> & Pick<PlanRow, "key" | "kind" | "title" | "dateMeaning">, date: string | null): PlanRow => ({
  result: { status: "current", date, daysLeft: null, daysLapsed: null },
  extendedTo: null,
  credential: null,
  ...over,
});

describe("calendar events", () => {
  it("puts a due date and a last valid day on that day, with DTEND the next day (RFC 5545 §3.6.1: DTEND is non-inclusive)", () => {
    const events = planEvents(
      [
        row({ key: "assignment:a1", kind: "exam", title: "Airway clearance exam", dateMeaning: "due" }, "2026-12-31"),
        row({ key: "credential:c1", kind: "credential", title: "State licence", dateMeaning: "valid-through" }, "2028-02-29"),
        row({ key: "requirement:r1", kind: "checklist", title: "No date", dateMeaning: "due" }, null),
      ],
      "p1",
      "https://tidemark.test/plan",
    );
    expect(events.map((e) => [e.summary, e.start, e.end])).toEqual([
      ["Exam due: Airway clearance exam", "2026-12-31", "2027-01-01"],
      ["Expires: State licence (last day valid)", "2028-02-29", "2028-03-01"],
    ]);
    expect(events[1].description).toBe("State licence is valid through 29 February 2028, that day included. Renew it and upload the new card before then.");
  });

  it("keeps UIDs stable for the same row and distinct across people and feeds", () => {
    const r = row({ key: "requirement:r1", kind: "exam", title: "X", dateMeaning: "due" }, "2027-01-10");
    const moved = row({ key: "requirement:r1", kind: "exam", title: "X", dateMeaning: "due" }, "2027-02-10");
    expect(planEvents([r], "p1", "u")[0].uid).toBe(planEvents([moved], "p1", "u")[0].uid);
    expect(planEvents([r], "p1", "u")[0].uid).not.toBe(planEvents([r], "p2", "u")[0].uid);
    const unit = expiryEvents([{ personId: "p1", name: "A", requirementId: "r1", requirement: "X", validThrough: "2027-01-10" }], "m1", () => "u")[0];
    expect(unit.uid).not.toBe(planEvents([r], "p1", "u")[0].uid);
    expect(unit.uid).toMatch(/^[A-Za-z0-9_.-]+@tidemark$/);
  });

  it("draws an exam window as a span, or one day when only one end is set, and nothing when always open", () => {
    const events = examWindowEvents(
      [
        { examId: "e1", title: "Both", availableFrom: "2027-01-04", availableUntil: "2027-01-31" },
        { examId: "e2", title: "From", availableFrom: "2027-03-01", availableUntil: null },
        { examId: "e3", title: "Until", availableFrom: null, availableUntil: "2027-04-30" },
        { examId: "e4", title: "Open", availableFrom: null, availableUntil: null },
      ],
      "p1",
      "https://tidemark.test/exams",
    );
    expect(events.map((e) => [e.summary, e.start, e.end])).toEqual([
      ["Exam open: Both", "2027-01-04", "2027-02-01"],
      ["Exam opens: From", "2027-03-01", "2027-03-02"],
      ["Last day to take: Until", "2027-04-30", "2027-05-01"],
    ]);
  });
});
