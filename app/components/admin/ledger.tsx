import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";

/**
 * A table that reads like a ledger (PRODUCT.md "Look and feel"): hairline rules, numbers
 * right-aligned in tabular figures, and a header that stays in view while the rows scroll.
 * The separate border model keeps the sticky header's rule drawn (a collapsed border scrolls
 * away with the first row).
 */
export function LedgerTable({
  caption,
  captionVisible = false,
  maxHeight = "max-h-[70vh]",
  children,
}: {
  caption: string;
  captionVisible?: boolean;
  /** Tailwind max-height of the scrolling frame, for the sticky header. */
  maxHeight?: string;
  children: ReactNode;
}) {
  return (
    // A scrolling region must be reachable by keyboard (WCAG 2.1.1), so it takes focus.
    <div className={`${maxHeight} overflow-auto rounded-md border border-rule bg-card`} tabIndex={0} role="region" aria-label={caption}>
      <table className="w-full border-separate border-spacing-0 text-left">
        <caption className={captionVisible ? "px-3 py-2 text-left font-semibold" : "sr-only"}>{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ numeric = false, className = "", ...props }: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th
      scope="col"
      {...props}
      className={`sticky top-0 z-10 border-b border-rule bg-card px-3 py-2 text-sm font-semibold text-muted whitespace-nowrap ${numeric ? "text-right" : ""} ${className}`}
    />
  );
}

export function Td({ numeric = false, className = "", ...props }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return <td {...props} className={`border-b border-rule px-3 py-2 align-top ${numeric ? "text-right tabular-nums" : ""} ${className}`} />;
}
