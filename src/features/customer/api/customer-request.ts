import { CUSTOMER_LINK_SCHEME } from '@shared/schemas/customer';
import type { RequestOptions } from '@/lib/api-client';

/**
 * The customer has no session: every request carries the link's token in the Authorization header
 * (never in the request's address, so it stays out of logs) and no staff sign-in.
 */
export function asCustomer<T>(token: string, options: RequestOptions<T> = {}): RequestOptions<T> {
  return { ...options, auth: false, headers: { ...options.headers, Authorization: `${CUSTOMER_LINK_SCHEME} ${token}` } };
}

/** Where the token waits while the customer is on the payment page (this browser tab only). */
export const PAYING_TOKEN_KEY = 'platterpost.paying-case';
