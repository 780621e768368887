import { AppError } from '../lib/errors';

/** The payment provider did not answer or refused: nothing was charged, the customer may try again. */
export function paymentsUnavailable(cause: unknown): AppError {
  return new AppError('unavailable', 502, 'The payment service did not answer. Nothing was charged; please try again in a minute.', undefined, { cause });
}
