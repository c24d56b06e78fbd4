import type { ButtonHTMLAttributes, Ref } from 'react';
import { cn } from '@/lib/cn';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'ghost' | 'danger';
export type ButtonSize = 'sm' | 'md' | 'lg';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-amber-400 text-night-950 hover:bg-amber-300 active:bg-amber-500 shadow-sm shadow-amber-500/20',
  secondary: 'border border-foil-500/70 text-foil-100 hover:border-foil-300 hover:bg-night-800 active:bg-night-700',
  ghost: 'text-foil-200 hover:bg-night-800 hover:text-foil-50',
  danger: 'border border-red-400/70 text-red-200 hover:bg-red-950/60 hover:border-red-300',
};

const sizes: Record<ButtonSize, string> = {
  sm: 'min-h-8 px-3 text-sm gap-1.5',
  md: 'min-h-10 px-4 text-sm gap-2',
  lg: 'min-h-12 px-6 text-base gap-2',
};

export function buttonClasses({
  variant = 'primary',
  size = 'md',
  className,
}: { variant?: ButtonVariant; size?: ButtonSize; className?: string } = {}): string {
  return cn(
    'inline-flex items-center justify-center rounded-lg font-semibold transition-colors select-none',
    'disabled:cursor-not-allowed disabled:opacity-60',
    variants[variant],
    sizes[size],
    className,
  );
}

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  loading?: boolean;
  ref?: Ref<HTMLButtonElement>;
};

export function Button({ variant, size, loading = false, className, children, disabled, type, ...rest }: ButtonProps) {
  return (
    <button
      type={type ?? 'button'}
      className={buttonClasses({ variant, size, className })}
      disabled={disabled || loading}
      aria-busy={loading || undefined}
      {...rest}
    >
      {loading && <Spinner size="sm" label={null} />}
      {children}
    </button>
  );
}
