import type { FieldValues, Path, UseFormReturn } from 'react-hook-form';
import { isApiError } from '@/lib/api-client';
import { isUnexpectedError, reportUnexpectedError } from '@/lib/errors';

/** The key under which a form-level message (not tied to one field) is kept. */
export const ROOT_ERROR = 'root.server' as const;

function hasPath(values: unknown, path: string): boolean {
  let current: unknown = values;
  for (const part of path.split('.')) {
    if (current === null || typeof current !== 'object' || !(part in current)) return false;
    current = (current as Record<string, unknown>)[part];
  }
  return true;
}

/**
 * Puts a failed submission where the person will see it: the server's `error.fields` on
 * the matching inputs, anything else from a 4xx as one form-level message, and
 * unexpected failures (network, 5xx, bugs) in a toast.
 */
export function applyServerErrors<T extends FieldValues>(error: unknown, form: UseFormReturn<T, any, any>): void {
  if (isUnexpectedError(error) || !isApiError(error)) {
    reportUnexpectedError(error);
    return;
  }

  const values = form.getValues();
  const unmatched: string[] = [];
  let focused = false;
  for (const field of error.fields) {
    if (field.path !== '(body)' && hasPath(values, field.path)) {
      form.setError(field.path as Path<T>, { type: 'server', message: field.message }, { shouldFocus: !focused });
      focused = true;
    } else {
      unmatched.push(field.message);
    }
  }

  // Fields the form does not show (a token from the link, say) still need to be heard.
  if (!focused || unmatched.length > 0) {
    const message = unmatched.length > 0 && focused ? unmatched.join(' ') : error.message;
    form.setError(ROOT_ERROR, { type: 'server', message });
  }
}
