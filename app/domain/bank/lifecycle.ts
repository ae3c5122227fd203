/**
 * An item's lifecycle (PRODUCT.md "Item"): draft → in review → published → retired, with the
 * rule that publishing needs a second educator — never the person who wrote the version under
 * review (the "four eyes" principle of review; common practice, no source). One policy
 * function per step, used by the action (to refuse) and the page (to hide the button).
 */
export const ITEM_STATUS_LIST = ["draft", "in-review", "published", "retired"] as const;
export type ItemStatus = (typeof ITEM_STATUS_LIST)[number];

export const ITEM_STATUS_WORDS: Record<ItemStatus, string> = {
  draft: "Draft",
  "in-review": "In review",
  published: "Published",
  retired: "Retired",
};

export const LIFECYCLE_STEPS = ["send-to-review", "return-to-draft", "publish", "retire", "restore"] as const;
export type LifecycleStep = (typeof LIFECYCLE_STEPS)[number];

export const STEP_LABELS: Record<LifecycleStep, string> = {
  "send-to-review": "Send to review",
  "return-to-draft": "Return to draft",
  publish: "Approve and publish",
  retire: "Retire",
  restore: "Return to published",
};

/** The status each step leads to. */
export const STEP_TARGET: Record<LifecycleStep, ItemStatus> = {
  "send-to-review": "in-review",
  "return-to-draft": "draft",
  publish: "published",
  retire: "retired",
  restore: "published",
};

export type StepContext = {
  status: ItemStatus;
  /** Who wrote the current version. */
  versionAuthorId: string | null;
  /** Whether an earlier version is published (restore returns to it). */
  hasPublishedVersion: boolean;
  viewerId: string;
};

/** Why a step is not allowed now, or null when it is. */
export function whyNot(step: LifecycleStep, c: StepContext): string | null {
  switch (step) {
    case "send-to-review":
      return c.status === "draft" ? null : "Only a draft can be sent to review.";
    case "return-to-draft":
      return c.status === "in-review" ? null : "Only an item in review can be returned to draft.";
    case "publish":
      if (c.status !== "in-review") return "Only an item in review can be published.";
      if (c.versionAuthorId === c.viewerId) return "A second educator must approve: you wrote this version.";
      return null;
    case "retire":
      return c.status === "published" ? null : "Only a published item can be retired.";
    case "restore":
      return c.status === "retired" && c.hasPublishedVersion ? null : "Only a retired item that was published can return to published.";
  }
}

export function allowedSteps(c: StepContext): LifecycleStep[] {
  return LIFECYCLE_STEPS.filter((s) => whyNot(s, c) === null);
}

/**
 * Editing: a draft is changed in place; a published or retired item gets a new version (the
 * old one stays as it was, for every attempt that saw it); an item in review is frozen until
 * its reviewer returns it.
 */
export function editMode(status: ItemStatus): "in-place" | "new-version" | "frozen" {
  if (status === "draft") return "in-place";
  if (status === "in-review") return "frozen";
  return "new-version";
}
