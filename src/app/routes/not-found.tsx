import { Link, useLocation } from 'react-router-dom';
import { buttonClasses } from '@/components/ui/button';
import { useDocumentTitle } from '@/lib/document-title';

export function NotFoundPage() {
  useDocumentTitle('Page not found');
  const { pathname } = useLocation();
  const backTo = pathname.startsWith('/console') ? '/console' : pathname.startsWith('/my-support') ? '/my-support' : '/';
  return (
    <div className="mx-auto max-w-xl px-4 py-16 text-center">
      <p className="text-sm font-bold uppercase tracking-[0.2em] text-amber-400">404</p>
      <h1 className="mt-2 text-3xl font-bold text-foil-50">No page at this address</h1>
      <p className="mt-3 text-foil-300">
        Nothing lives at <code className="break-all rounded bg-night-800 px-1.5 py-0.5 text-foil-100">{pathname}</code>. The link may be
        old, or the address mistyped.
      </p>
      <Link to={backTo} className={buttonClasses({ className: 'mt-8' })}>
        {backTo === '/' ? 'Back to the mission' : backTo === '/console' ? 'Back to the console' : 'Back to my support'}
      </Link>
    </div>
  );
}

export const Component = NotFoundPage;
