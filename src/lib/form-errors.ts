import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { errorMessage, isApiError } from './api-client';

/**
 * Puts a 400's field errors on the form's fields (focusing the first) and returns the
 * message for the form-level alert, or null when every problem sits on a field.
 */
export function applyServerErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fieldNames: readonly Path<T>[]): string | null {
  if (!isApiError(error) || !error.fields) return errorMessage(error);
  let placed = 0;
  let unplaced = false;
  for (const [key, message] of Object.entries(error.fields)) {
    const name = fieldNames.find((f) => f === key);
    if (name) {
      setError(name, { type: 'server', message }, { shouldFocus: placed === 0 });
      placed++;
    } else {
      unplaced = true;
    }
  }
  return placed > 0 && !unplaced ? null : error.message;
}
