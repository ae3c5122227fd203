import { Form, useLoaderData } from "react-router";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { CautionFooter } from "~/components/caution";
import { Button } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { packetChoices } from "~/db/queries/report-packet.server";
import { reportViewer } from "./report-load.server";
import type { Route } from "./+types/packet";

export async function loader({ request, context }: Route.LoaderArgs) {
  const { viewer, scope } = await reportViewer(context);
  const q = (new URL(request.url).searchParams.get("q") ?? "").slice(0, 100);
  const choices = await packetChoices(viewer.org.id, scope, q);
  return { q, ...choices };
}

export default function PacketPage() {
  const { q, units, people, matching } = useLoaderData<typeof loader>();
  return (
    <>
      <h1 className="text-3xl font-semibold">Survey evidence packet</h1>
      <p className="mt-2 max-w-3xl text-muted">
        One PDF for a person or a whole unit: every requirement with its status today and its evidence — credential numbers, issuers, dates and who verified them; exam attempts with
        score and date; check-offs with method, assessor, outcome and signatures — and the person's certificates.
      </p>

      <section aria-labelledby="packet-unit-heading" className="mt-6 flex flex-col gap-2">
        <h2 id="packet-unit-heading" className="text-2xl font-semibold">
          A unit
        </h2>
        {units.length === 0 ? (
          <p className="text-muted">You do not manage any units yet.</p>
        ) : (
          <ul className="flex flex-col gap-1">
            {units.map((u) => (
              <li key={u.id}>
                <a href={`/reports/packet.pdf?unit=${encodeURIComponent(u.id)}`} download className="inline-flex min-h-11 items-center font-semibold">
                  Packet for everyone on {u.name} (PDF)
                </a>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="packet-person-heading" className="mt-6 flex flex-col gap-2">
        <h2 id="packet-person-heading" className="text-2xl font-semibold">
          One person
        </h2>
        <Form method="get" role="search" aria-label="People" className="flex max-w-2xl flex-wrap items-start gap-3">
          <TextField id="packet-q" name="q" type="search" label="Search by name or employee id" defaultValue={q} maxLength={100} className="flex min-w-64 flex-1 flex-col gap-1" />
          <div className="pt-8">
            <Button type="submit">Search</Button>
          </div>
        </Form>
        <p aria-live="polite">
          {matching === 0
            ? q
              ? `No one matches “${q}”.`
              : "No one to show."
            : matching > people.length
              ? `Showing the first ${people.length} of ${matching} people; search to narrow the list.`
              : `${matching} ${matching === 1 ? "person" : "people"}.`}
        </p>
        {people.length > 0 ? (
          <LedgerTable caption="People you may make a packet for">
            <thead>
              <tr>
                <Th>Name</Th>
                <Th>Employee id</Th>
                <Th>Home unit</Th>
                <Th>Packet</Th>
              </tr>
            </thead>
            <tbody>
              {people.map((p) => (
                <tr key={p.id}>
                  <Td>{p.name}</Td>
                  <Td>{p.employeeId ?? "—"}</Td>
                  <Td>{p.homeUnit ?? "—"}</Td>
                  <Td>
                    <a href={`/reports/packet.pdf?person=${encodeURIComponent(p.id)}`} download>
                      PDF<span className="sr-only"> packet for {p.name}</span>
                    </a>
                  </Td>
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        ) : null}
      </section>
      <CautionFooter />
    </>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Survey evidence packet · Reports · Tidemark" }];
