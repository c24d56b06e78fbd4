import { buttonClasses } from '@/components/ui/button';
import { useProviders } from '../api/get-providers';

/** Rendered only when the server says Google sign-in is configured; a full page navigation, not fetch. */
export function GoogleButton({ returnTo }: { returnTo: string }) {
  const providers = useProviders();
  if (!providers.data?.google) return null;
  return (
    <>
      <a
        href={`/api/auth/google?returnTo=${encodeURIComponent(returnTo)}`}
        className={buttonClasses({ variant: 'secondary', size: 'lg', className: 'w-full' })}
      >
        <svg aria-hidden="true" viewBox="0 0 20 20" className="size-5">
          <circle cx="10" cy="10" r="8" fill="none" stroke="currentColor" strokeWidth="1.6" />
          <path d="M10 10h6" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
        </svg>
        Continue with Google
      </a>
      <div className="flex items-center gap-3 text-xs uppercase tracking-widest text-foil-500" aria-hidden="true">
        <span className="h-px flex-1 bg-foil-800" />
        or
        <span className="h-px flex-1 bg-foil-800" />
      </div>
    </>
  );
}
