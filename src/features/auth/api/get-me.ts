import { queryOptions } from '@tanstack/react-query';
import { meResponseSchema, type MeResponse } from '@shared/schemas/auth';
import { api, getAccessToken, isApiError, refreshSession } from '@/lib/api-client';
import { authKeys } from '@/lib/query-keys';

export function getMe(signal?: AbortSignal): Promise<MeResponse> {
  return api.get('/auth/me', { schema: meResponseSchema, signal });
}

/**
 * The session query: after a page reload there is no access token in memory, so first
 * renew it from the refresh cookie. Null means signed out.
 */
export async function getSession(): Promise<MeResponse | null> {
  if (!getAccessToken()) {
    const restored = await refreshSession();
    if (!restored) return null;
  }
  try {
    return await getMe();
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

/** Registered as the defaults of `authKeys.me`, which the session hooks in lib/auth read. */
export const sessionQueryDefaults = {
  queryFn: getSession,
  // The session changes only through sign-in, sign-out and expiry, which all write it.
  staleTime: Infinity,
};

export function getMeQueryOptions() {
  return queryOptions({ queryKey: authKeys.me, ...sessionQueryDefaults });
}
