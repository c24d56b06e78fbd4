import { useEffect, useRef } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { useVerifyEmail } from '@/features/auth/api/verify-email';
import { useDocumentTitle } from '@/lib/document-title';
import { errorMessage } from '@/lib/form-errors';
import { AuthCard } from '../layouts/auth-card';

export function Component() {
  useDocumentTitle('Verify e-mail');
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const verify = useVerifyEmail();
  const sent = useRef(false);

  useEffect(() => {
    // A token works once: never send it twice (StrictMode runs effects twice in development).
    if (!token || sent.current) return;
    sent.current = true;
    verify.mutate({ token });
  }, [token, verify]);

  return (
    <AuthCard title="Verify your e-mail">
      {!token ? (
        <Alert title="This link is missing its token">Open the link from the verification message again.</Alert>
      ) : verify.isSuccess ? (
        <>
          <Alert tone="success" title="E-mail confirmed — you are signed in">
            Signed in as {verify.data.account.email}. Receipts and dispatches will reach you at this address.
          </Alert>
          <Link to="/my-support" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
            Go to my support
          </Link>
        </>
      ) : verify.isError ? (
        <>
          <Alert title="Could not verify">
            {errorMessage(verify.error)} Lost the message? Ask for a password reset: its link confirms your address too.
          </Alert>
          <Link to="/forgot-password" className={buttonClasses({ variant: 'secondary', size: 'lg', className: 'w-full' })}>
            Reset my password
          </Link>
        </>
      ) : (
        <Spinner label="Verifying your e-mail address…" />
      )}
    </AuthCard>
  );
}
