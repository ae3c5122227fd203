/**
 * SVG path strings for a sampled signal. Coordinates are rounded to 0.1 px, which is below what
 * a screen or a printer shows and makes the same data give the same string on the server and in
 * the browser (no hydration differences, stable snapshots). Consecutive points that round to the
 * same position are dropped.
 */
import type { LinearScale } from "./scale";

/** Index range [from, to) of the samples to draw for [startS, endS], keeping one sample on each
 *  side so the line runs to the panel's edges (the clip path trims it). `timeS` must ascend. */
export function visibleRange(timeS: ArrayLike<number>, startS: number, endS: number): [number, number] {
  const n = timeS.length;
  const firstAtOrAfter = (t: number) => {
    let lo = 0;
    let hi = n;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (timeS[mid] < t) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const from = Math.max(0, firstAtOrAfter(startS) - 1);
  const to = Math.min(n, firstAtOrAfter(endS) + 1);
  // A window after or before all samples draws nothing.
  if (n === 0 || timeS[n - 1] < startS || timeS[0] > endS) return [0, 0];
  return [from, to];
}

const px = (v: number) => {
  const r = Math.round(v * 10) / 10;
  return Object.is(r, -0) ? "0" : String(r);
};

/** "M x y L x y …" for the points; "" for no points. */
export function linePath(timeS: ArrayLike<number>, values: ArrayLike<number>, x: LinearScale, y: LinearScale): string {
  const n = Math.min(timeS.length, values.length);
  let d = "";
  let lastX = "";
  let lastY = "";
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (!Number.isFinite(v) || !Number.isFinite(timeS[i])) continue;
    const sx = px(x(timeS[i]));
    const sy = px(y(v));
    if (sx === lastX && sy === lastY) continue;
    d += `${d ? "L" : "M"}${sx} ${sy}`;
    lastX = sx;
    lastY = sy;
  }
  return d;
}

/** Rounds one coordinate the way paths do (for ticks, markers and windows). */
export function snap(v: number): number {
  return Math.round(v * 10) / 10;
}
