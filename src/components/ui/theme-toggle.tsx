import { useSyncExternalStore } from 'react';
import { cn } from '@/lib/cn';

export type Theme = 'light' | 'dark';
const STORAGE_KEY = 'lk-theme';

function currentTheme(): Theme {
  const chosen = document.documentElement.dataset.theme;
  if (chosen === 'light' || chosen === 'dark') return chosen;
  return window.matchMedia('(prefers-color-scheme: light)').matches ? 'light' : 'dark';
}

const listeners = new Set<() => void>();
function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}
// The server cannot know the visitor's theme: its HTML and the hydration pass show the dark theme's button, and
// React redraws it with the visitor's own right after (no hydration mismatch; the page's colours come from CSS).
const serverTheme = (): Theme => 'dark';

/** Switches between the light and dark theme and remembers the choice on this device (public/theme.js reapplies it). */
export function ThemeToggle({ className }: { className?: string }) {
  const theme = useSyncExternalStore(subscribe, currentTheme, serverTheme);
  const next: Theme = theme === 'dark' ? 'light' : 'dark';
  return (
    <button
      type="button"
      onClick={() => {
        document.documentElement.dataset.theme = next;
        try {
          localStorage.setItem(STORAGE_KEY, next);
        } catch {
          // Storage blocked: the choice lasts for this page only.
        }
        for (const listener of listeners) listener();
      }}
      className={cn(
        'inline-flex min-h-10 min-w-10 items-center justify-center gap-2 rounded-lg border border-foil-700 px-2.5 text-sm font-semibold text-foil-100 hover:border-foil-400',
        className,
      )}
    >
      <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5">
        {theme === 'dark' ? (
          <path d="M14.5 12.5A6.5 6.5 0 0 1 7.5 3.6a6.5 6.5 0 1 0 7 8.9Z" fill="currentColor" />
        ) : (
          <g stroke="currentColor" strokeWidth="1.6" strokeLinecap="round">
            <circle cx="10" cy="10" r="3.4" fill="currentColor" />
            <path d="M10 1.8v2M10 16.2v2M1.8 10h2M16.2 10h2M4.2 4.2l1.4 1.4M14.4 14.4l1.4 1.4M4.2 15.8l1.4-1.4M14.4 5.6l1.4-1.4" />
          </g>
        )}
      </svg>
      <span className="sr-only">
        {theme === 'dark' ? 'Dark theme on; switch to the light theme' : 'Light theme on; switch to the dark theme'}
      </span>
    </button>
  );
}
