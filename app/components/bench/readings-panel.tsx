/**
 * The latest finished breath as a ledger (row headers, right-aligned numbers, units), and the
 * patient the simulator holds now. It updates once per breath; it is not a live region, so a
 * screen reader is not interrupted every few seconds (the alarm banner is the one alert).
 */
import { timeConstantS } from "~/domain/bench/calculations";
import type { BreathReading, Mode, Patient } from "~/domain/bench/types";
import { CYCLE_WORDS, TRIGGER_WORDS, alarmList, flow, pressure, seconds, volume } from "~/components/waveform/reading-format";

interface Row {
  label: string;
  value: string;
  unit: string;
  note?: string;
}

function rowsFor(r: BreathReading, mode: Mode): Row[] {
  return [
    { label: "Peak inspiratory pressure (PIP)", value: pressure(r.pipCmH2O), unit: "cmH2O" },
    {
      label: "Plateau pressure (Pplat)",
      value: pressure(r.pplatCmH2O),
      unit: "cmH2O",
      note: r.pplatCmH2O === null ? (mode === "volume-control" ? "set a pause to see it" : "no pause in this mode") : undefined,
    },
    { label: "Inspired tidal volume (VTi)", value: volume(r.vtiMl), unit: "mL" },
    { label: "Exhaled tidal volume (VTe)", value: volume(r.vteMl), unit: "mL" },
    { label: "Peak inspiratory flow", value: flow(r.peakFlowLpm), unit: "L/min" },
    { label: "Inspiratory time (Ti)", value: seconds(r.tiS), unit: "s" },
    { label: "Mean airway pressure", value: pressure(r.mpawCmH2O), unit: "cmH2O" },
    { label: "Total PEEP", value: pressure(r.totalPeepCmH2O), unit: "cmH2O" },
    {
      label: "Inspiratory pressure aimed for",
      value: pressure(r.inspiratoryPressureCmH2O),
      unit: "cmH2O",
      note: r.inspiratoryPressureCmH2O === null ? "volume-controlled breath" : "above PEEP",
    },
  ];
}

function effortWords(p: Patient): string {
  const e = p.effort;
  if (e.kind === "none") return "none (passive)";
  return `${e.kind}, ${e.amplitudeCmH2O} cmH2O at ${e.rateBpm}/min`;
}

export function ReadingsPanel({ latest, mode, patient }: { latest: BreathReading | null; mode: Mode; patient: Patient }) {
  const tau = timeConstantS(patient.resistanceCmH2OPerLps, patient.complianceMlPerCmH2O);
  return (
    <section aria-labelledby="readings-heading" className="rounded-lg border border-rule bg-card p-4">
      <h2 id="readings-heading" className="text-lg font-semibold">
        Readings
      </h2>
      {latest ? (
        <table className="mt-2 w-full border-collapse text-sm">
          <caption className="pb-1 text-left text-muted">
            Latest breath: breath {latest.breath}
            {latest.testBreath ? " (test breath)" : ""}
          </caption>
          <tbody>
            {rowsFor(latest, mode).map((row) => (
              <tr key={row.label} className="border-b border-rule align-baseline">
                <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                  {row.label}
                  {row.note ? <span className="block text-xs text-muted">{row.note}</span> : null}
                </th>
                <td className="py-1.5 text-right text-base font-semibold tabular-nums">{row.value}</td>
                <td className="py-1.5 pl-1.5 text-left text-muted">{row.unit}</td>
              </tr>
            ))}
            <tr className="border-b border-rule align-baseline">
              <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                Trigger
              </th>
              <td colSpan={2} className="py-1.5 text-right">
                {TRIGGER_WORDS[latest.trigger]}
              </td>
            </tr>
            <tr className="border-b border-rule align-baseline">
              <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                Cycle
              </th>
              <td colSpan={2} className="py-1.5 text-right">
                {CYCLE_WORDS[latest.cycle]}
              </td>
            </tr>
            <tr className="align-baseline">
              <th scope="row" className="py-1.5 pr-2 text-left font-normal">
                Alarms
              </th>
              <td colSpan={2} className={latest.alarms.length ? "py-1.5 text-right font-semibold text-coral" : "py-1.5 text-right"}>
                {alarmList(latest.alarms)}
              </td>
            </tr>
          </tbody>
        </table>
      ) : (
        <p className="mt-2 text-sm text-muted">No breath has finished yet.</p>
      )}
      <h3 className="mt-4 text-base font-semibold">Patient now</h3>
      <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 text-sm">
        <dt className="text-muted">Compliance</dt>
        <dd className="text-right tabular-nums">{patient.complianceMlPerCmH2O} mL/cmH2O</dd>
        <dt className="text-muted">Resistance</dt>
        <dd className="text-right tabular-nums">{patient.resistanceCmH2OPerLps} cmH2O/(L/s)</dd>
        <dt className="text-muted">Time constant (R·C)</dt>
        <dd className="text-right tabular-nums">{seconds(tau)} s</dd>
        <dt className="text-muted">Effort</dt>
        <dd className="text-right">{effortWords(patient)}</dd>
      </dl>
    </section>
  );
}
