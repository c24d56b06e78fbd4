import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { signInSchema, type AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { applyApiError } from '@/lib/form-errors';
import { useSignIn } from '../api/sign-in';
import { AuthForm, EmailField, PasswordField } from './auth-form';

type Values = z.input<typeof signInSchema>;

export function SignInForm({ onSignedIn }: { onSignedIn: (account: AccountView) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<Values, unknown, z.output<typeof signInSchema>>({
    resolver: zodResolver(signInSchema),
    defaultValues: { email: '', password: '' },
  });
  const signIn = useSignIn({ onSuccess: onSignedIn });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signIn.mutateAsync(values);
    } catch (error) {
      setFormError(applyApiError(error, form.setError, { fields: ['email', 'password'] }));
      form.resetField('password', { keepError: true });
    }
  });

  return (
    <AuthForm
      onSubmit={onSubmit}
      problem={formError && <Alert title="Could not sign in">{formError}</Alert>}
      submitLabel="Sign in"
      pending={signIn.isPending}
    >
      <EmailField error={errors.email?.message} {...form.register('email')} />
      <PasswordField autoComplete="current-password" error={errors.password?.message} {...form.register('password')} />
    </AuthForm>
  );
}
