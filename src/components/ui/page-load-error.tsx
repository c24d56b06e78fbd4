import { errorMessage } from '@/lib/form-errors';
import { Alert } from './alert';
import { Button } from './button';

/** A page that could not load what it shows, with a way to ask again. */
export function PageLoadError({ title, error, onRetry }: { title: string; error: unknown; onRetry: () => void }) {
  return (
    <div className="mx-auto max-w-xl px-4 py-16">
      <Alert title={title}>
        <p>{errorMessage(error)}</p>
        <Button variant="secondary" size="sm" className="mt-3" onClick={() => onRetry()}>
          Try again
        </Button>
      </Alert>
    </div>
  );
}
