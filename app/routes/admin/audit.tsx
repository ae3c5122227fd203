import { Form, useLoaderData } from "react-router";
import { requireViewer } from "~/auth/gate.server";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { Button } from "~/components/ui/button";
import { SelectField } from "~/components/ui/field";
import { verifyAuditChain } from "~/db/audit.server";
import { database } from "~/db/client.server";
import { checkoffHistory, recentSignedCheckoffs } from "~/db/queries/checkoffs-history.server";
import { getCheckoffRecord } from "~/db/queries/checkoffs.server";
import { signaturesHold } from "~/db/queries/checkoffs-signing.server";
import type { Route } from "./+types/audit";

export async function loader({ context, request }: Route.LoaderArgs) {
  const viewer = requireViewer(context, "section:admin");
  const { db } = await database();
  // The same walk as `npm run audit:verify`: every event's hash and its link to the one before.
  const verdict = await verifyAuditChain(db);
  const chain = verdict.whole
    ? { whole: true as const, count: verdict.count }
    : { whole: false as const, count: verdict.count, seq: verdict.brokenAt.seq, action: verdict.brokenAt.action, at: verdict.brokenAt.at, reason: verdict.reason };
  const checkoffId = new URL(request.url).searchParams.get("checkoff");
  const record = checkoffId ? await getCheckoffRecord(viewer.org.id, checkoffId) : null;
  const history = record ? await checkoffHistory(viewer.org.id, record.checkoff.id) : [];
  const holds = record ? signaturesHold(record) : [];
  return {
    chain,
    options: await recentSignedCheckoffs(viewer.org.id),
    selected: record ? { id: record.checkoff.id, title: record.checklist.title, person: record.person.name, status: record.checkoff.status } : null,
    asked: checkoffId,
    history,
    signatures: holds.length,
    brokenSignatures: holds.filter((h) => !h.holds).length,
    timeZone: viewer.org.timeZone,
  };
}

export default function AuditPage() {
  const d = useLoaderData<typeof loader>();
  return (
    <section aria-labelledby="audit-heading" className="flex flex-col gap-6">
      <h2 id="audit-heading" className="text-2xl font-semibold">
        Audit trail
      </h2>
      <div className={`rounded-md border-l-4 px-4 py-3 ${d.chain.whole ? "border-sea bg-sea-wash" : "border-coral bg-coral-wash"}`} role="status" data-testid="chain-state">
        {d.chain.whole ? (
          <p>
            <strong className="font-semibold">The audit chain is whole:</strong> {d.chain.count} events checked, each hash and each link to the
            event before it.
          </p>
        ) : (
          <p>
            <strong className="font-semibold">The audit chain is broken at event #{d.chain.seq}</strong> ({d.chain.action}, {d.chain.at}): {d.chain.reason}.{" "}
            {d.chain.count} events in all.
          </p>
        )}
      </div>

      <section aria-labelledby="history-heading" className="flex flex-col gap-3">
        <h3 id="history-heading" className="text-xl font-semibold">
          A check-off's history
        </h3>
        <Form method="get" className="flex max-w-2xl flex-col gap-1">
          <SelectField
            id="checkoff"
            name="checkoff"
            label="Signed check-off"
            defaultValue={d.selected?.id ?? ""}
            options={[{ value: "", label: d.options.length ? "Choose a check-off…" : "No signed check-offs yet" }, ...d.options.map((o) => ({ value: o.id, label: o.label }))]}
          />
          <div>
            <Button type="submit" variant="secondary">
              Show its history
            </Button>
          </div>
        </Form>
        {d.asked && !d.selected ? <p role="alert">We could not find that check-off in your organisation.</p> : null}
        {d.selected ? (
          <>
            <p>
              {d.selected.person} — {d.selected.title}. {d.signatures} signature{d.signatures === 1 ? "" : "s"};{" "}
              {d.brokenSignatures === 0 ? "each matches its signed content." : <strong className="font-semibold text-coral">{d.brokenSignatures} no longer match their content.</strong>}
            </p>
            <LedgerTable caption={`Audit history of the check-off of ${d.selected.person}`}>
              <thead>
                <tr>
                  <Th numeric>Event</Th>
                  <Th>When (UTC)</Th>
                  <Th>What</Th>
                  <Th>Who</Th>
                  <Th>Detail</Th>
                </tr>
              </thead>
              <tbody>
                {d.history.map((h) => (
                  <tr key={h.seq}>
                    <Td numeric>{h.seq}</Td>
                    <Td className="whitespace-nowrap">{h.at.replace("T", " ").slice(0, 19)}</Td>
                    <Td>{h.action}</Td>
                    <Td>{h.actor ?? "—"}</Td>
                    <Td className="max-w-md font-mono text-xs break-all">{h.detail}</Td>
                  </tr>
                ))}
              </tbody>
            </LedgerTable>
          </>
        ) : null}
      </section>
    </section>
  );
}

export const meta: Route.MetaFunction = () => [{ title: "Audit trail · Admin · Tidemark" }];
