import commonPasswords from 'fxa-common-password-list';
import { badRequest } from '../errors';

/**
 * ASVS 2.1.7: refuse passwords found in a list of breached or common passwords (Mozilla's
 * list, from the registry), and passwords that are just the person's own e-mail or name.
 */
export function assertPasswordAllowed(password: string, field: string, personal: string[] = []): void {
  const lower = password.toLowerCase();
  if (commonPasswords.test(password) || commonPasswords.test(lower)) {
    throw badRequest('That password is on a list of common passwords.', { [field]: 'This password is too common. Choose another.' });
  }
  for (const value of personal) {
    const part = value.toLowerCase().split('@')[0] ?? '';
    if (part.length >= 4 && lower.includes(part)) {
      throw badRequest('The password contains your name or e-mail.', { [field]: 'Do not use your name or e-mail in the password.' });
    }
  }
}
