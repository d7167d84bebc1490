import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from '../../lib/api-client';

/**
 * Puts the server's per-field messages next to the matching inputs. Returns the message to show
 * above the form, or null when every problem landed on a field.
 * `known` lists the form's field paths; a message for any other path goes into the form-level note.
 */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, known?: readonly string[]): string | null {
  if (!isApiError(err)) return 'Something went wrong on our side. Try again in a moment.';
  const entries = Object.entries(err.fields);
  if (entries.length === 0) return err.message;

  const leftover: string[] = [];
  let first = true;
  for (const [path, message] of entries) {
    if (known && !known.includes(path)) {
      leftover.push(message);
      continue;
    }
    setError(path as Path<T>, { type: 'server', message }, { shouldFocus: first });
    first = false;
  }
  return leftover.length ? leftover.join(' ') : null;
}
