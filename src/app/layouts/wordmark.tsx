import { Link } from 'react-router-dom';

export function Wordmark({ suffix }: { suffix?: string }) {
  return (
    <Link to="/" className="group inline-flex items-center gap-2 rounded-lg py-1 pr-1 text-foil-50">
      <svg aria-hidden="true" viewBox="0 0 32 32" className="size-8">
        <circle cx="25" cy="7" r="3" className="fill-amber-400" />
        <path d="M16 4 L27 16 L16 28 L5 16 Z" className="fill-foil-300/15 stroke-foil-200" strokeWidth="1.5" strokeLinejoin="round" />
        <path d="M16 4 V28 M5 16 H27" className="stroke-foil-400" strokeWidth="1" />
      </svg>
      <span className="text-lg font-bold tracking-wide">Lightkeel</span>
      {suffix && (
        <span className="rounded-md border border-amber-400/50 px-1.5 py-0.5 text-xs font-semibold uppercase tracking-wider text-amber-300">
          {suffix}
        </span>
      )}
    </Link>
  );
}
