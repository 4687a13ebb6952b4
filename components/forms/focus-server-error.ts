import { useEffect } from 'react';
import type { FieldValues, Path, UseFormSetFocus } from 'react-hook-form';

/**
 * When the server refuses a save and names fields (a time its clock finds in the future, a value
 * the form could not check), focus the first of them in the form's order, as a refusal by the
 * form's own checks does: the nurse sees what to put right without hunting below the fold.
 * `order` pairs the server's field names with the form's, top of the form first.
 */
export function useFocusServerError<T extends FieldValues>(
  serverFields: Record<string, string> | undefined,
  setFocus: UseFormSetFocus<T>,
  order: readonly (readonly [server: string, field: Path<T>])[],
): void {
  const first = order.find(([server]) => serverFields?.[server]);
  // Keyed on the field and its message, so a new answer focuses again and a re-render does not.
  const key = first ? `${first[0]}: ${serverFields?.[first[0]] ?? ''}` : '';
  useEffect(() => {
    if (first) setFocus(first[1]);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key]);
}
