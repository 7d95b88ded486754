import { z } from 'zod';
import { roles, type AppRule, type Role } from '../permissions/ability';

export const emailSchema = z.string().trim().toLowerCase().pipe(z.email('Enter a valid e-mail address.')).pipe(z.string().max(254));

export const signInBodySchema = z.strictObject({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(1024, 'That password is too long.'),
});
export type SignInBody = z.infer<typeof signInBodySchema>;

export const MIN_PASSWORD_LENGTH = 15;
export const MAX_PASSWORD_LENGTH = 128;

/** Length only, no composition rules (NIST SP 800-63B-4 §3.1.1.2); the block-list is checked on the server. */
export const newPasswordSchema = z
  .string()
  .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words make a good one.`)
  .refine((p) => [...p].length <= MAX_PASSWORD_LENGTH, `Use at most ${MAX_PASSWORD_LENGTH} characters.`);

export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });
export const passwordResetConfirmSchema = z.strictObject({
  token: z.string().min(10).max(200),
  password: newPasswordSchema,
});

export const roleSchema = z.enum(roles);

export interface MeResponse {
  user: { id: string; email: string; name: string; role: Role; organisationId: string };
  /** timeZone: the organisation's IANA time zone; its business days (today, date pickers' max) are counted in it. */
  organisation: { id: string; name: string; kind: 'manufacturer' | 'agency'; timeZone: string };
  rules: AppRule[];
}
