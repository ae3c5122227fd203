import { NavLink } from "react-router";

export type SectionTab = { to: string; label: string; end: boolean };

/** The tab strip under a section's heading (Admin, Bank, Check-offs): 44 px targets, current tab underlined. */
export function SectionTabs({ label, tabs, className = "" }: { label: string; tabs: readonly SectionTab[]; className?: string }) {
  return (
    <nav aria-label={label} className={`border-b border-rule ${className}`}>
      <ul className="flex flex-wrap gap-1">
        {tabs.map((t) => (
          <li key={t.to}>
            <NavLink
              to={t.to}
              end={t.end}
              className={({ isActive }) =>
                `inline-flex min-h-11 items-center border-b-[3px] px-3 font-semibold no-underline ${isActive ? "border-sea text-ink" : "border-transparent text-sea"}`
              }
            >
              {t.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
