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

/** The drawing of each status's shape on a 16 × 16 grid, shared by the inline marks and the sprite. */
function ShapeDrawing({ status }: { status: Status }) {
  switch (status) {
    case "current": // filled circle
      return <circle cx="8" cy="8" r="6.5" fill="#0F5C57" />;
    case "due-soon": // circle with a notch
      return (
        <>
          <path d="M8 1.5a6.5 6.5 0 1 0 6.5 6.5H8Z" fill="#B8432A" />
          <circle cx="8" cy="8" r="6.5" fill="none" stroke="#B8432A" strokeWidth="1.2" />
        </>
      );
    case "lapsed": // open circle with a bar
      return (
        <>
          <circle cx="8" cy="8" r="6" fill="none" stroke="#B8432A" strokeWidth="2" />
          <rect x="3.5" y="7" width="9" height="2" fill="#B8432A" />
        </>
      );
    case "not-started": // dotted ring
      return <circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" strokeWidth="2" strokeDasharray="1.5 2.2" />;
    case "waived": // circle with a slash
      return (
        <>
          <circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" strokeWidth="1.6" />
          <path d="M3.8 12.2 12.2 3.8" stroke="#5B6B68" strokeWidth="1.6" />
        </>
      );
  }
}

function Shape({ status }: { status: Status }) {
  return (
    <svg width={14} height={14} viewBox="0 0 16 16" aria-hidden className="shrink-0">
      <ShapeDrawing status={status} />
    </svg>
  );
}

const symbolId = (status: Status) => `status-shape-${status}`;

/**
 * The five shapes once, as SVG symbols, for a page that draws thousands of marks (the Team
 * matrix): each mark is then a two-element `<svg><use/></svg>` (SVG 2, "The use element",
 * W3C 2018) instead of its own drawing. Put it once in the page, before the marks.
 */
export function StatusShapeSprite() {
  return (
    <svg aria-hidden width="0" height="0" className="absolute">
      {STATUSES.map((status) => (
        <symbol key={status} id={symbolId(status)} viewBox="0 0 16 16">
          <ShapeDrawing status={status} />
        </symbol>
      ))}
    </svg>
  );
}

/** A status's shape drawn from the sprite (StatusShapeSprite must be on the page). */
export function SpriteShape({ status }: { status: Status }) {
  return (
    <svg width="14" height="14" aria-hidden>
      <use href={`#${symbolId(status)}`} />
    </svg>
  );
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
