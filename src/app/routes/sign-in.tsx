import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { useMe } from '@/features/auth/api/get-me';
import { GoogleButton } from '@/features/auth/components/google-button';
import { SignInForm } from '@/features/auth/components/sign-in-form';
import { useDocumentTitle } from '@/lib/document-title';
import { safeReturnTo } from '@/lib/return-to';
import { hasAnyRole, staffRoles } from '@/lib/roles';
import { AuthCard, textLinkClass } from '../layouts/auth-card';

export function homeFor(account: AccountView): string {
  return hasAnyRole(account.roles, staffRoles) ? '/console' : '/my-support';
}

// What the Google callback tells the sign-in page when it signed nobody in (`/sign-in?error=…`).
const providerErrors: Record<string, { title: string; text: string }> = {
  'auth.state_mismatch': {
    title: 'You were not signed in',
    text: 'That Google sign-in link was not started from this browser, so we ignored it. If you meant to sign in, choose “Continue with Google” here.',
  },
  'auth.email_unverified': {
    title: 'Google did not confirm your e-mail',
    text: 'Your Google account did not confirm an e-mail address, so we cannot sign you in with it. Sign in with your e-mail and password instead.',
  },
  'auth.provider_failed': {
    title: 'Google sign-in did not finish',
    text: 'Something went wrong between us and Google. Try again, or sign in with your e-mail and password.',
  },
};

export function Component() {
  useDocumentTitle('Sign in');
  const [params] = useSearchParams();
  const returnTo = safeReturnTo(params.get('returnTo'));
  const navigate = useNavigate();
  const me = useMe();
  const errorCode = params.get('error');
  const providerError = errorCode ? (providerErrors[errorCode] ?? providerErrors['auth.provider_failed']) : undefined;

  if (me.data) return <Navigate replace to={returnTo ?? homeFor(me.data)} />;

  const withReturn = (path: string) => (returnTo ? `${path}?returnTo=${encodeURIComponent(returnTo)}` : path);

  return (
    <AuthCard
      title="Sign in"
      description={returnTo ? 'Sign in to continue where you were.' : 'Follow Tern-1, manage your support, or get to work in the console.'}
      footer={
        <p>
          New here?{' '}
          <Link to={withReturn('/sign-up')} className={textLinkClass}>
            Create an account
          </Link>
        </p>
      }
    >
      {providerError && <Alert title={providerError.title}>{providerError.text}</Alert>}
      <GoogleButton returnTo={returnTo ?? '/my-support'} />
      <SignInForm onSignedIn={(account) => navigate(returnTo ?? homeFor(account), { replace: true })} />
      <p className="text-center text-sm">
        <Link to="/forgot-password" className={textLinkClass}>
          Forgot your password?
        </Link>
      </p>
    </AuthCard>
  );
}
