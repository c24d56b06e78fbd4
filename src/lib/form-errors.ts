import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';

/**
 * Put an API error's field details onto the form's fields; returns the message to show above the form
 * (null when every detail landed on a field).
 */
export function applyApiError<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  options: { fields: readonly Path<T>[]; codeToField?: Record<string, Path<T>> },
): string | null {
  if (!isApiError(error)) return 'Something went wrong. Please try again.';
  const fieldForCode = options.codeToField?.[error.code];
  if (fieldForCode) {
    setError(fieldForCode, { type: 'server', message: error.message }, { shouldFocus: true });
    return null;
  }
  const known = new Set<string>(options.fields);
  const leftOver: string[] = [];
  let focused = false;
  for (const detail of error.details) {
    if (known.has(detail.path)) {
      setError(detail.path as Path<T>, { type: 'server', message: detail.message }, { shouldFocus: !focused });
      focused = true;
    } else {
      leftOver.push(detail.path ? `${detail.path}: ${detail.message}` : detail.message);
    }
  }
  if (error.details.length > 0 && leftOver.length === 0) return null;
  if (error.status === 429 && error.retryAfterSeconds !== undefined) {
    return `${error.message} Try again in ${formatWait(error.retryAfterSeconds)}.`;
  }
  return [error.message, ...leftOver].join(' ');
}

function formatWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

export function errorMessage(error: unknown): string {
  if (isApiError(error)) return error.errorId ? `${error.message} (error id ${error.errorId})` : error.message;
  return 'Something went wrong. Please try again.';
}
