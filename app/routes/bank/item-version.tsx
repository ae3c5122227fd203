import { Link, useLoaderData } from "react-router";
import { notFound, requireViewer } from "~/auth/gate.server";
import { ItemPreview } from "~/components/bank/item-preview";
import { ScenarioSeeds, VersionDetails } from "~/components/bank/version-details";
import { getVersion, listTopics } from "~/db/queries/bank.server";
import type { Route } from "./+types/item-version";

/** Any version, exactly as it was: what a past attempt saw. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const n = Number(params.version);
  const version = Number.isInteger(n) && n > 0 ? await getVersion(viewer.org.id, params.itemId, n) : null;
  if (!version) notFound("We could not find that version in your organisation's bank.", true);
  return {
    itemId: params.itemId,
    version: n,
    published: version.row.publishedAt !== null,
    content: version.content,
    topics: await listTopics(viewer.org.id),
  };
}

export default function ItemVersion() {
  const { itemId, version, published, content, topics } = useLoaderData<typeof loader>();
  return (
    <section aria-labelledby="version-heading" className="flex flex-col gap-5">
      <p>
        <Link to={`/bank/items/${itemId}`}>← Back to the item</Link>
      </p>
      <h2 id="version-heading" className="text-2xl font-semibold">
        Version {version}
      </h2>
      <p className="text-muted">{published ? "This version was published; it never changes." : "This version has not been published."}</p>
      <VersionDetails content={content} topicNames={new Map(topics.map((t) => [t.slug, t.name]))} />
      {content.scenario ? <ScenarioSeeds content={content} /> : null}
      <ItemPreview content={content} seed={content.scenario?.previewSeeds[0] ?? 1} />
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Item version · Bank · Tidemark" }];
