/**
 * Where each panel of the plot sits. All three panels share one time axis, drawn once under
 * the last panel; each panel has a title row above its plot area.
 */

export interface PanelBox {
  /** Top of the title row. */
  titleY: number;
  /** Plot area. */
  top: number;
  bottom: number;
}

export interface PlotGeometry {
  width: number;
  height: number;
  left: number;
  right: number;
  panels: PanelBox[];
  /** Baseline of the time-axis tick labels and of its title. */
  timeLabelY: number;
  timeTitleY: number;
}

export interface GeometryOptions {
  width: number;
  panelCount: number;
  panelHeight?: number;
  titleHeight?: number;
  gap?: number;
  left?: number;
  right?: number;
  axisHeight?: number;
}

export function plotGeometry(o: GeometryOptions): PlotGeometry {
  const panelHeight = o.panelHeight ?? 112;
  const titleHeight = o.titleHeight ?? 24;
  const gap = o.gap ?? 14;
  const left = o.left ?? 56;
  const right = o.width - (o.right ?? 16);
  const axisHeight = o.axisHeight ?? 44;
  const panels: PanelBox[] = [];
  let y = 4;
  for (let i = 0; i < o.panelCount; i++) {
    panels.push({ titleY: y, top: y + titleHeight, bottom: y + titleHeight + panelHeight });
    y += titleHeight + panelHeight + gap;
  }
  const lastBottom = panels.length ? panels[panels.length - 1].bottom : y;
  return {
    width: o.width,
    height: lastBottom + axisHeight,
    left,
    right,
    panels,
    timeLabelY: lastBottom + 18,
    timeTitleY: lastBottom + 38,
  };
}

/** Ticks that fit: about one label per 80 px across, one per 36 px down (common practice, no source). */
export function tickBudget(lengthPx: number, pxPerTick: number): number {
  return Math.max(2, Math.floor(lengthPx / pxPerTick));
}
