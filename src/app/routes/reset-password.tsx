import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';
import { useDocumentTitle } from '@/lib/document-title';
import { AuthCard, textLinkClass } from '../layouts/auth-card';

export function Component() {
  useDocumentTitle('Choose a new password');
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const [done, setDone] = useState(false);

  return (
    <AuthCard
      title="Choose a new password"
      footer={
        <p>
          Link not working?{' '}
          <Link to="/forgot-password" className={textLinkClass}>
            Ask for a new one
          </Link>
        </p>
      }
    >
      {done ? (
        <>
          <Alert tone="success" title="Password changed">
            Sign in with your new password.
          </Alert>
          <Link to="/sign-in" className={buttonClasses({ size: 'lg', className: 'w-full' })}>
            Sign in
          </Link>
        </>
      ) : !token ? (
        <Alert title="This link is missing its token">Open the link from the reset message again, or ask for a new one.</Alert>
      ) : (
        <ResetPasswordForm token={token} onDone={() => setDone(true)} />
      )}
    </AuthCard>
  );
}
