import commonPasswords from 'fxa-common-password-list';
import { badRequest } from '../errors';

/** Lower case without accents, so "Tomás" and "tomas" are the same name. */
function fold(value: string): string {
  return value.normalize('NFKD').replace(/\p{M}/gu, '').toLowerCase();
}

/**
 * The pieces of a person's name and e-mail a password must not contain: the whole name without
 * spaces, each word of the name, the e-mail's local part and each of its words. Words under three
 * letters are left out (they turn up inside ordinary words).
 */
export function personalWords(personal: string[]): string[] {
  const words = new Set<string>();
  for (const value of personal) {
    const local = fold(value).split('@')[0] ?? '';
    const parts = local.split(/[^\p{L}\p{N}]+/u).filter(Boolean);
    for (const w of [parts.join(''), ...parts]) if (w.length >= 3) words.add(w);
  }
  return [...words];
}

/**
 * ASVS 2.1.7: refuse passwords found in a list of breached or common passwords (Mozilla's
 * list, from the registry), passwords of spaces (or other blanks) only, and passwords that
 * contain the person's name or e-mail.
 */
export function assertPasswordAllowed(password: string, field: string, personal: string[] = []): void {
  if (/^[\s\u200b-\u200d\u2060\ufeff]*$/u.test(password)) {
    throw badRequest('A password of spaces only is not allowed.', { [field]: 'Use letters, numbers or symbols, not only spaces.' });
  }
  const lower = password.toLowerCase();
  if (commonPasswords.test(password) || commonPasswords.test(lower)) {
    throw badRequest('That password is on a list of common passwords.', { [field]: 'This password is too common. Choose another.' });
  }
  const folded = fold(password).replace(/[^\p{L}\p{N}]+/gu, '');
  if (personalWords(personal).some((word) => folded.includes(word))) {
    throw badRequest('The password contains your name or e-mail.', { [field]: 'Do not use your name or e-mail in the password.' });
  }
}
