import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { signUpSchema, type AccountView } from '@shared/schemas/auth';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { TextField } from '@/components/ui/text-field';
import { applyApiError } from '@/lib/form-errors';
import { useSignUp } from '../api/sign-up';

type Values = z.input<typeof signUpSchema>;

export function SignUpForm({ onSignedUp }: { onSignedUp: (account: AccountView) => void }) {
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<Values, unknown, z.output<typeof signUpSchema>>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { displayName: '', email: '', password: '' },
  });
  const signUp = useSignUp({ onSuccess: onSignedUp });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setFormError(null);
    try {
      await signUp.mutateAsync(values);
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
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError && <Alert title="Could not create the account">{formError}</Alert>}
      <TextField
        label="Display name"
        autoComplete="nickname"
        hint="How we address you on Lightkeel and in our mail."
        error={errors.displayName?.message}
        {...form.register('displayName')}
      />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="email"
        inputMode="email"
        error={errors.email?.message}
        {...form.register('email')}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint="At least 10 characters. A short sentence works well."
        error={errors.password?.message}
        {...form.register('password')}
      />
      <Button type="submit" size="lg" className="w-full" loading={signUp.isPending}>
        Create account
      </Button>
    </form>
  );
}
