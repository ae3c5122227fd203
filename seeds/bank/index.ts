/**
 * The demo question bank: every item written for Tidemark (concepts, reasoning, mechanics,
 * scenario and waveform-point items), each with a rationale and a published reference. Most
 * are published — written by one educator and approved by the other, as the review rule
 * requires — and a few are left in draft or in review so the lifecycle shows on the page.
 * Deterministic: ids from stable keys, timestamps from the demo day.
 */
import type { Dataset } from "../dataset";
import type { OrgContext } from "../catalogue";
import { canonicalContent } from "../../app/domain/bank/interchange";
import type { ItemStatus } from "../../app/domain/bank/lifecycle";
import { SCENARIO_ITEMS, WAVEFORM_ITEMS } from "./bench-items";
import type { DemoItem } from "./builders";
import { CONCEPT_ITEMS } from "./concepts";
import { MECHANICS_ITEMS } from "./mechanics";
import { REASONING_ITEMS } from "./reasoning";

export const DEMO_BANK: readonly DemoItem[] = [...CONCEPT_ITEMS, ...REASONING_ITEMS, ...MECHANICS_ITEMS, ...SCENARIO_ITEMS, ...WAVEFORM_ITEMS];

/** Items left unpublished in the demo, so every lifecycle state is on show. */
export const DEMO_UNPUBLISHED: Record<string, ItemStatus> = {
  "async-mortality": "in-review",
  "calc-elastance": "in-review",
  "calc-driving-2": "draft",
  "scn-alarm-3": "draft",
};

export type BankRows = Pick<Dataset, "items" | "itemVersions" | "itemVersionTopics">;

/** Adds the bank to an organisation's dataset; `educators` are [author A, author B]. */
export function addBank(ctx: OrgContext, educators: readonly [string, string]): void {
  DEMO_BANK.forEach((demo, i) => {
    const itemId = ctx.id("item", demo.key);
    const versionId = ctx.id("item-version", demo.key, 1);
    // The two educators take turns writing; the other one approves.
    const author = educators[i % 2];
    const reviewer = educators[(i + 1) % 2];
    const status = DEMO_UNPUBLISHED[demo.key] ?? "published";
    const c = canonicalContent(demo.content);
    ctx.data.items.push({ id: itemId, orgId: ctx.orgId, status, currentVersionId: versionId, authorId: author, createdAt: ctx.at, updatedAt: ctx.at });
    ctx.data.itemVersions.push({
      id: versionId,
      orgId: ctx.orgId,
      itemId,
      version: 1,
      type: c.type,
      stem: c.stem,
      body: c.body,
      scenario: c.scenario,
      rationale: c.rationale,
      reference: c.reference,
      createdBy: author,
      reviewedBy: status === "published" ? reviewer : null,
      publishedAt: status === "published" ? ctx.at : null,
      createdAt: ctx.at,
    });
    for (const slug of c.topics) ctx.data.itemVersionTopics.push({ itemVersionId: versionId, topicId: ctx.id("topic", slug) });
  });
}
