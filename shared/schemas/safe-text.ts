import { z } from 'zod';

/**
 * Free text a person types (notes, names, reasons, labels) must be text that survives the trip
 * into the record and back out unchanged and unmisleading:
 * - a lone UTF-16 surrogate cannot be stored as UTF-8 (SQLite writes U+FFFD or invalid bytes, so
 *   the stored row no longer matches what was sent);
 * - the bidirectional overrides and isolates (U+202A–U+202E, U+2066–U+2069) reorder what a reader
 *   sees ("Trojan Source", CVE-2021-42574), so a note could show another value than it holds;
 * - NUL and the other C0 controls (and DEL) have no place in typed text; a multi-line field
 *   keeps tab and newline (and the carriage return of a CRLF), a one-line field refuses them too.
 * The check runs on what arrived, before any trimming, and names the field through zod's path.
 */

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const BIDI_CONTROL = /[\u202A-\u202E\u2066-\u2069]/;
// eslint-disable-next-line no-control-regex
const CONTROL_ONE_LINE = /[\u0000-\u001F\u007F]/;
// eslint-disable-next-line no-control-regex
const CONTROL_MULTI_LINE = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

export interface SafeTextOptions {
  /** Notes keep tab and line breaks; names and labels do not. */
  multiline?: boolean;
}

/** Why a piece of typed text is refused, or null when it is fine. */
export function unsafeTextReason(value: string, { multiline = false }: SafeTextOptions = {}): string | null {
  if (LONE_SURROGATE.test(value)) return 'Contains a broken character (a lone UTF-16 surrogate). Type it again.';
  if (BIDI_CONTROL.test(value)) return 'Contains a hidden text-direction control character. Remove it.';
  if ((multiline ? CONTROL_MULTI_LINE : CONTROL_ONE_LINE).test(value)) {
    return multiline ? 'Contains a hidden control character (only tab and line breaks are allowed).' : 'Contains a hidden control character or a line break.';
  }
  return null;
}

/**
 * A string schema for typed text: refuses what `unsafeTextReason` refuses, then trims. Chain the
 * length checks after it (`safeText().min(1, …).max(300, …)`).
 */
export function safeText(options: SafeTextOptions & { error?: string } = {}) {
  return z
    .string(options.error ? { error: options.error } : undefined)
    .superRefine((value, ctx) => {
      const reason = unsafeTextReason(value, options);
      if (reason) ctx.addIssue({ code: 'custom', message: reason, abort: true });
    })
    .trim();
}

/** A multi-line note: tab and line breaks allowed. */
export const safeNote = (error?: string) => safeText({ multiline: true, error });
