/**
 * A clearance level as a word plus a shape (PRODUCT.md: never colour alone). Square shapes, so
 * a level is never mistaken for one of the round status marks; they differ in outline and fill,
 * so they read in greyscale and on paper.
 */
import { LEVEL_WORDS, type ClearanceLevel } from "~/domain/clearance";

function Shape({ level }: { level: ClearanceLevel }) {
  const common = { width: 14, height: 14, viewBox: "0 0 16 16", "aria-hidden": true as const, className: "shrink-0" };
  switch (level) {
    case "independent": // filled square
      return (
        <svg {...common}>
          <rect x="1.5" y="1.5" width="13" height="13" rx="1.5" fill="#0F5C57" />
        </svg>
      );
    case "supervised": // square, lower half filled
      return (
        <svg {...common}>
          <rect x="2" y="2" width="12" height="12" rx="1.5" fill="none" stroke="#17302E" strokeWidth="1.6" />
          <rect x="2" y="8" width="12" height="6" fill="#17302E" />
        </svg>
      );
    case "not-cleared": // open square with a cross
      return (
        <svg {...common}>
          <rect x="2" y="2" width="12" height="12" rx="1.5" fill="none" stroke="#B8432A" strokeWidth="1.8" />
          <path d="M5 5 11 11M11 5 5 11" stroke="#B8432A" strokeWidth="1.8" />
        </svg>
      );
  }
}

export function LevelMark({ level }: { level: ClearanceLevel }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap" data-level={level}>
      <Shape level={level} />
      <span className={level === "not-cleared" ? "font-semibold text-coral" : "font-semibold"}>{LEVEL_WORDS[level]}</span>
    </span>
  );
}
