/**
 * Waveform storage and thinning for plots. The simulator writes one sample per step into a
 * growable buffer (typed arrays, no allocation per sample); plots rarely need more than a
 * few hundred points per strip, so `downsampleWaveform` keeps each bucket's minimum and
 * maximum — peaks (PIP, peak flow) survive thinning, which plain striding would lose.
 */
import type { Waveform } from "./types";

export class WaveformBuffer {
  private timeS: Float64Array;
  private pressure: Float64Array;
  private flow: Float64Array;
  private volume: Float64Array;
  length = 0;

  constructor(capacity: number) {
    const size = Math.max(16, Math.ceil(capacity));
    this.timeS = new Float64Array(size);
    this.pressure = new Float64Array(size);
    this.flow = new Float64Array(size);
    this.volume = new Float64Array(size);
  }

  push(timeS: number, pressureCmH2O: number, flowLpm: number, volumeMl: number): void {
    if (this.length === this.timeS.length) this.grow();
    const i = this.length++;
    this.timeS[i] = timeS;
    this.pressure[i] = pressureCmH2O;
    this.flow[i] = flowLpm;
    this.volume[i] = volumeMl;
  }

  /** A copy of samples [from, to). */
  slice(from = 0, to = this.length): Waveform {
    return {
      timeS: this.timeS.slice(from, to),
      pressureCmH2O: this.pressure.slice(from, to),
      flowLpm: this.flow.slice(from, to),
      volumeMl: this.volume.slice(from, to),
    };
  }

  private grow(): void {
    const size = this.timeS.length * 2;
    const bigger = (a: Float64Array) => {
      const b = new Float64Array(size);
      b.set(a);
      return b;
    };
    this.timeS = bigger(this.timeS);
    this.pressure = bigger(this.pressure);
    this.flow = bigger(this.flow);
    this.volume = bigger(this.volume);
  }
}

/** Joins consecutive waveforms (e.g. the breaths the page has swept so far). */
export function concatWaveforms(parts: readonly Waveform[]): Waveform {
  const total = parts.reduce((n, w) => n + w.timeS.length, 0);
  const out: Waveform = {
    timeS: new Float64Array(total),
    pressureCmH2O: new Float64Array(total),
    flowLpm: new Float64Array(total),
    volumeMl: new Float64Array(total),
  };
  let at = 0;
  for (const w of parts) {
    out.timeS.set(w.timeS, at);
    out.pressureCmH2O.set(w.pressureCmH2O, at);
    out.flowLpm.set(w.flowLpm, at);
    out.volumeMl.set(w.volumeMl, at);
    at += w.timeS.length;
  }
  return out;
}

export interface Series {
  timeS: number[];
  values: number[];
}

/**
 * Thins one signal to at most `maxPoints` points (≥ 4): the samples are split into
 * maxPoints/2 buckets and each bucket contributes its minimum and maximum in time order.
 * First and last samples are always kept.
 */
export function downsampleSeries(timeS: ArrayLike<number>, values: ArrayLike<number>, maxPoints: number): Series {
  const n = Math.min(timeS.length, values.length);
  const limit = Math.max(4, Math.floor(maxPoints));
  if (n <= limit) return { timeS: Array.from(timeS).slice(0, n), values: Array.from(values).slice(0, n) };
  const out: Series = { timeS: [timeS[0]], values: [values[0]] };
  const buckets = Math.floor((limit - 2) / 2);
  const inner = n - 2;
  for (let b = 0; b < buckets; b++) {
    const from = 1 + Math.floor((b * inner) / buckets);
    const to = 1 + Math.floor(((b + 1) * inner) / buckets);
    if (to <= from) continue;
    let lo = from;
    let hi = from;
    for (let i = from + 1; i < to; i++) {
      if (values[i] < values[lo]) lo = i;
      if (values[i] > values[hi]) hi = i;
    }
    for (const i of lo === hi ? [lo] : lo < hi ? [lo, hi] : [hi, lo]) {
      out.timeS.push(timeS[i]);
      out.values.push(values[i]);
    }
  }
  out.timeS.push(timeS[n - 1]);
  out.values.push(values[n - 1]);
  return out;
}

export interface DownsampledWaveform {
  pressureCmH2O: Series;
  flowLpm: Series;
  volumeMl: Series;
}

/** Each signal thinned on its own, so every strip keeps its own peaks. */
export function downsampleWaveform(waveform: Waveform, maxPoints: number): DownsampledWaveform {
  return {
    pressureCmH2O: downsampleSeries(waveform.timeS, waveform.pressureCmH2O, maxPoints),
    flowLpm: downsampleSeries(waveform.timeS, waveform.flowLpm, maxPoints),
    volumeMl: downsampleSeries(waveform.timeS, waveform.volumeMl, maxPoints),
  };
}
