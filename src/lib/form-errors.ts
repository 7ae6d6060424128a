import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client.ts';

/**
 * Puts a 400 `validation` answer's field messages onto the form fields it knows, and returns the
 * message to show above the form (null when every problem landed on a field).
 */
export function applyServerErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: readonly Path<T>[]): string | null {
  if (!isApiError(error)) return 'Something went wrong. Try again.';
  const entries = Object.entries(error.fields);
  let unplaced = 0;
  for (const [path, message] of entries) {
    const match = fields.find((f) => f === path);
    if (match) setError(match, { type: 'server', message });
    else unplaced += 1;
  }
  if (error.code === 'validation' && entries.length > 0 && unplaced === 0) return null;
  return error.message;
}
