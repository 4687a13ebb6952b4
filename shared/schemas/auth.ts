import { z } from 'zod';
import { PASSWORD_MAX_BYTES, PASSWORD_MIN_LENGTH } from '../vocabulary';

export { PASSWORD_MAX_BYTES, PASSWORD_MIN_LENGTH } from '../vocabulary';

function utf8Length(value: string): number {
  let bytes = 0;
  for (const ch of value) {
    const code = ch.codePointAt(0) ?? 0;
    bytes += code < 0x80 ? 1 : code < 0x800 ? 2 : code < 0x10000 ? 3 : 4;
  }
  return bytes;
}

export const emailSchema = z
  .string({ error: 'Enter your e-mail address.' })
  .trim()
  .toLowerCase()
  .min(1, 'Enter your e-mail address.')
  .max(254, 'That e-mail address is too long.')
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }));

export const signInSchema = z.strictObject({
  email: emailSchema,
  password: z.string({ error: 'Enter your password.' }).min(1, 'Enter your password.').max(1024, 'That password is too long.'),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const newPasswordSchema = z
  .string({ error: 'Choose a password.' })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .refine((value) => utf8Length(value) <= PASSWORD_MAX_BYTES, {
    message: `Use at most ${PASSWORD_MAX_BYTES} bytes (about ${PASSWORD_MAX_BYTES} plain letters).`,
  });

export const changePasswordSchema = z.strictObject({
  currentPassword: z.string({ error: 'Enter your current password.' }).min(1, 'Enter your current password.'),
  newPassword: newPasswordSchema,
});
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const preferencesSchema = z.strictObject({
  tempUnit: z.enum(['C', 'F']).optional(),
  clock: z.enum(['24h', '12h']).optional(),
  theme: z.enum(['system', 'light', 'dark']).optional(),
});
export type PreferencesInput = z.infer<typeof preferencesSchema>;

/** Accepting an invitation or resetting a password with an e-mailed link. */
export const linkPasswordSchema = z.strictObject({
  token: z.string().min(20, 'This link is not complete.').max(200, 'This link is not valid.'),
  password: newPasswordSchema,
});
export type LinkPasswordInput = z.infer<typeof linkPasswordSchema>;

export const requestResetSchema = z.strictObject({ email: emailSchema });
export type RequestResetInput = z.infer<typeof requestResetSchema>;

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: 'nurse' | 'charge' | 'educator' | 'admin';
  unitIds: string[];
  /** The same units with their names, for pickers. */
  units: { id: string; name: string; timeZone: string }[];
  tempUnit: 'C' | 'F';
  clock: '24h' | '12h';
  theme: 'system' | 'light' | 'dark';
}
