import { useEffect, useRef } from 'react';
import { NavLink, useLocation } from 'react-router-dom';
import { cn } from '@/lib/cn';

export type AreaNavItem = { to: string; label: string; end?: boolean };

/** A sidebar from md up; on narrower screens a row of links that scrolls sideways. */
export function AreaNav({ label, items }: { label: string; items: AreaNavItem[] }) {
  const ref = useRef<HTMLElement>(null);
  const { pathname } = useLocation();
  useEffect(() => {
    // On a phone the row may be wider than the screen: keep the current page's link in view.
    ref.current?.querySelector('[aria-current="page"]')?.scrollIntoView({ block: 'nearest', inline: 'nearest' });
  }, [pathname]);
  return (
    <nav ref={ref} aria-label={label} className="md:w-56 md:shrink-0">
      <p className="mb-2 hidden px-3 text-xs font-bold uppercase tracking-[0.18em] text-foil-500 md:block">{label}</p>
      <ul className="-mx-4 flex gap-1 overflow-x-auto px-4 pb-1 md:mx-0 md:flex-col md:overflow-visible md:px-0">
        {items.map((item) => (
          <li key={item.to} className="shrink-0">
            <NavLink
              to={item.to}
              end={item.end}
              className={({ isActive }) =>
                cn(
                  'block whitespace-nowrap rounded-lg border px-3 py-2 text-sm font-semibold transition-colors',
                  isActive
                    ? 'border-amber-400/60 bg-night-800 text-amber-200'
                    : 'border-transparent text-foil-300 hover:bg-night-800 hover:text-foil-50',
                )
              }
            >
              {item.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
