/**
 * An item's lifecycle status as a word plus a shape, never colour alone (PRODUCT.md, "Status
 * words and marks"); the shapes are distinct from the requirement marks so the two never mix.
 */
import { ITEM_STATUS_WORDS, type ItemStatus } from "~/domain/bank/lifecycle";

function Shape({ status }: { status: ItemStatus }) {
  const common = { width: 14, height: 14, viewBox: "0 0 16 16", "aria-hidden": true as const, className: "shrink-0" };
  switch (status) {
    case "draft": // open square
      return (
        <svg {...common}>
          <rect x="2.5" y="2.5" width="11" height="11" fill="none" stroke="#5B6B68" strokeWidth="1.6" />
        </svg>
      );
    case "in-review": // half-filled square
      return (
        <svg {...common}>
          <rect x="2.5" y="2.5" width="11" height="11" fill="none" stroke="#B8432A" strokeWidth="1.6" />
          <rect x="2.5" y="2.5" width="5.5" height="11" fill="#B8432A" />
        </svg>
      );
    case "published": // filled square
      return (
        <svg {...common}>
          <rect x="2" y="2" width="12" height="12" fill="#0F5C57" />
        </svg>
      );
    case "retired": // square with a cross
      return (
        <svg {...common}>
          <rect x="2.5" y="2.5" width="11" height="11" fill="none" stroke="#5B6B68" strokeWidth="1.6" />
          <path d="M4 4 12 12M12 4 4 12" stroke="#5B6B68" strokeWidth="1.4" />
        </svg>
      );
  }
}

export function ItemStatusMark({ status, detail }: { status: ItemStatus; detail?: string }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap" data-status={status}>
      <Shape status={status} />
      <span className={status === "in-review" ? "font-semibold" : undefined}>{ITEM_STATUS_WORDS[status]}</span>
      {detail ? <span className="text-muted">· {detail}</span> : null}
    </span>
  );
}
