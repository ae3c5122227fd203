import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { ReinstatementNote } from "./reinstatement-note";

// TESTING.md C4 (NBRC, "Credential Maintenance & State License Renewal"): a board credential that
// expired 2026-04-30 can be reinstated within 6 months — on 2026-09-15 yes, on 2026-11-15 no.
const board = { status: "lapsed" as const, validThrough: "2026-04-30", reinstatementMonths: 6 };

describe("the reinstatement note on a lapsed credential", () => {
  it("within the window: says until when it can be reinstated", () => {
    expect(renderToStaticMarkup(<ReinstatementNote {...board} today="2026-09-15" />)).toContain("Can still be reinstated through 31 Oct 2026");
  });
  it("after the window: says a new exam is needed", () => {
    expect(renderToStaticMarkup(<ReinstatementNote {...board} today="2026-11-15" />)).toContain("a new exam is needed");
  });
  it("says nothing for a current card or a type without a window", () => {
    expect(renderToStaticMarkup(<ReinstatementNote {...board} status="current" today="2026-03-01" />)).toBe("");
    expect(renderToStaticMarkup(<ReinstatementNote {...board} reinstatementMonths={null} today="2026-09-15" />)).toBe("");
  });
});
