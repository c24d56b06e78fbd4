import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { resetPasswordSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { isApiError } from '@/lib/api-client';
import { applyApiError } from '@/lib/form-errors';
import { useResetPassword } from '../api/reset-password';
import { AuthForm, PasswordField } from './auth-form';

type Values = z.input<typeof resetPasswordSchema>;

export function ResetPasswordForm({ token, onDone }: { token: string; onDone: () => void }) {
  const [formError, setFormError] = useState<{ message: string; tokenProblem: boolean } | null>(null);
  const form = useForm<Values, unknown, z.output<typeof resetPasswordSchema>>({
    resolver: zodResolver(resetPasswordSchema),
    defaultValues: { token, password: '' },
  });
  const reset = useResetPassword();
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await reset.mutateAsync(values);
      onDone();
    } catch (error) {
      const message = applyApiError(error, form.setError, { fields: ['password'] });
      const tokenProblem = isApiError(error) && (error.code === 'auth.token_invalid' || error.details.some((d) => d.path === 'token'));
      if (message || tokenProblem) setFormError({ message: message ?? 'This link cannot be used.', tokenProblem });
    }
  });

  return (
    <AuthForm
      onSubmit={onSubmit}
      problem={
        (formError || errors.token) && (
          <Alert title="Could not set the password">
            {formError?.message ?? 'This reset link is incomplete.'}
            {(formError?.tokenProblem || errors.token) && ' Reset links work once and expire; ask for a new one below.'}
          </Alert>
        )
      }
      submitLabel="Set new password"
      pending={reset.isPending}
    >
      <input type="hidden" {...form.register('token')} />
      <PasswordField
        label="New password"
        autoComplete="new-password"
        hint="At least 10 characters."
        error={errors.password?.message}
        {...form.register('password')}
      />
    </AuthForm>
  );
}
