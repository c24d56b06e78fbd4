import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { requestPasswordResetSchema } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useRequestPasswordReset } from '../api/request-password-reset';

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
        If an account uses {sentTo}, a link to choose a new password is on its way. The link works once and
        expires after a short while.
      </Alert>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError && <Alert title="Could not send the link">{formError}</Alert>}
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        inputMode="email"
        error={form.formState.errors.email?.message}
        {...form.register('email')}
      />
      <Button type="submit" size="lg" className="w-full" loading={request.isPending}>
        Send reset link
      </Button>
    </form>
  );
}
