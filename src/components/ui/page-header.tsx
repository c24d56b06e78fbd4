import type { ReactNode } from 'react';

export function PageHeader({
  title,
  eyebrow,
  description,
  actions,
}: {
  title: ReactNode;
  eyebrow?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
}) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-foil-800/80 pb-5">
      <div className="min-w-0 max-w-3xl">
        {eyebrow && <p className="text-xs font-bold uppercase tracking-[0.18em] text-amber-400">{eyebrow}</p>}
        <h1 className="mt-1 text-2xl font-bold text-foil-50 sm:text-3xl">{title}</h1>
        {description && <p className="mt-2 text-foil-300">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
    </header>
  );
}
