import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import type { PanelResult } from "~/db/queries/angoff.server";

/** A percent with its unit, or a dash. */
export const percentText = (n: number | null, digits = 1) => (n === null ? "—" : `${n.toFixed(digits)} %`);
const itemsText = (n: number | null) => (n === null ? "—" : n.toFixed(2));

/**
 * One modified Angoff panel (Livingston & Zieky 1982): each judge's items rated, cut in items and
 * percent (or why they are left out), the panel's cut (the mean) and the spread of the judges' cuts.
 */
export function PanelSection({ heading, id, result, itemCount }: { heading: string; id: string; result: PanelResult; itemCount: number }) {
  const { panel } = result;
  return (
    <section aria-labelledby={`${id}-heading`} className="flex flex-col gap-3">
      <h3 id={`${id}-heading`} className="text-xl font-semibold">
        {heading}
      </h3>
      {result.judges.length === 0 ? (
        <p className="text-muted">{result.reason}</p>
      ) : (
        <LedgerTable caption={`${heading}: each judge's cut`}>
          <thead>
            <tr>
              <Th>Judge</Th>
              <Th numeric>Items rated</Th>
              <Th numeric>Cut (items)</Th>
              <Th numeric>Cut (%)</Th>
            </tr>
          </thead>
          <tbody>
            {result.judges.map((j) => (
              <tr key={j.judgeId}>
                <Td>
                  {j.name}
                  {j.note ? <span className="block text-sm text-muted">{j.note}</span> : null}
                </Td>
                <Td numeric>
                  {j.rated} of {itemCount}
                </Td>
                <Td numeric>{itemsText(j.cut)}</Td>
                <Td numeric>{percentText(j.cutPercent)}</Td>
              </tr>
            ))}
          </tbody>
        </LedgerTable>
      )}
      {panel ? (
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
          <dt className="font-semibold">Panel&apos;s cut</dt>
          <dd>
            {itemsText(panel.cut)} of {panel.itemCount} items = {percentText(panel.cutPercent, 2)} (mean of {panel.judges} {panel.judges === 1 ? "judge's cut" : "judges' cuts"})
          </dd>
          <dt className="font-semibold">Spread</dt>
          <dd>
            lowest {itemsText(panel.min)} ({percentText((panel.min / panel.itemCount) * 100)}), highest {itemsText(panel.max)} ({percentText((panel.max / panel.itemCount) * 100)}), standard
            deviation {panel.sd === null ? "—" : itemsText(panel.sd)} items (dividing by N, the number of judges)
          </dd>
        </dl>
      ) : result.judges.length > 0 ? (
        <p>{result.reason}</p>
      ) : null}
    </section>
  );
}
