/**
 * Pressure, flow and volume against time as plain SVG: three stacked panels on the paper sharing
 * one time axis, each with its title and unit, a light grid and one calm colour. The same props
 * give the same markup on the server and in the browser (paths rounded to 0.1 px), so a
 * server-rendered plot is complete before any JavaScript runs, and it prints crisply.
 *
 * Optional markers (a labelled vertical line) and shaded windows serve the question bank's
 * waveform-point items; `onPointClick` reports the time of a click on any panel, with a keyboard
 * alternative (a slider and a button) under the plot.
 */
import { useId, useMemo, useRef, useState, type MouseEvent } from "react";
import { downsampleSeries, type Series } from "~/domain/bench/waveform";
import type { BreathReading, Waveform } from "~/domain/bench/types";
import { plotGeometry, tickBudget } from "./geometry";
import { linePath, snap, visibleRange } from "./path";
import { ReadingsTable } from "./readings-table";
import { formatTick, linearScale, niceDomain, niceTicks, type Domain } from "./scale";
import { AXIS_COLOUR, GRID_COLOUR, MARKER_COLOUR, SIGNALS, WINDOW_FILL, type SignalKey } from "./signals";
import { describeWaveform } from "./summary";
import { useMeasuredWidth } from "./use-measured-width";

export interface WaveformMarker {
  timeS: number;
  label: string;
}

export interface WaveformWindow {
  fromS: number;
  toS: number;
  label: string;
}

export interface WaveformPlotProps {
  waveform: Waveform;
  /** The time window drawn (seconds, the waveform's own clock). */
  startS: number;
  endS: number;
  /** Finished breaths to number on the plot and list in the readings table. */
  breaths?: readonly BreathReading[];
  markers?: readonly WaveformMarker[];
  windows?: readonly WaveformWindow[];
  onPointClick?: (timeS: number) => void;
  /** Replaces the generated summary (the SVG's accessible name). */
  label?: string;
  tableCaption?: string;
  /** Fixed drawing width in px; by default the plot fills its container. */
  width?: number;
  /** Fixed value ranges per signal; by default each panel fits its data in nice steps. */
  domains?: Partial<Record<SignalKey, Domain>>;
  /** Shows the breath-by-breath readings table under the plot (default true). */
  showTable?: boolean;
}

const FONT = 13;
/** Intervals on each value axis: the domain is rounded to the same step, so ticks fall on its ends. */
const Y_TICKS = 4;

interface PanelData {
  key: SignalKey;
  series: Series;
  domain: Domain;
}

function slice(a: Float64Array, from: number, to: number): Float64Array {
  return a.subarray(from, to);
}

/**
 * A waveform from loader data (an exam's waveform question, its result) crosses the network in
 * React Router's encoding, which has no typed arrays: each Float64Array arrives as an object of
 * index keys, without `length` or `subarray`. Restore the samples (index keys enumerate in
 * ascending order) so such a plot draws, and hydrates, like one computed in the browser.
 */
function samples(a: Float64Array | ArrayLike<number> | Record<string, number>): Float64Array {
  if (a instanceof Float64Array) return a;
  return Float64Array.from(Array.isArray(a) ? a : Object.values(a));
}

