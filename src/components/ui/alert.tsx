import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

export type AlertTone = 'error' | 'success' | 'info' | 'warning';

const tones: Record<AlertTone, string> = {
  error: 'border-red-400/60 bg-red-950/50 text-red-100',
  success: 'border-emerald-400/50 bg-emerald-950/50 text-emerald-100',
  info: 'border-foil-500/60 bg-night-800/80 text-foil-100',
  warning: 'border-amber-400/60 bg-amber-950/40 text-amber-100',
};

const glyphs: Record<AlertTone, string> = { error: '!', success: '✓', info: 'i', warning: '!' };

/** Errors and warnings interrupt (role="alert"); success and info are polite status messages. */
export function Alert({
  tone = 'error',
  title,
  children,
  className,
}: {
  tone?: AlertTone;
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
}) {
  const urgent = tone === 'error' || tone === 'warning';
  return (
    <div role={urgent ? 'alert' : 'status'} className={cn('flex gap-3 rounded-xl border px-4 py-3 text-sm', tones[tone], className)}>
      <span
        aria-hidden="true"
        className="mt-0.5 flex size-5 shrink-0 items-center justify-center rounded-full border border-current text-xs font-bold"
      >
        {glyphs[tone]}
      </span>
      <div className="min-w-0 space-y-1">
        {title && <p className="font-bold">{title}</p>}
        {children && <div>{children}</div>}
      </div>
    </div>
  );
}
