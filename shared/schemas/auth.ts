import { z } from 'zod';
import { safeText } from './text';

import { roles } from '../roles';

export { roles };
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

const email = safeText()
  .max(254)
  .pipe(z.email({ message: 'Enter a valid e-mail address' }))
  .transform((v) => v.trim());
// Passwords are hashed, never stored, but must still be text a keyboard can type again.
const password = safeText({ multiline: true })
  .min(10, { message: 'Use at least 10 characters' })
  .max(200, { message: 'Use at most 200 characters' });

export const signUpSchema = z.object({
  email,
  password,
  displayName: safeText().trim().min(1, { message: 'Tell us what to call you' }).max(80),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const signInSchema = z.object({
  email,
  password: safeText({ multiline: true }).min(1, { message: 'Enter your password' }).max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const requestPasswordResetSchema = z.object({ email });
export const resetPasswordSchema = z.object({ token: safeText().min(16).max(200), password });
export const verifyEmailSchema = z.object({ token: safeText().min(16).max(200) });

/** The people list's search box (a query string). */
export const accountSearchQuerySchema = z.object({ q: safeText().trim().max(200).optional() });

export const grantRoleSchema = z.object({ role: roleSchema });

export const accountViewSchema = z.object({
  id: z.string(),
  email: z.string(),
  displayName: z.string(),
  roles: z.array(roleSchema),
  emailVerified: z.boolean(),
  createdAt: z.string(),
});
export type AccountView = z.infer<typeof accountViewSchema>;

/** The JSON body of every API error. */
export type ApiErrorBody = {
  error: { code: string; message: string; details?: { path: string; message: string }[]; errorId?: string };
};

export const updateAccountSchema = z.object({
  displayName: safeText().trim().min(1, { message: 'Tell us what to call you' }).max(80),
});
export type UpdateAccountInput = z.infer<typeof updateAccountSchema>;
