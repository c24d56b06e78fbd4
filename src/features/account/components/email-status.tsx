import type { AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { errorMessage } from '@/lib/form-errors';
import { useResendVerification } from '../api/resend-verification';

export function EmailStatus({ account }: { account: AccountView }) {
  const resend = useResendVerification();
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-3">
        <span className="break-all font-semibold text-foil-50">{account.email}</span>
        {account.emailVerified ? <Badge tone="good">Verified</Badge> : <Badge tone="attention">Not verified yet</Badge>}
      </div>
      {!account.emailVerified && (
        <>
          <p className="text-sm text-foil-300">
            Confirm your address so receipts and mission dispatches reach you. The link is in the message we sent when you signed up.
          </p>
          {resend.isSuccess ? (
            <Alert tone="success">A new verification link is on its way to {account.email}.</Alert>
          ) : (
            <Button variant="secondary" size="sm" loading={resend.isPending} onClick={() => resend.mutate()}>
              Send the link again
            </Button>
          )}
          {resend.isError && <Alert>{errorMessage(resend.error)}</Alert>}
        </>
      )}
    </div>
  );
}
