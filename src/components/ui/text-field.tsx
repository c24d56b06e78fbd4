import { useId, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { cn } from '@/lib/cn';

export const inputClasses = cn(
  'block w-full rounded-lg border bg-night-950/60 px-3 py-2 text-foil-50 placeholder:text-foil-600',
  'border-foil-700 hover:border-foil-500 focus:border-amber-400',
  'aria-[invalid=true]:border-red-400',
  'disabled:opacity-60',
);

export type TextFieldProps = Omit<InputHTMLAttributes<HTMLInputElement>, 'size'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  ref?: Ref<HTMLInputElement>;
};

/** A labelled input with hint and error text wired through aria-describedby. */
export function TextField({ label, hint, error, id, className, ...rest }: TextFieldProps) {
  const generated = useId();
  const inputId = id ?? generated;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = error ? `${inputId}-error` : undefined;
  const describedBy = [rest['aria-describedby'], hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={cn('space-y-1.5', className)}>
      <label htmlFor={inputId} className="block text-sm font-semibold text-foil-100">
        {label}
      </label>
      <input id={inputId} className={inputClasses} {...rest} aria-invalid={error ? true : undefined} aria-describedby={describedBy} />
      {hint && (
        <p id={hintId} className="text-sm text-foil-400">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="text-sm font-semibold text-red-300">
          {error}
        </p>
      )}
    </div>
  );
}

export const Input = TextField;
