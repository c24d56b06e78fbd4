import { useEffect } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { useUnsubscribe } from '@/features/dispatches/api/public-dispatches';

const WHAT: Record<string, { name: string; undo: string }> = {
  dispatches: { name: 'dispatches', undo: 'Undo: keep sending me dispatches' },
  passReminders: { name: 'pass reminders', undo: 'Undo: keep sending me pass reminders' },
};

/** The footer link: unsubscribes at once (no sign-in), and offers to undo. */
export function Component() {
  useDocumentTitle('Unsubscribe');
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const m = useUnsubscribe();
  const { mutate } = m;
  useEffect(() => {
    if (token) mutate({ token, subscribed: false });
  }, [token, mutate]);
  return (
    <div className="mx-auto w-full max-w-xl px-4 py-8">
      <Card>
        <h1 className="text-2xl font-bold">E-mail choices</h1>
        {m.isPending || m.isIdle ? (
          <Spinner label="Saving your choice…" />
        ) : m.isError ? (
          <Alert title="This link did not work">{errorMessage(m.error)}</Alert>
        ) : m.data.subscribed ? (
          <p className="mt-3">You will receive {(WHAT[m.data.category] ?? WHAT.dispatches!).name} by e-mail again.</p>
        ) : (
          <>
            <p className="mt-3">
              You will no longer receive {(WHAT[m.data.category] ?? WHAT.dispatches!).name} by e-mail. Receipts and account messages still
              arrive.
            </p>
            <Button className="mt-3" variant="secondary" onClick={() => m.mutate({ token, subscribed: true })}>
              {(WHAT[m.data.category] ?? WHAT.dispatches!).undo}
            </Button>
          </>
        )}
        <p className="mt-4">
          <Link className="text-amber-300 underline" to="/my-support/email">
            All your e-mail choices
          </Link>
        </p>
      </Card>
    </div>
  );
}
