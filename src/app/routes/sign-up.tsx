import { Link, Navigate, useSearchParams } from 'react-router-dom';
import { useMe } from '@/features/auth/api/get-me';
import { GoogleButton } from '@/features/auth/components/google-button';
import { SignUpForm } from '@/features/auth/components/sign-up-form';
import { useDocumentTitle } from '@/lib/document-title';
import { safeReturnTo } from '@/lib/return-to';
import { AuthCard, textLinkClass } from '../layouts/auth-card';

export function Component() {
  useDocumentTitle('Create an account');
  const [params] = useSearchParams();
  const returnTo = safeReturnTo(params.get('returnTo'));
  const me = useMe();

  if (me.data) return <Navigate replace to={returnTo ?? '/my-support'} />;

  return (
    <AuthCard
      title="Create an account"
      description="Back Tern-1, get dispatches from orbit, and keep your pledges and receipts in one place."
      footer={
        <p>
          Already have an account?{' '}
          <Link to={returnTo ? `/sign-in?returnTo=${encodeURIComponent(returnTo)}` : '/sign-in'} className={textLinkClass}>
            Sign in
          </Link>
        </p>
      }
    >
      <GoogleButton returnTo={returnTo ?? '/my-support'} />
      <SignUpForm />
      <p className="text-sm text-foil-400">We send one message to confirm your e-mail address; its link signs you in.</p>
    </AuthCard>
  );
}
