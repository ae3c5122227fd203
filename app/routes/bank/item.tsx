import { data, Form, Link, useLoaderData } from "react-router";
import { redirectWithToast } from "~/auth/flash.server";
import { notFound, requireViewer } from "~/auth/gate.server";
import { ItemPreview } from "~/components/bank/item-preview";
import { ItemStatusMark } from "~/components/bank/item-status-mark";
import { ScenarioSeeds, VersionDetails } from "~/components/bank/version-details";
import { AskTwice } from "~/components/admin/ask-twice";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { Button, buttonClass } from "~/components/ui/button";
import { FormErrors } from "~/components/ui/field";
import { getItem, getVersion, listTopics } from "~/db/queries/bank.server";
import { applyStep } from "~/db/queries/bank-write.server";
import { allowedSteps, editMode, LIFECYCLE_STEPS, STEP_LABELS, whyNot, type LifecycleStep } from "~/domain/bank/lifecycle";
import type { Route } from "./+types/item";

const DONE: Record<LifecycleStep, string> = {
  "send-to-review": "Sent to review. Another educator approves and publishes it.",
  "return-to-draft": "Returned to draft.",
  publish: "Approved and published: therapists' exams can draw it now.",
  retire: "Retired: new exams no longer draw it; past attempts keep it.",
  restore: "Published again.",
};

export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const item = await getItem(viewer.org.id, params.itemId);
  if (!item) notFound("We could not find that item in your organisation's bank.", true);
  const [version, topics] = await Promise.all([getVersion(viewer.org.id, item.id, item.currentVersion), listTopics(viewer.org.id)]);
  const step = { status: item.status, versionAuthorId: version!.row.createdBy, hasPublishedVersion: item.liveVersion !== null, viewerId: viewer.person.id };
  const publishBlocked = item.status === "in-review" ? whyNot("publish", step) : null;
  return { item, content: version!.content, topics, steps: allowedSteps(step), publishBlocked, editMode: editMode(item.status) };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const viewer = requireViewer(context, "bank:write");
  const form = await request.formData();
  const intent = String(form.get("intent") ?? "");
  if (!(LIFECYCLE_STEPS as readonly string[]).includes(intent)) throw data({ message: "Unknown action." }, { status: 400 });
  const step = intent as LifecycleStep;
  // Retiring is asked twice in place (STYLE.md "Forms"); the second answer carries confirm=yes.
  if (step === "retire" && form.get("confirm") !== "yes") throw data({ message: "Retiring an item needs a confirmation." }, { status: 400 });
  const result = await applyStep(viewer.org.id, viewer.person.id, params.itemId, step);
  if (!result.ok) {
    if (result.reason === "not-found") notFound("We could not find that item in your organisation's bank.", true);
    // In conform's reply shape, so the in-place confirmation (AskTwice) shows it too.
    return data({ error: { "": [result.reason] } }, { status: 409 });
  }
  return redirectWithToast(`/bank/items/${params.itemId}`, DONE[step]);
}

const when = new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" });

export default function ItemPage({ actionData }: Route.ComponentProps) {
  const { item, content, topics, steps, publishBlocked, editMode } = useLoaderData<typeof loader>();
  const topicNames = new Map(topics.map((t) => [t.slug, t.name]));
  return (
    <section aria-labelledby="item-heading" className="flex flex-col gap-5">
      <p>
        <Link to="/bank">← All items</Link>
      </p>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="item-heading" className="text-2xl font-semibold">
          Item, version {item.currentVersion}
        </h2>
        <p className="text-lg">
          <ItemStatusMark status={item.status} detail={item.liveVersion !== null && item.liveVersion !== item.currentVersion ? `version ${item.liveVersion} is published` : undefined} />
        </p>
      </div>
      {actionData && "error" in actionData ? <FormErrors id="item-step-errors" errors={actionData.error[""]} /> : null}
      <div className="flex flex-wrap items-center gap-2">
        {editMode !== "frozen" ? (
          <Link to={`/bank/items/${item.id}/edit`} className={buttonClass("secondary", "no-underline")}>
            {editMode === "new-version" ? "Edit (makes a new version)" : "Edit draft"}
          </Link>
        ) : null}
        <Form method="post" className="flex flex-wrap gap-2">
          {steps
            .filter((s) => s !== "retire")
            .map((s) => (
              <Button key={s} type="submit" name="intent" value={s} variant={s === "publish" || s === "send-to-review" ? "primary" : "secondary"}>
                {STEP_LABELS[s]}
              </Button>
            ))}
        </Form>
      </div>
      {steps.includes("retire") ? (
        <AskTwice
          id="retire-item"
          triggerLabel="Retire"
          question="Retire this item? New exams will no longer draw it; past attempts keep the version they saw, and you can return it to published later."
          confirmLabel="Yes, retire it"
          intent="retire"
        />
      ) : null}
      {publishBlocked ? <p className="text-muted">{publishBlocked}</p> : null}

      <VersionDetails content={content} topicNames={topicNames} />
      {content.scenario ? <ScenarioSeeds content={content} /> : null}
      <ItemPreview content={content} seed={content.scenario?.previewSeeds[0] ?? 1} />

      <LedgerTable caption="Versions" captionVisible>
        <thead>
          <tr>
            <Th numeric>Version</Th>
            <Th>Written by</Th>
            <Th>Approved by</Th>
            <Th numeric>Published (UTC)</Th>
          </tr>
        </thead>
        <tbody>
          {item.versions.map((v) => (
            <tr key={v.version}>
              <Td numeric>
                <Link to={`/bank/items/${item.id}/versions/${v.version}`}>Version {v.version}</Link>
              </Td>
              <Td>{v.createdBy ?? "—"}</Td>
              <Td>{v.reviewedBy ?? <span className="text-muted">Not yet</span>}</Td>
              <Td numeric>{v.publishedAt ? when.format(new Date(v.publishedAt)) : <span className="text-muted">—</span>}</Td>
            </tr>
          ))}
        </tbody>
      </LedgerTable>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Item · Bank · Tidemark" }];
