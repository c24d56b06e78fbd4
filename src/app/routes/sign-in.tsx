import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import type { AccountView } from '@shared/schemas/auth';
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

export function Component() {
  useDocumentTitle('Sign in');
  const [params] = useSearchParams();
  const returnTo = safeReturnTo(params.get('returnTo'));
  const navigate = useNavigate();
  const me = useMe();

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
