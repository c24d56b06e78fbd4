import { Link } from 'react-router-dom';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';
import { useDocumentTitle } from '@/lib/document-title';
import { AuthCard, textLinkClass } from '../layouts/auth-card';

export function Component() {
  useDocumentTitle('Forgot password');
  return (
    <AuthCard
      title="Forgot your password?"
      description="Tell us the address you signed up with and we will send a link to choose a new one."
      footer={
        <p>
          Remembered it?{' '}
          <Link to="/sign-in" className={textLinkClass}>
            Back to sign in
          </Link>
        </p>
      }
    >
      <ForgotPasswordForm />
    </AuthCard>
  );
}
