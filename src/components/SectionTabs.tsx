import { NavLink } from 'react-router-dom';

/** Links between the pages of one area, under its header. */
export function SectionTabs({ label, tabs }: { label: string; tabs: { to: string; label: string; end?: boolean }[] }) {
  return (
    <nav aria-label={label} className="mb-3 flex gap-1 border-b border-paper-line">
      {tabs.map((tab) => (
        <NavLink
          key={tab.to}
          to={tab.to}
          end={tab.end}
          className={({ isActive }) =>
            `-mb-px border-b-2 px-3 py-1.5 text-sm no-underline ${isActive ? 'border-frame font-medium text-ink' : 'border-transparent text-ink-muted hover:text-ink'}`
          }
        >
          {tab.label}
        </NavLink>
      ))}
    </nav>
  );
}
