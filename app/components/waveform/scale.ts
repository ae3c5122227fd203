/**
 * Axis arithmetic for the waveform plot: linear scales, "nice" tick steps (1, 2, 2.5 or 5
 * times a power of ten — the usual choice for readable graph paper, common practice, no
 * source) and tick labels. Pure functions, so the server and the browser draw the same axes.
 */

export type Domain = readonly [number, number];

export interface LinearScale {
  (value: number): number;
  invert(position: number): number;
  domain: Domain;
  range: Domain;
}

/** Maps `domain` onto `range` linearly; a zero-width domain maps everything to the range's middle. */
export function linearScale(domain: Domain, range: Domain): LinearScale {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const span = d1 - d0;
  const scale = ((value: number) => (span === 0 ? (r0 + r1) / 2 : r0 + ((value - d0) / span) * (r1 - r0))) as LinearScale;
  scale.invert = (position: number) => (r1 === r0 ? d0 : d0 + ((position - r0) / (r1 - r0)) * span);
  scale.domain = domain;
  scale.range = range;
  return scale;
}

const STEP_FACTORS = [1, 2, 2.5, 5, 10];

/** The smallest nice step that splits `span` into at most `maxTicks` intervals. */
export function niceStep(span: number, maxTicks: number): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / Math.max(1, maxTicks);
  const power = 10 ** Math.floor(Math.log10(raw));
  for (const f of STEP_FACTORS) if (f * power >= raw - 1e-12 * power) return f * power;
  return 10 * power;
}

/** Multiples of `step` inside [min, max] (ends included within a small tolerance). */
export function ticksBetween(min: number, max: number, step: number): number[] {
  if (!(step > 0) || !(max >= min)) return [];
  const eps = step * 1e-9;
  const out: number[] = [];
  for (let i = Math.ceil((min - eps) / step); i * step <= max + eps; i++) {
    // Rounding to the step's own decimals keeps 0.1 × 3 from printing as 0.30000000000000004.
    out.push(Number((i * step).toFixed(decimalsOf(step))));
  }
  return out;
}

/** Ticks for a visible range, at most about `maxTicks` of them. */
export function niceTicks(min: number, max: number, maxTicks: number): { step: number; ticks: number[] } {
  const step = niceStep(max - min, maxTicks);
  return { step, ticks: ticksBetween(min, max, step) };
}

export interface DomainOptions {
  /** The domain always covers at least this range (keeps a quiet trace from filling the panel). */
  atLeast?: Domain;
  /** Make the domain symmetric about zero (flow: inspiration up, expiration down). */
  symmetric?: boolean;
  maxTicks?: number;
}

/**
 * A domain for the values seen, widened to `atLeast` and rounded outwards to the nice step, so
 * it changes only when the data cross a tick — the axes stay still while a trace sweeps.
 */
export function niceDomain(values: Iterable<number>, options: DomainOptions = {}): Domain {
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (Number.isFinite(lo) && Number.isFinite(hi)) {
    // A little headroom so a peak never runs along the panel's edge under its labels.
    const pad = 0.04 * (hi - lo);
    if (options.atLeast) {
      const [floor, ceiling] = options.atLeast;
      // Rounding noise just past the panel's own range (a volume of −0.01 mL) must not add a
      // whole empty step to the axis: within 2 % of the range it is clipped instead.
      const slack = 0.02 * (ceiling - floor);
      lo = lo < floor - slack ? lo - pad : floor;
      hi = hi > ceiling - slack ? Math.max(ceiling, hi + pad) : ceiling;
    } else {
      lo -= pad;
      hi += pad;
    }
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return [0, 1];
  if (options.symmetric) {
    const m = Math.max(Math.abs(lo), Math.abs(hi));
    lo = -m;
    hi = m;
  }
  if (hi === lo) hi = lo + 1;
  const step = niceStep(hi - lo, options.maxTicks ?? 4);
  return [Math.floor(lo / step + 1e-9) * step, Math.ceil(hi / step - 1e-9) * step];
}

/** Decimals needed to print multiples of `step` exactly (0.25 → 2, 5 → 0). */
export function decimalsOf(step: number): number {
  for (let d = 0; d <= 6; d++) if (Math.abs(Math.round(step * 10 ** d) - step * 10 ** d) < 1e-9) return d;
  return 6;
}

/** A tick label: the step's decimals, a true minus sign, never "−0". */
export function formatTick(value: number, step: number): string {
  const text = value.toFixed(decimalsOf(step));
  if (Number(text) === 0) return text.replace("-", "");
  return text.startsWith("-") ? `\u2212${text.slice(1)}` : text;
}
