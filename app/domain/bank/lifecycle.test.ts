import { describe, expect, it } from "vitest";
import { allowedSteps, editMode, whyNot } from "./lifecycle";

const ctx = (status: Parameters<typeof allowedSteps>[0]["status"], author = "a", viewer = "b", hasPublishedVersion = false) => ({ status, versionAuthorId: author, viewerId: viewer, hasPublishedVersion });

describe("item lifecycle", () => {
  it("draft → in review → published → retired, one step at a time", () => {
    expect(allowedSteps(ctx("draft"))).toEqual(["send-to-review"]);
    expect(allowedSteps(ctx("in-review"))).toEqual(["return-to-draft", "publish"]);
    expect(allowedSteps(ctx("published"))).toEqual(["retire"]);
    expect(allowedSteps(ctx("retired", "a", "b", true))).toEqual(["restore"]);
  });

  it("publishing needs a second educator: the version's writer cannot approve it", () => {
    expect(whyNot("publish", ctx("in-review", "a", "a"))).toMatch(/second educator/);
    expect(whyNot("publish", ctx("in-review", "a", "b"))).toBeNull();
  });

  it("a published or retired item is edited as a new version; an item in review is frozen", () => {
    expect(editMode("draft")).toBe("in-place");
    expect(editMode("in-review")).toBe("frozen");
    expect(editMode("published")).toBe("new-version");
    expect(editMode("retired")).toBe("new-version");
  });
});
