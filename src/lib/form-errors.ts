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
    const field = fieldOf(detail.path);
    if (known.has(field)) {
      setError(field as Path<T>, { type: 'server', message: detail.message }, { shouldFocus: !focused });
      focused = true;
    } else {
      leftOver.push(detailInWords(detail));
    }
  }
  if (error.details.length > 0 && leftOver.length === 0) return null;
  if ((error.status === 429 || error.status === 503) && error.retryAfterSeconds !== undefined) {
    return `${error.message} Try again in ${formatWait(error.retryAfterSeconds)}.`;
  }
  return [error.message, ...leftOver].join(' ');
}

/** An API error's field details by field name, for forms that keep their own state (no react-hook-form). */
export function fieldErrors(error: unknown): Record<string, string> {
  if (!isApiError(error)) return {};
  return Object.fromEntries(error.details.map((d) => [fieldOf(d.path), d.message]));
}

/** A detail's path without the request part it came from: "body.title" → "title". */
export function fieldOf(path: string): string {
  return path.replace(/^(body|query|params|file)(\.|$)/, '');
}

/** "body.stretchTargets.0.title" → "Stretch targets 1, title": a field name a reader can follow. */
export function fieldInWords(path: string): string {
  const words = fieldOf(path)
    .split('.')
    .filter(Boolean)
    .map((part) => (/^\d+$/.test(part) ? String(Number(part) + 1) : part.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase()));
  const text = words.join(', ');
  return text ? text[0]!.toUpperCase() + text.slice(1) : '';
}

function detailInWords(detail: { path: string; message: string }): string {
  const where = fieldInWords(detail.path);
  return where ? `${where}: ${detail.message}.` : `${detail.message}.`;
}

function formatWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

export function errorMessage(error: unknown): string {
  if (!isApiError(error)) return 'Something went wrong. Please try again.';
  // A validation answer's message lists raw paths; say each problem with its field in words instead.
  const message = error.code === 'validation_failed' && error.details.length ? error.details.map(detailInWords).join(' ') : error.message;
  return error.errorId ? `${message} (error id ${error.errorId})` : message;
}