export function WaveformPlot(props: WaveformPlotProps) {
  const { waveform, startS, endS, breaths = [], markers = [], windows = [], onPointClick } = props;
  const frameRef = useRef<HTMLDivElement>(null);
  const width = useMeasuredWidth(frameRef, 960, props.width);
  const clipBase = useId().replace(/:/g, "");
  const geometry = plotGeometry({ width, panelCount: SIGNALS.length });
  const x = linearScale([startS, endS], [geometry.left, geometry.right]);

  const panels: PanelData[] = useMemo(() => {
    const timeS = samples(waveform.timeS);
    const [from, to] = visibleRange(timeS, startS, endS);
    const t = slice(timeS, from, to);
    // About two points per pixel column: min and max of each bucket survive (peaks kept).
    const maxPoints = Math.max(64, Math.round((geometry.right - geometry.left) * 2));
    return SIGNALS.map((spec) => {
      const series = downsampleSeries(t, slice(samples(waveform[spec.key]), from, to), maxPoints);
      const domain = props.domains?.[spec.key] ?? niceDomain(series.values, { atLeast: spec.atLeast, symmetric: spec.symmetric, maxTicks: Y_TICKS });
      return { key: spec.key, series, domain };
    });
  }, [waveform, startS, endS, geometry.left, geometry.right, props.domains]);

  const ranges = useMemo(() => {
    if (panels[0].series.values.length === 0) return null;
    const out = {} as Record<SignalKey, Domain>;
    for (const p of panels) out[p.key] = [Math.min(...p.series.values), Math.max(...p.series.values)];
    return out;
  }, [panels]);

  const shownBreaths = breaths.filter((b) => b.startS + b.durationS > startS && b.startS < endS);
  const summary = props.label ?? describeWaveform({ startS, endS, ranges, breaths: shownBreaths, markers, windows });
  const timeTicks = niceTicks(startS, endS, tickBudget(geometry.right - geometry.left, 80));

  const onClick = onPointClick
    ? (event: MouseEvent<SVGRectElement>) => {
        const svg = event.currentTarget.ownerSVGElement;
        if (!svg) return;
        const box = svg.getBoundingClientRect();
        const position = ((event.clientX - box.left) / box.width) * geometry.width;
        onPointClick(Math.min(endS, Math.max(startS, x.invert(position))));
      }
    : undefined;

  return (
    <figure className="m-0">
      <div ref={frameRef} className="w-full">
        <svg
          role="img"
          aria-label={summary}
          width="100%"
          viewBox={`0 0 ${geometry.width} ${geometry.height}`}
          className="block h-auto max-w-full select-none"
          fontFamily="inherit"
          fontSize={FONT}
        >
          <rect x="0" y="0" width={geometry.width} height={geometry.height} fill="#FAF6EF" />
          {panels.map((panel, i) => {
            const spec = SIGNALS[i];
            const box = geometry.panels[i];
            const y = linearScale(panel.domain, [box.bottom, box.top]);
            const yTicks = niceTicks(panel.domain[0], panel.domain[1], Y_TICKS);
            const clipId = `${clipBase}-clip-${i}`;
            const plotWidth = geometry.right - geometry.left;
            return (
              <g key={panel.key} data-signal={panel.key}>
                <clipPath id={clipId}>
                  <rect x={geometry.left} y={box.top - 1} width={plotWidth} height={box.bottom - box.top + 2} />
                </clipPath>
                {/* Title: a short line in the trace's colour, then the name and unit in ink. */}
                <line x1={geometry.left} x2={geometry.left + 18} y1={box.titleY + 11} y2={box.titleY + 11} stroke={spec.colour} strokeWidth={3} strokeLinecap="round" />
                <text x={geometry.left + 26} y={box.titleY + 15} fill="#17302E" fontWeight={600} fontSize={FONT + 1}>
                  {spec.title}
                  <tspan fill={AXIS_COLOUR} fontWeight={400}>{` (${spec.unit})`}</tspan>
                </text>
                <rect x={geometry.left} y={box.top} width={plotWidth} height={box.bottom - box.top} fill="#FFFDF9" />
                {windows.map((w) => {
                  const x0 = Math.max(geometry.left, x(w.fromS));
                  const x1 = Math.min(geometry.right, x(w.toS));
                  if (x1 <= x0) return null;
                  return <rect key={`${w.label}-${w.fromS}`} x={snap(x0)} y={box.top} width={snap(x1 - x0)} height={box.bottom - box.top} fill={WINDOW_FILL} />;
                })}
                {yTicks.ticks.map((v) => (
                  <g key={`y${v}`}>
                    <line x1={geometry.left} x2={geometry.right} y1={snap(y(v))} y2={snap(y(v))} stroke={v === 0 ? AXIS_COLOUR : GRID_COLOUR} strokeWidth={v === 0 ? 1 : 0.75} strokeOpacity={v === 0 ? 0.6 : 1} />
                    <text x={geometry.left - 8} y={snap(y(v)) + 4} textAnchor="end" fill={AXIS_COLOUR}>
                      {formatTick(v, yTicks.step)}
                    </text>
                  </g>
                ))}
                {timeTicks.ticks.map((t) => (
                  <line key={`x${t}`} x1={snap(x(t))} x2={snap(x(t))} y1={box.top} y2={box.bottom} stroke={GRID_COLOUR} strokeWidth={0.75} />
                ))}
                {shownBreaths.map((b) =>
                  b.startS > startS ? (
                    <line key={`b${b.breath}`} x1={snap(x(b.startS))} x2={snap(x(b.startS))} y1={box.top} y2={box.bottom} stroke={AXIS_COLOUR} strokeOpacity={0.45} strokeWidth={1} strokeDasharray="2 4" />
                  ) : null,
                )}
                <path
                  d={linePath(panel.series.timeS, panel.series.values, x, y)}
                  fill="none"
                  stroke={spec.colour}
                  strokeWidth={2}
                  strokeLinejoin="round"
                  strokeLinecap="round"
                  clipPath={`url(#${clipId})`}
                  vectorEffect="non-scaling-stroke"
                />
                {markers.map((m) =>
                  m.timeS >= startS && m.timeS <= endS ? (
                    <line key={`m${m.label}-${m.timeS}`} x1={snap(x(m.timeS))} x2={snap(x(m.timeS))} y1={box.top} y2={box.bottom} stroke={MARKER_COLOUR} strokeWidth={1.5} strokeDasharray="5 3" />
                  ) : null,
                )}
                <rect x={geometry.left} y={box.top} width={plotWidth} height={box.bottom - box.top} fill="none" stroke={AXIS_COLOUR} strokeOpacity={0.5} strokeWidth={1} />
                {onClick ? (
                  <rect x={geometry.left} y={box.top} width={plotWidth} height={box.bottom - box.top} fill="transparent" style={{ cursor: "crosshair" }} onClick={onClick} />
                ) : null}
              </g>
            );
          })}
          <Labels
            breaths={shownBreaths}
            markers={markers}
            windows={windows}
            x={(t) => x(t)}
            startS={startS}
            endS={endS}
            top={geometry.panels[0].top}
            left={geometry.left}
            right={geometry.right}
          />
          {timeTicks.ticks.map((t) => (
            <text key={`xl${t}`} x={snap(x(t))} y={geometry.timeLabelY} textAnchor="middle" fill={AXIS_COLOUR}>
              {formatTick(t, timeTicks.step)}
            </text>
          ))}
          <text x={(geometry.left + geometry.right) / 2} y={geometry.timeTitleY} textAnchor="middle" fill="#17302E" fontWeight={600}>
            Time (s)
          </text>
        </svg>
      </div>
      {onPointClick ? <PointPicker startS={startS} endS={endS} onPick={onPointClick} /> : null}
      {props.showTable === false ? null : <ReadingsTable breaths={shownBreaths} caption={props.tableCaption ?? "Readings of each breath in the plotted window"} />}
    </figure>
  );
}

