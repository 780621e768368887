import { toast } from '@/components/ui/toast';
import { isApiError } from './api-client';

// Only failures a person cannot fix by editing the form become toasts: network errors,
// 5xx answers and anything that is not an ApiError (a bug, an unreadable response).
// Several layers may see the same error (the mutation cache and the Form wrapper),
// so each error is reported once.
const reported = new WeakSet<object>();

export function isUnexpectedError(error: unknown): boolean {
  return !isApiError(error) || error.isUnexpected;
}

export function reportUnexpectedError(error: unknown): void {
  if (!isUnexpectedError(error)) return;
  if (typeof error === 'object' && error !== null) {
    if (reported.has(error)) return;
    reported.add(error);
  }
  if (isApiError(error)) {
    toast.error(error.isNetworkError ? 'No connection' : 'Something went wrong', error.message);
  } else {
    toast.error('Something went wrong', 'Please try again. If it keeps happening, tell the network team.');
  }
}
