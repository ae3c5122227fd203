/**
 * Tidemark's status words and marks (PRODUCT.md): always a word plus a shape, never colour
 * alone. The shapes differ in outline, so they read in greyscale and print.
 */
export const STATUSES = ["current", "due-soon", "lapsed", "not-started", "waived"] as const;
export type Status = (typeof STATUSES)[number];

export const STATUS_WORDS: Record<Status, string> = {
  current: "Current",
  "due-soon": "Due soon",
  lapsed: "Lapsed",
  "not-started": "Not started",
  waived: "Waived",
};

/**
 * Each status's shape on a 16 × 16 grid, as SVG markup: drawn inline by StatusMark, and as CSS
 * images in the Team matrix (app/styles/app.css, `.matrix-cells`; status-mark.test.ts checks the
 * stylesheet draws exactly these).
 */
export const STATUS_SHAPES: Record<Status, string> = {
  // filled circle
  current: '<circle cx="8" cy="8" r="6.5" fill="#0F5C57"/>',
  // circle with a notch
  "due-soon": '<path d="M8 1.5a6.5 6.5 0 1 0 6.5 6.5H8Z" fill="#B8432A"/><circle cx="8" cy="8" r="6.5" fill="none" stroke="#B8432A" stroke-width="1.2"/>',
  // open circle with a bar
  lapsed: '<circle cx="8" cy="8" r="6" fill="none" stroke="#B8432A" stroke-width="2"/><rect x="3.5" y="7" width="9" height="2" fill="#B8432A"/>',
  // dotted ring
  "not-started": '<circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" stroke-width="2" stroke-dasharray="1.5 2.2"/>',
  // circle with a slash
  waived: '<circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" stroke-width="1.6"/><path d="M3.8 12.2 12.2 3.8" stroke="#5B6B68" stroke-width="1.6"/>',
};

/** A status's shape as a standalone SVG data URI, as the stylesheet uses it. */
export function statusShapeDataUri(status: Status): string {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="14" height="14" viewBox="0 0 16 16">${STATUS_SHAPES[status]}</svg>`;
  return `data:image/svg+xml,${encodeURIComponent(svg)}`;
}

function Shape({ status }: { status: Status }) {
  return <svg width={14} height={14} viewBox="0 0 16 16" aria-hidden className="shrink-0" dangerouslySetInnerHTML={{ __html: STATUS_SHAPES[status] }} />;
}

export function StatusMark({ status, detail }: { status: Status; detail?: string }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap" data-status={status}>
      <Shape status={status} />
      <span className={status === "lapsed" || status === "due-soon" ? "font-semibold" : undefined}>{STATUS_WORDS[status]}</span>
      {detail ? <span className="text-muted">· {detail}</span> : null}
    </span>
  );
}
