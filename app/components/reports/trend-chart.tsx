/**
 * The 12-month compliance trend (issue 9 §5): % Current per unit at each month end, as recorded
 * by the end of that day, drawn as an SVG line chart with a text alternative — a caption that
 * says what is drawn and a table of every value (PRODUCT.md: every chart has a text
 * alternative). Units differ by colour, dash pattern and marker shape, so the lines can be told
 * apart in greyscale and print, and each line is named at its end.
 */
import { useId } from "react";
import { LedgerTable, Td, Th } from "~/components/admin/ledger";
import { formatCalendarDate } from "~/components/calendar-date";
import type { ComplianceTrend } from "~/db/queries/reports.server";

const STYLES = [
  { stroke: "#0F5C57", dash: "", marker: "circle" },
  { stroke: "#B8432A", dash: "6 3", marker: "square" },
  { stroke: "#17302E", dash: "2 3", marker: "triangle" },
  { stroke: "#5B6B68", dash: "9 3 2 3", marker: "diamond" },
] as const;

export function seriesStyle(index: number) {
  return STYLES[index % STYLES.length];
}

/** "2026-11-30" → "Nov 2026". */
export function monthLabel(day: string): string {
  return formatCalendarDate(day).split(" ").slice(1).join(" ");
}

function Marker({ x, y, kind, color }: { x: number; y: number; kind: (typeof STYLES)[number]["marker"]; color: string }) {
  if (kind === "circle") return <circle cx={x} cy={y} r={3.5} fill={color} />;
  if (kind === "square") return <rect x={x - 3.5} y={y - 3.5} width={7} height={7} fill={color} />;
  if (kind === "triangle") return <path d={`M${x} ${y - 4.5} L${x + 4.5} ${y + 3.5} L${x - 4.5} ${y + 3.5} Z`} fill={color} />;
  return <path d={`M${x} ${y - 4.5} L${x + 4.5} ${y} L${x} ${y + 4.5} L${x - 4.5} ${y} Z`} fill={color} />;
}

/** Moves end-of-line labels apart so none is closer than `gap` to the next, keeping their order (pure). */
export function spreadLabels(wanted: readonly number[], gap: number, min: number, max: number): number[] {
  const order = wanted.map((v, i) => ({ v, i })).sort((a, b) => a.v - b.v || a.i - b.i);
  const placed: number[] = [];
  for (const [k, o] of order.entries()) placed[k] = k === 0 ? Math.max(min, o.v) : Math.max(o.v, placed[k - 1] + gap);
  // Pushed past the bottom: shift the stack up as a whole.
  const over = placed.length ? placed[placed.length - 1] - max : 0;
  const out: number[] = [];
  order.forEach((o, k) => (out[o.i] = over > 0 ? placed[k] - over : placed[k]));
  return out;
}

export function TrendChart({ trend, heading = "Compliance over the past 12 months" }: { trend: ComplianceTrend; heading?: string }) {
  const id = useId();
  const headingId = `${id}-heading`;
  const captionId = `${id}-caption`;
  const n = trend.monthEnds.length;
  const width = 720;
  const height = 260;
  const left = 44;
  const right = 150;
  const top = 14;
  const bottom = 34;
  const plotW = width - left - right;
  const plotH = height - top - bottom;
  const x = (i: number) => left + (n <= 1 ? plotW / 2 : (i * plotW) / (n - 1));
  const y = (pct: number) => top + plotH - (pct / 100) * plotH;
  const labelY = spreadLabels(trend.series.map((s) => y(s.points[s.points.length - 1]?.percentCurrent ?? 0) + 4), 13, top + 4, top + plotH + 4);
  const first = trend.monthEnds[0];
  const last = trend.monthEnds[n - 1];

  return (
    <section aria-labelledby={headingId} className="mt-8 flex flex-col gap-3">
      <h2 id={headingId} className="text-2xl font-semibold">
        {heading}
      </h2>
      {trend.series.length === 0 || n === 0 ? (
        <p className="text-muted">No units to show.</p>
      ) : (
        <figure className="flex flex-col gap-3">
          <svg viewBox={`0 0 ${width} ${height}`} className="w-full max-w-4xl" role="img" aria-labelledby={captionId}>
            {[0, 25, 50, 75, 100].map((pct) => (
              <g key={pct}>
                <line x1={left} x2={left + plotW} y1={y(pct)} y2={y(pct)} stroke="#E3DCCF" strokeWidth="1" />
                <text x={left - 6} y={y(pct) + 4} textAnchor="end" fontSize="11" fill="#5B6B68">
                  {pct} %
                </text>
              </g>
            ))}
            {trend.monthEnds.map((d, i) => (
              <text key={d} x={x(i)} y={height - 12} textAnchor="middle" fontSize="10" fill="#17302E">
                {monthLabel(d).split(" ")[0]}
              </text>
            ))}
            {trend.series.map((s, si) => {
              const st = seriesStyle(si);
              const points = s.points.map((p, i) => `${x(i)},${y(p.percentCurrent)}`).join(" ");
              const end = s.points[s.points.length - 1];
              return (
                <g key={s.unitId}>
                  <polyline points={points} fill="none" stroke={st.stroke} strokeWidth="2" strokeDasharray={st.dash || undefined} />
                  {s.points.map((p, i) => (
                    <Marker key={p.day} x={x(i)} y={y(p.percentCurrent)} kind={st.marker} color={st.stroke} />
                  ))}
                  {end ? (
                    <text x={left + plotW + 8} y={labelY[si]} fontSize="11" fill={st.stroke}>
                      {s.unit.length > 22 ? `${s.unit.slice(0, 21)}…` : s.unit}
                    </text>
                  ) : null}
                </g>
              );
            })}
          </svg>
          <figcaption id={captionId} className="text-sm">
            % Current per unit at each month end from {monthLabel(first)} to {monthLabel(last)}, each counted as recorded by the end of that day. Latest:{" "}
            {trend.series.map((s) => `${s.unit} ${s.points[s.points.length - 1]?.percentCurrent.toFixed(1) ?? "—"} %`).join("; ")}. Every value is in the table below.
          </figcaption>
          <ul className="flex flex-wrap gap-x-6 gap-y-1 text-sm" aria-label="Key">
            {trend.series.map((s, si) => {
              const st = seriesStyle(si);
              return (
                <li key={s.unitId} className="inline-flex items-center gap-2">
                  <svg width="34" height="12" viewBox="0 0 34 12" aria-hidden="true">
                    <line x1="1" x2="33" y1="6" y2="6" stroke={st.stroke} strokeWidth="2" strokeDasharray={st.dash || undefined} />
                    <Marker x={17} y={6} kind={st.marker} color={st.stroke} />
                  </svg>
                  {s.unit}
                </li>
              );
            })}
          </ul>
          <LedgerTable caption="% Current per unit at each month end" maxHeight="max-h-96">
            <thead>
              <tr>
                <Th>Month end</Th>
                {trend.series.map((s) => (
                  <Th key={s.unitId} numeric>
                    {s.unit}
                  </Th>
                ))}
              </tr>
            </thead>
            <tbody>
              {trend.monthEnds.map((d, i) => (
                <tr key={d}>
                  <Td>
                    <time dateTime={d}>{formatCalendarDate(d)}</time>
                  </Td>
                  {trend.series.map((s) => {
                    const p = s.points[i];
                    return (
                      <Td key={s.unitId} numeric>
                        {p && p.cells > 0 ? `${p.percentCurrent.toFixed(1)} %` : "— (no records)"}
                      </Td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </LedgerTable>
        </figure>
      )}
    </section>
  );
}
