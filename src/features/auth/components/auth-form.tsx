import type { FormEventHandler, ReactNode } from 'react';
import { Button } from '@/components/ui/button';
import { TextField, type TextFieldProps } from '@/components/ui/text-field';

type PresetFieldProps = Omit<TextFieldProps, 'label' | 'type' | 'autoComplete'> & { label?: ReactNode };

export function EmailField({ label = 'E-mail', ...rest }: PresetFieldProps) {
  return <TextField label={label} type="email" autoComplete="email" inputMode="email" {...rest} />;
}

export function PasswordField({
  label = 'Password',
  autoComplete,
  ...rest
}: PresetFieldProps & { autoComplete: 'current-password' | 'new-password' }) {
  return <TextField label={label} type="password" autoComplete={autoComplete} {...rest} />;
}

/** The frame every auth form shares: the problem above the fields, one full-width submit button below. */
export function AuthForm({
  onSubmit,
  problem,
  submitLabel,
  pending,
  children,
}: {
  onSubmit: FormEventHandler<HTMLFormElement>;
  problem: ReactNode;
  submitLabel: ReactNode;
  pending: boolean;
  children: ReactNode;
}) {
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {problem}
      {children}
      <Button type="submit" size="lg" className="w-full" loading={pending}>
        {submitLabel}
      </Button>
    </form>
  );
}
