import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

export function EmptyState({
  title,
  description,
  action,
  className,
}: {
  title: ReactNode;
  description?: ReactNode;
  action?: ReactNode;
  className?: string;
}) {
  return (
    <div className={cn('flex flex-col items-center rounded-xl border border-dashed border-foil-700 px-6 py-10 text-center', className)}>
      <svg aria-hidden="true" viewBox="0 0 48 48" className="mb-3 size-10 text-foil-500">
        <path d="M8 40 L24 8 L40 40 Z" fill="none" stroke="currentColor" strokeWidth="2" strokeLinejoin="round" />
        <path d="M24 8 V40" stroke="currentColor" strokeWidth="2" />
      </svg>
      <p className="font-bold text-foil-100">{title}</p>
      {description && <p className="mt-1 max-w-md text-sm text-foil-400">{description}</p>}
      {action && <div className="mt-4">{action}</div>}
    </div>
  );
}
