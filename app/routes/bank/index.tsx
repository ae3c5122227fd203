import { Form, Link, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { ItemStatusMark } from "~/components/bank/item-status-mark";
import { buttonClass } from "~/components/ui/button";
import { FilterActions } from "~/components/ui/filter-actions";
import { SelectField, TextField } from "~/components/ui/field";
import { listAuthors, listItems, listTopics, type BankFilter } from "~/db/queries/bank.server";
import { ITEM_TYPE_LABELS, ITEM_TYPE_LIST, type ItemType } from "~/domain/bank/item-content";
import { ITEM_STATUS_LIST, ITEM_STATUS_WORDS } from "~/domain/bank/lifecycle";
import type { Route } from "./+types/index";

function readFilter(url: URL): BankFilter {
  const get = (k: string) => (url.searchParams.get(k) ?? "").trim().slice(0, 200);
  const type = get("type");
  const status = get("status");
  return {
    q: get("q"),
    topic: get("topic"),
    type: (ITEM_TYPE_LIST as string[]).includes(type) ? type : "",
    status: (ITEM_STATUS_LIST as readonly string[]).includes(status) ? status : "",
    author: get("author"),
    sort: get("sort") === "oldest" ? "oldest" : "changed",
  };
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "bank:write");
  const filter = readFilter(new URL(request.url));
  const [rows, topics, authors] = await Promise.all([listItems(viewer.org.id, filter), listTopics(viewer.org.id), listAuthors(viewer.org.id)]);
  return { filter, rows, topics, authors };
}

/** A stem that is only the template's own question reads as the template's title. */
function linkText(stem: string, templateTitle: string | null): string {
  const text = templateTitle && stem.replace(/\{prompt\}/g, "").trim() === "" ? templateTitle : stem;
  return text.length > 140 ? `${text.slice(0, 140)}…` : text;
}

const dateFormat = new Intl.DateTimeFormat("en-US", { dateStyle: "medium", timeZone: "UTC" });

export default function BankIndex() {
  const { filter, rows, topics, authors } = useLoaderData<typeof loader>();
  const topicName = new Map(topics.map((t) => [t.slug, t.name]));
  const filtered = !!(filter.q || filter.topic || filter.type || filter.status || filter.author);
  const exportQuery = filter.status ? `&status=${filter.status}` : "";
  return (
    <section aria-labelledby="items-heading" className="flex flex-col gap-5">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <h2 id="items-heading" className="text-2xl font-semibold">
          Items
        </h2>
        <div className="flex flex-wrap gap-2">
          <a href={`/bank/export?format=csv${exportQuery}`} className={buttonClass("secondary", "no-underline")} download>
            Export CSV
          </a>
          <a href={`/bank/export?format=json${exportQuery}`} className={buttonClass("secondary", "no-underline")} download>
            Export JSON
          </a>
          <Link to="/bank/items/new" className={buttonClass("primary", "no-underline")}>
            Write an item
          </Link>
        </div>
      </div>

      <Form method="get" role="search" aria-label="Find items" className="grid gap-x-4 rounded-md border border-rule bg-card p-4 md:grid-cols-3 lg:grid-cols-[2fr_1fr_1fr_1fr_1fr_1fr]">
        <TextField id="bank-q" name="q" type="search" label="Search" hint="Words of the stem or reference" defaultValue={filter.q} autoComplete="off" />
        <SelectField id="bank-topic" name="topic" label="Topic" defaultValue={filter.topic} options={[{ value: "", label: "All topics" }, ...topics.map((t) => ({ value: t.slug, label: t.name }))]} />
        <SelectField
          id="bank-type"
          name="type"
          label="Type"
          defaultValue={filter.type}
          options={[{ value: "", label: "All types" }, ...ITEM_TYPE_LIST.map((t) => ({ value: t, label: ITEM_TYPE_LABELS[t] }))]}
        />
        <SelectField
          id="bank-status"
          name="status"
          label="Status"
          defaultValue={filter.status}
          options={[{ value: "", label: "All statuses" }, ...ITEM_STATUS_LIST.map((s) => ({ value: s, label: ITEM_STATUS_WORDS[s] }))]}
        />
        <SelectField id="bank-author" name="author" label="Author" defaultValue={filter.author} options={[{ value: "", label: "Anyone" }, ...authors.map((a) => ({ value: a.id, label: a.name }))]} />
        <SelectField
          id="bank-sort"
          name="sort"
          label="Last change"
          defaultValue={filter.sort}
          options={[
            { value: "changed", label: "Newest first" },
            { value: "oldest", label: "Oldest first" },
          ]}
        />
        <FilterActions clearTo="/bank" filtered={filtered} />
      </Form>

      <p role="status" aria-live="polite" className="text-muted">
        {rows.length === 0 ? (filtered ? "No item matches. Try fewer words or clear the filters." : "No items yet. Write the first one.") : `${rows.length} ${rows.length === 1 ? "item" : "items"}.`}
      </p>

      {rows.length > 0 ? (
        <LedgerTable caption="Items of the question bank">
          <thead>
            <tr>
              <Th>Stem</Th>
              <Th>Type</Th>
              <Th>Topics</Th>
              <Th>Status</Th>
              <Th numeric>Version</Th>
              <Th>Author</Th>
              <Th numeric>Last change</Th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.id}>
                <Td className="max-w-xl">
                  <Link to={`/bank/items/${r.id}`} className="font-semibold">
                    {linkText(r.stem, r.templateTitle)}
                  </Link>
                  {r.templateTitle ? <span className="block text-sm text-muted">From the bench: {r.templateTitle}</span> : null}
                </Td>
                <Td>
                  {ITEM_TYPE_LABELS[r.type as ItemType]}
                  {r.scenario ? <span className="block text-sm text-muted">Scenario</span> : null}
                </Td>
                <Td className="text-sm">{r.topics.map((t) => topicName.get(t) ?? t).join(", ")}</Td>
                <Td>
                  <ItemStatusMark status={r.status} detail={r.liveVersion !== null && r.liveVersion !== r.version && r.status !== "published" ? `v${r.liveVersion} live` : undefined} />
                </Td>
                <Td numeric>{r.version}</Td>
                <Td>{r.author ?? <span className="text-muted">—</span>}</Td>
                <Td numeric className="whitespace-nowrap">
                  {dateFormat.format(new Date(r.updatedAt))}
                </Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      ) : null}
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Items · Bank · Tidemark" }];
