import type { ReactNode } from 'react';

export function AuthCard({
  title,
  description,
  children,
  footer,
}: {
  title: string;
  description?: ReactNode;
  children: ReactNode;
  footer?: ReactNode;
}) {
  return (
    <div className="relative px-4 py-10 sm:py-16">
      <div
        aria-hidden="true"
        className="pointer-events-none absolute inset-x-0 top-0 h-64 bg-[radial-gradient(ellipse_at_top,rgba(245,162,27,0.12),transparent_60%)]"
      />
      <div className="relative mx-auto w-full max-w-md">
        <div className="rounded-2xl border border-foil-700/70 bg-night-900/90 p-6 shadow-2xl shadow-night-950 sm:p-8">
          <h1 className="text-2xl font-bold text-foil-50">{title}</h1>
          {description && <p className="mt-2 text-foil-300">{description}</p>}
          <div className="mt-6 space-y-5">{children}</div>
        </div>
        {footer && <div className="mt-6 space-y-2 text-center text-sm text-foil-300">{footer}</div>}
      </div>
    </div>
  );
}

export const textLinkClass = 'font-semibold text-amber-300 underline decoration-amber-400/40 underline-offset-4 hover:decoration-amber-300';
