import { createContext, use } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { isNotFoundError } from '@/lib/api-client';
import { useDocumentTitle } from '@/lib/document-title';
import { NotFoundPage } from './not-found';

/** The error a route's boundary caught (see ../route-tree.tsx). */
export const CaughtErrorContext = createContext<unknown>(null);

/** Inside a layout it fills the layout's main region; `standalone` when the layout itself failed. */
export function RouteError({ standalone = false }: { standalone?: boolean }) {
  const error = use(CaughtErrorContext);
  if (isNotFoundError(error)) return <NotFoundPage />;
  return <BrokenPage error={error} standalone={standalone} />;
}

function BrokenPage({ error, standalone }: { error: unknown; standalone: boolean }) {
  useDocumentTitle('This page stopped working');
  // A failed lazy import usually means a new release replaced the files: a reload fetches them.
  const chunkFailed = error instanceof TypeError && /dynamically imported module|Importing a module script failed/i.test(error.message);
  const Wrapper = standalone ? 'main' : 'div';
  return (
    <Wrapper id={standalone ? 'main' : undefined} className="mx-auto max-w-xl px-4 py-16">
      <h1 className="mb-4 text-2xl font-bold text-foil-50">Something went wrong</h1>
      <Alert title={chunkFailed ? 'This page could not be loaded' : 'The page stopped working'}>
        <p>
          {chunkFailed
            ? 'Lightkeel may have been updated since you opened it: reloading fetches the new version.'
            : 'Reloading usually helps. If it keeps happening, tell the mission team what you were doing.'}
        </p>
        <Button variant="secondary" size="sm" className="mt-3" onClick={() => window.location.reload()}>
          Reload the page
        </Button>
      </Alert>
    </Wrapper>
  );
}
