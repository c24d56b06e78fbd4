import { cn } from '@/lib/cn';

export function ProgressBar({
  value,
  max = 100,
  label,
  valueText,
  className,
}: {
  value: number;
  max?: number;
  label: string;
  /** What a screen reader says instead of the bare number, e.g. "€3,100 of €5,000". */
  valueText?: string;
  className?: string;
}) {
  const clamped = Math.min(Math.max(value, 0), max);
  const percent = max > 0 ? (clamped / max) * 100 : 0;
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={max}
      aria-valuenow={clamped}
      aria-valuetext={valueText}
      className={cn('h-3 w-full overflow-hidden rounded-full bg-night-800 ring-1 ring-foil-700/60', className)}
    >
      <div
        className="h-full rounded-full bg-gradient-to-r from-amber-500 to-amber-300 transition-[width]"
        style={{ width: `${percent}%` }}
      />
    </div>
  );
}
