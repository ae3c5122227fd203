import { renderToString } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { simulate } from "~/domain/bench/simulate";
import { WaveformPlot } from "./waveform-plot";

// Volume control, 500 mL at 60 L/min into C 50, R 10, PEEP 5: PIP = 5 + 500/50 + 10 × 1 = 25
// (equation of motion, Chatburn, Respir Care 2014;59(11):1747–63).
const run = simulate({
  mode: "volume-control",
  settings: { tidalVolumeMl: 500, peakFlowLpm: 60, rateBpm: 15, peepCmH2O: 5 },
  patient: { complianceMlPerCmH2O: 50, resistanceCmH2OPerLps: 10 },
  breaths: 3,
});

const render = (extra: Partial<Parameters<typeof WaveformPlot>[0]> = {}) =>
  renderToString(<WaveformPlot waveform={run.waveform} startS={0} endS={12} breaths={run.breaths} width={900} {...extra} />);

describe("WaveformPlot rendered on the server", () => {
  it("draws a waveform that came as loader data the same as the typed arrays it was made of", () => {
    // React Router's data encoding has no typed arrays: each Float64Array of an exam's waveform
    // question reaches the browser as an object of its index keys (found by the accessibility
    // scan of the exam page, issue 11).
    const asLoaderData = Object.fromEntries(Object.entries(run.waveform).map(([k, a]) => [k, { ...(a as Float64Array) }])) as unknown as typeof run.waveform;
    expect(render({ waveform: asLoaderData })).toBe(render());
  });

  it("is an image with a summary, three titled panels with units, and a time axis", () => {
    const html = render();
    expect(html).toMatch(/<svg role="img" aria-label="Pressure, flow and volume against time, 0.0 to 12.0 s\./);
    expect(html).toMatch(/Pressure 5\.0 to 2[45]\.\d cmH2O; flow −\d+\.\d to 60\.0 L\/min; volume 0 to 500 mL\./);
    for (const title of [">Pressure<", ">Flow<", ">Volume<", "(cmH2O)", "(L/min)", "(mL)", "Time (s)"]) expect(html).toContain(title);
    expect(html.match(/<path d="M/g)).toHaveLength(3);
    expect(html).not.toContain("<canvas");
  });

  it("draws the pressure trace up to the PIP the equation of motion gives", () => {
    const html = render({ domains: { pressureCmH2O: [0, 30] } });
    // Panel 1 plot area: y 28 (30 cmH2O) to 140 (0 cmH2O) in the default geometry. Read the
    // highest point of the drawn trace back into cmH2O: each sample holds the pressure at the
    // start of its 5 ms step, so the last one sits one step (5 mL, 0.1 cmH2O) below PIP.
    const d = /data-signal="pressureCmH2O".*?<path d="([^"]+)"/s.exec(html)?.[1] ?? "";
    const ys = [...d.matchAll(/[ML][\d.]+ ([\d.]+)/g)].map((m) => Number(m[1]));
    const drawnPeak = ((140 - Math.min(...ys)) / 112) * 30;
    expect(drawnPeak).toBeGreaterThan(24.8);
    expect(drawnPeak).toBeLessThanOrEqual(25.05);
    // And the baseline is PEEP: 5 cmH2O at 140 − 112 × 5/30 = 121.3 px.
    expect(Math.max(...ys)).toBeCloseTo(121.3, 1);
  });

  it("renders the same markup every time for the same props (no hydration differences)", () => {
    expect(render()).toBe(render());
  });

  it("draws markers and shaded windows with their labels, and names them in the summary", () => {
    const html = render({ markers: [{ timeS: 0.5, label: "End of inspiration" }], windows: [{ fromS: 0, toS: 0.5, label: "Inspiration" }] });
    expect(html).toContain("End of inspiration</text>");
    expect(html).toContain("Inspiration</text>");
    expect(html).toContain("Marker &quot;End of inspiration&quot; at 0.5 s.");
  });

  it("lists each breath's readings in a table for screen readers", () => {
    const html = render();
    expect(html).toContain("Readings, breath by breath (3)");
    expect(html).toMatch(/<th scope="row"[^>]*>1<\/th><td[^>]*>25\.0<\/td>/);
  });

  it("offers a keyboard way to choose a moment only when a point can be picked", () => {
    expect(render()).not.toContain('type="range"');
    expect(render({ onPointClick: () => {} })).toContain('type="range"');
  });
});