/** Breath numbers, marker and window labels along the top of the first panel, drawn over the
 *  traces with a paper-coloured halo so they stay legible. */
function Labels(p: {
  breaths: readonly BreathReading[];
  markers: readonly WaveformMarker[];
  windows: readonly WaveformWindow[];
  x: (t: number) => number;
  startS: number;
  endS: number;
  top: number;
  left: number;
  right: number;
}) {
  const halo = { stroke: "#FFFDF9", strokeWidth: 4, paintOrder: "stroke" as const, strokeLinejoin: "round" as const };
  return (
    <g fontSize={FONT - 1}>
      {p.breaths.map((b) => {
        const at = Math.max(p.startS, b.startS);
        const span = p.x(Math.min(p.endS, b.startS + b.durationS)) - p.x(at);
        if (span < 24) return null;
        return (
          <text key={`bl${b.breath}`} x={snap(p.x(at) + 4)} y={p.top + 13} fill={AXIS_COLOUR} {...halo}>
            {span >= 110 && b.testBreath ? `Breath ${b.breath} (test)` : span >= 80 ? `Breath ${b.breath}` : b.breath}
          </text>
        );
      })}
      {p.windows.map((w) => {
        const x0 = Math.max(p.left, p.x(w.fromS));
        if (x0 >= p.right) return null;
        return (
          <text key={`wl${w.label}-${w.fromS}`} x={snap(x0 + 4)} y={p.top + 28} fill="#17302E" fontWeight={600} {...halo}>
            {w.label}
          </text>
        );
      })}
      {p.markers.map((m) =>
        m.timeS >= p.startS && m.timeS <= p.endS ? (
          <text key={`ml${m.label}-${m.timeS}`} x={snap(p.x(m.timeS) + 4)} y={p.top + 43} fill={MARKER_COLOUR} fontWeight={600} {...halo}>
            {m.label}
          </text>
        ) : null,
      )}
    </g>
  );
}

/** Keyboard and screen-reader way to choose a moment: a slider over the plotted times. */
function PointPicker({ startS, endS, onPick }: { startS: number; endS: number; onPick: (timeS: number) => void }) {
  const id = useId();
  const [value, setValue] = useState((startS + endS) / 2);
  const clamped = Math.min(endS, Math.max(startS, value));
  return (
    <div className="mt-2 flex flex-wrap items-end gap-3">
      <div className="flex grow flex-col gap-1">
        <label htmlFor={id} className="font-semibold">
          Moment on the time axis: {clamped.toFixed(2)} s
        </label>
        <input id={id} type="range" min={startS} max={endS} step={0.01} value={clamped} onChange={(e) => setValue(Number(e.target.value))} className="min-h-11 w-full accent-sea" />
      </div>
      <button type="button" onClick={() => onPick(clamped)} className="inline-flex min-h-11 items-center rounded-md border border-sea bg-card px-4 font-semibold text-sea hover:bg-sea-wash">
        Choose {clamped.toFixed(2)} s
      </button>
    </div>
  );
}
