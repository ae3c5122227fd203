/** Tidemark's own mark: a tide line over a level line. Decorative; the name carries the meaning. */
export function ProductMark({ compact = false }: { compact?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2 font-semibold text-ink">
      <svg aria-hidden="true" width={compact ? 24 : 28} height={compact ? 24 : 28} viewBox="0 0 32 32">
        <rect width="32" height="32" rx="6" fill="#0F5C57" />
        <path d="M4 20c4-6 8-6 12 0s8 6 12 0" fill="none" stroke="#FAF6EF" strokeWidth="3" strokeLinecap="round" />
        <path d="M4 13h24" stroke="#FAF6EF" strokeWidth="2" strokeLinecap="round" opacity=".6" />
      </svg>
      <span className={compact ? "text-lg" : "text-xl"}>Tidemark</span>
    </span>
  );
}
