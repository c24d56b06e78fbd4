import { useId, useRef, type KeyboardEvent, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export type Tab = { id: string; label: ReactNode; panel: ReactNode };

/**
 * Tabs as the ARIA pattern has them: one tab stop for the row, arrow keys (and Home/End) move between tabs and
 * select them, each panel is labelled by its tab. Controlled: the parent keeps the selected id.
 */
export function Tabs({
  label,
  tabs,
  selected,
  onSelect,
  className,
}: {
  label: string;
  tabs: Tab[];
  selected: string;
  onSelect: (id: string) => void;
  className?: string;
}) {
  const base = useId();
  const refs = useRef<(HTMLButtonElement | null)[]>([]);
  const index = Math.max(
    0,
    tabs.findIndex((t) => t.id === selected),
  );
  const move = (event: KeyboardEvent, from: number) => {
    const last = tabs.length - 1;
    const to =
      event.key === 'ArrowRight'
        ? from === last
          ? 0
          : from + 1
        : event.key === 'ArrowLeft'
          ? from === 0
            ? last
            : from - 1
          : event.key === 'Home'
            ? 0
            : event.key === 'End'
              ? last
              : null;
    if (to === null) return;
    event.preventDefault();
    onSelect(tabs[to]!.id);
    refs.current[to]?.focus();
  };
  return (
    <div className={className}>
      <div role="tablist" aria-label={label} className="flex gap-1 overflow-x-auto border-b border-foil-800">
        {tabs.map((tab, i) => (
          <button
            key={tab.id}
            ref={(el) => {
              refs.current[i] = el;
            }}
            type="button"
            role="tab"
            id={`${base}-tab-${tab.id}`}
            aria-selected={i === index}
            aria-controls={`${base}-panel-${tab.id}`}
            tabIndex={i === index ? 0 : -1}
            onClick={() => onSelect(tab.id)}
            onKeyDown={(e) => move(e, i)}
            className={cn(
              '-mb-px whitespace-nowrap border-b-2 px-3 py-2 text-sm font-semibold transition-colors',
              i === index ? 'border-amber-400 text-foil-50' : 'border-transparent text-foil-300 hover:text-foil-50',
            )}
          >
            {tab.label}
          </button>
        ))}
      </div>
      {tabs.map((tab, i) => (
        <div
          key={tab.id}
          role="tabpanel"
          id={`${base}-panel-${tab.id}`}
          aria-labelledby={`${base}-tab-${tab.id}`}
          hidden={i !== index}
          tabIndex={0}
          className="pt-4 outline-none"
        >
          {i === index && tab.panel}
        </div>
      ))}
    </div>
  );
}
