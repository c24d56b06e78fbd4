import { cn } from '@/lib/cn';

const sizes = { sm: 'size-4 border-2', md: 'size-6 border-2', lg: 'size-10 border-[3px]' } as const;

/** With a label it announces itself as a status; with `label={null}` it is decoration inside a labelled control. */
export function Spinner({
  size = 'md',
  label = 'Loading…',
  className,
}: {
  size?: keyof typeof sizes;
  label?: string | null;
  className?: string;
}) {
  const ring = (
    <span
      aria-hidden="true"
      className={cn('inline-block animate-spin rounded-full border-foil-500/40 border-t-amber-400', sizes[size], className)}
    />
  );
  if (label === null) return ring;
  return (
    <span role="status" className="inline-flex items-center gap-2 text-foil-300">
      {ring}
      <span className="sr-only">{label}</span>
    </span>
  );
}

export function PageSpinner({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-48 items-center justify-center">
      <Spinner size="lg" label={label} />
    </div>
  );
}
