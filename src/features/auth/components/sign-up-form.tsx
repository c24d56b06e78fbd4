import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { signUpSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useSignUp } from '../api/sign-up';
import { AuthForm, EmailField, PasswordField } from './auth-form';

type Values = z.input<typeof signUpSchema>;

/**
 * Creates the account and says "check your inbox" — the same for every address, whether or not it already had an
 * account; the link in the mail confirms the address and signs in.
 */
export function SignUpForm() {
  const [formError, setFormError] = useState<string | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm<Values, unknown, z.output<typeof signUpSchema>>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { displayName: '', email: '', password: '' },
  });
  const signUp = useSignUp();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    setNotice(null);
    try {
      const answer = await signUp.mutateAsync(values);
      setNotice(answer.message);
      form.resetField('password');
    } catch (error) {
      setFormError(
        applyApiError(error, form.setError, {
          fields: ['displayName', 'email', 'password'],
          codeToField: { 'auth.email_taken': 'email' },
        }),
      );
    }
  });

  return (
    <AuthForm
      onSubmit={onSubmit}
      problem={
        formError ? (
          <Alert title="Could not create the account">{formError}</Alert>
        ) : notice ? (
          <Alert tone="info" title="Check your inbox">
            {notice}
          </Alert>
        ) : null
      }
      submitLabel="Create account"
      pending={signUp.isPending}
    >
      <TextField
        label="Display name"
        autoComplete="nickname"
        hint="How we address you on Lightkeel and in our mail."
        error={errors.displayName?.message}
        {...form.register('displayName')}
      />
      <EmailField error={errors.email?.message} {...form.register('email')} />
      <PasswordField
        autoComplete="new-password"
        hint="At least 10 characters. A short sentence works well."
        error={errors.password?.message}
        {...form.register('password')}
      />
    </AuthForm>
  );
}
