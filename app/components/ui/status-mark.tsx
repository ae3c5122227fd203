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

function Shape({ status }: { status: Status }) {
  const common = { width: 14, height: 14, viewBox: "0 0 16 16", "aria-hidden": true as const, className: "shrink-0" };
  switch (status) {
    case "current": // filled circle
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6.5" fill="#0F5C57" />
        </svg>
      );
    case "due-soon": // circle with a notch
      return (
        <svg {...common}>
          <path d="M8 1.5a6.5 6.5 0 1 0 6.5 6.5H8Z" fill="#B8432A" />
          <circle cx="8" cy="8" r="6.5" fill="none" stroke="#B8432A" strokeWidth="1.2" />
        </svg>
      );
    case "lapsed": // open circle with a bar
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6" fill="none" stroke="#B8432A" strokeWidth="2" />
          <rect x="3.5" y="7" width="9" height="2" fill="#B8432A" />
        </svg>
      );
    case "not-started": // dotted ring
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" strokeWidth="2" strokeDasharray="1.5 2.2" />
        </svg>
      );
    case "waived": // circle with a slash
      return (
        <svg {...common}>
          <circle cx="8" cy="8" r="6" fill="none" stroke="#5B6B68" strokeWidth="1.6" />
          <path d="M3.8 12.2 12.2 3.8" stroke="#5B6B68" strokeWidth="1.6" />
        </svg>
      );
  }
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
