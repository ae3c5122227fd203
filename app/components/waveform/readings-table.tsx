/**
 * The plot's readings as a ledger, breath by breath: the text alternative's detail for screen
 * readers and the numbers a learner compares across breaths. Collapsed by default.
 */
import type { BreathReading } from "~/domain/bench/types";
import { alarmList, flow, pressure, seconds, volume } from "./reading-format";

const COLUMNS: { label: string; unit: string; value: (b: BreathReading) => string }[] = [
  { label: "PIP", unit: "cmH2O", value: (b) => pressure(b.pipCmH2O) },
  { label: "Pplat", unit: "cmH2O", value: (b) => pressure(b.pplatCmH2O) },
  { label: "VTi", unit: "mL", value: (b) => volume(b.vtiMl) },
  { label: "VTe", unit: "mL", value: (b) => volume(b.vteMl) },
  { label: "Peak flow", unit: "L/min", value: (b) => flow(b.peakFlowLpm) },
  { label: "Ti", unit: "s", value: (b) => seconds(b.tiS) },
  { label: "Mean airway pressure", unit: "cmH2O", value: (b) => pressure(b.mpawCmH2O) },
];

export function ReadingsTable({ breaths, caption, open = false }: { breaths: readonly BreathReading[]; caption: string; open?: boolean }) {
  return (
    <details className="mt-3 rounded-md border border-rule bg-card" open={open}>
      <summary className="min-h-11 cursor-pointer px-3 py-2 font-semibold text-sea">{`Readings, breath by breath (${breaths.length})`}</summary>
      <div className="overflow-x-auto px-3 pb-3">
        {breaths.length === 0 ? (
          <p className="text-sm text-muted">No breath has finished in this window yet.</p>
        ) : (
          <table className="w-full border-collapse text-sm">
            <caption className="pb-2 text-left text-muted">{caption}</caption>
            <thead>
              <tr className="border-b border-rule text-muted">
                <th scope="col" className="py-1 pr-3 text-right font-semibold">
                  Breath
                </th>
                {COLUMNS.map((c) => (
                  <th key={c.label} scope="col" className="py-1 pr-3 text-right font-semibold">
                    {c.label} <span className="font-normal">({c.unit})</span>
                  </th>
                ))}
                <th scope="col" className="py-1 text-left font-semibold">
                  Alarms
                </th>
              </tr>
            </thead>
            <tbody>
              {breaths.map((b) => (
                <tr key={b.breath} className="border-b border-rule tabular-nums">
                  <th scope="row" className="py-1 pr-3 text-right font-semibold">
                    {b.breath}
                    {b.testBreath ? <span className="font-normal text-muted"> (test)</span> : null}
                  </th>
                  {COLUMNS.map((c) => (
                    <td key={c.label} className="py-1 pr-3 text-right">
                      {c.value(b)}
                    </td>
                  ))}
                  <td className={b.alarms.length ? "py-1 font-semibold text-coral" : "py-1 text-muted"}>{alarmList(b.alarms)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
    </details>
  );
}
