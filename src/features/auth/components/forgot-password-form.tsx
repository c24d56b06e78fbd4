import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { requestPasswordResetSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { applyApiError } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../api/request-password-reset';
import { AuthForm, EmailField } from './auth-form';

type Values = z.input<typeof requestPasswordResetSchema>;

export function ForgotPasswordForm() {
  const [formError, setFormError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<Values, unknown, z.output<typeof requestPasswordResetSchema>>({
    resolver: zodResolver(requestPasswordResetSchema),
    defaultValues: { email: '' },
  });
  const request = useRequestPasswordReset();

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await request.mutateAsync(values);
      setSentTo(values.email);
    } catch (error) {
      setFormError(applyApiError(error, form.setError, { fields: ['email'] }));
    }
  });

  if (sentTo) {
    return (
      <Alert tone="success" title="Check your inbox">
        If an account uses {sentTo}, a link to choose a new password is on its way. The link works once and expires after a short while.
      </Alert>
    );
  }

  return (
    <AuthForm
      onSubmit={onSubmit}
      problem={formError && <Alert title="Could not send the link">{formError}</Alert>}
      submitLabel="Send reset link"
      pending={request.isPending}
    >
      <EmailField error={form.formState.errors.email?.message} {...form.register('email')} />
    </AuthForm>
  );
}
