import { NavLink } from 'react-router-dom';
import { cn } from '@/lib/cn';

export type SectionLink = { to: string; label: string; end?: boolean };

/** The row of pages inside one console section; the current page is marked for sight and for screen readers. */
export function SectionNav({ label, links }: { label: string; links: SectionLink[] }) {
  return (
    <nav aria-label={label} className="-mx-1 flex flex-wrap gap-1">
      {links.map((t) => (
        <NavLink
          key={t.to}
          to={t.to}
          end={t.end}
          className={({ isActive }) =>
            cn(
              'rounded-lg px-3 py-1.5 text-sm font-semibold transition-colors',
              isActive ? 'bg-amber-400 text-night-950' : 'text-foil-200 hover:bg-night-800 hover:text-foil-50',
            )
          }
        >
          {t.label}
        </NavLink>
      ))}
    </nav>
  );
}
