import { z } from 'zod';

// The one text primitive of every input schema. PostgreSQL refuses a NUL byte in `text` and a lone UTF-16
// surrogate in `jsonb` (SQLSTATE 22P05 / 22021 / 22P02); other control characters are invisible in every
// screen and export. They are refused here, at the edge, with a message that names the field.

// C0 controls and DEL; tab, line feed and carriage return are allowed only in multi-line text.
const CONTROL_LINE = /[\u0000-\u001f\u007f]/;
const CONTROL_MULTILINE = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
// A high surrogate not followed by a low one, or a low surrogate not preceded by a high one.
const LONE_SURROGATE = /[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

export const CONTROL_CHARACTER_MESSAGE = 'must not contain invisible control characters (such as a NUL byte)';
export const BROKEN_CHARACTER_MESSAGE = 'contains a broken character (half of a UTF-16 pair); retype the text';

/** Why a string cannot be stored as text, or null when it can. */
export function textProblem(value: string, options: { multiline?: boolean } = {}): string | null {
  if ((options.multiline ? CONTROL_MULTILINE : CONTROL_LINE).test(value)) return CONTROL_CHARACTER_MESSAGE;
  if (LONE_SURROGATE.test(value)) return BROKEN_CHARACTER_MESSAGE;
  return null;
}

/**
 * A string that can be stored and shown: no control characters (tab and line breaks only when
 * `multiline`), no lone surrogates. Chain `.trim()`, `.min()`, `.max()`, `.regex()` as on `z.string()`.
 */
export function safeText(options: { multiline?: boolean } = {}) {
  const control = options.multiline ? CONTROL_MULTILINE : CONTROL_LINE;
  return z
    .string()
    .refine((s) => !control.test(s), { message: CONTROL_CHARACTER_MESSAGE })
    .refine((s) => !LONE_SURROGATE.test(s), { message: BROKEN_CHARACTER_MESSAGE });
}
