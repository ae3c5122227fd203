import { useEffect, useState, type RefObject } from "react";

/**
 * The element's width in CSS pixels, so the plot draws one SVG unit per pixel (crisp lines,
 * text at its true size). The server and the first browser render use `fallback`, so hydration
 * matches; the real width arrives after mount.
 */
export function useMeasuredWidth(ref: RefObject<HTMLElement | null>, fallback: number, fixed?: number): number {
  const [width, setWidth] = useState(fixed ?? fallback);
  useEffect(() => {
    if (fixed !== undefined) return;
    const element = ref.current;
    if (!element || typeof ResizeObserver === "undefined") return;
    const measure = () => {
      const w = Math.round(element.getBoundingClientRect().width);
      if (w > 0) setWidth(Math.max(320, w));
    };
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(element);
    return () => observer.disconnect();
  }, [ref, fixed]);
  return width;
}
