import { useEffect, type ReactNode } from 'react';
import { useQuery, useQueryClient, type QueryClient } from '@tanstack/react-query';
import type { Permission } from '@shared/permissions';
import type { MeResponse } from '@shared/schemas/auth';
import { setAccessToken, setUnauthenticatedHandler } from './api-client';
import { can } from './authorization';
import { authKeys } from './query-keys';

// The session is the `authKeys.me` query: a MeResponse when signed in, null when not.
// Its query function (registered by the app with setQueryDefaults) restores a session
// from the refresh cookie on first load, so every reader sees one source of truth.

export type Session = MeResponse | null;

export function useSession(): { user: Session; isPending: boolean; error: Error | null; retry: () => void } {
  const query = useQuery<Session>({ queryKey: authKeys.me });
  return { user: query.data ?? null, isPending: query.isPending, error: query.error, retry: () => void query.refetch() };
}

/** The signed-in person. Only for screens behind a portal guard. */
export function useUser(): MeResponse {
  const { user } = useSession();
  if (!user) throw new Error('useUser() was called outside a signed-in area');
  return user;
}

/** can(permission) for the current person; false when signed out. */
export function useCan(): (permission: Permission) => boolean {
  const { user } = useSession();
  return (permission) => can(user, permission);
}

/** Renders its children only when the current person has the permission. */
export function Can({ permission, children, otherwise = null }: { permission: Permission; children: ReactNode; otherwise?: ReactNode }) {
  const allowed = useCan()(permission);
  return <>{allowed ? children : otherwise}</>;
}

/** Drops cached organisation data so the next person at a shared counter sees none of it. */
function forgetOrganisationData(queryClient: QueryClient): void {
  queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== authKeys.all[0] });
}

// Set when the person pressed "Sign out", so the guards send them to a plain sign-in
// page rather than one that offers to bring them back where they were.
let endedByPerson = false;

export function wasSignedOutByPerson(): boolean {
  return endedByPerson;
}

export function startSession(queryClient: QueryClient, accessToken: string, me: MeResponse): void {
  endedByPerson = false;
  forgetOrganisationData(queryClient);
  setAccessToken(accessToken);
  queryClient.setQueryData<Session>(authKeys.me, me);
}

export function endSession(queryClient: QueryClient, { byPerson = false }: { byPerson?: boolean } = {}): void {
  endedByPerson = byPerson;
  setAccessToken(null);
  forgetOrganisationData(queryClient);
  queryClient.setQueryData<Session>(authKeys.me, null);
}

/**
 * Waits for the session to be restored (or found absent) before rendering the app, and
 * turns "the refresh cookie was refused" into a signed-out session; the portal guards
 * then send the person to sign-in with a `next` back to where they were.
 */
export function AuthProvider({ children, loading, failed }: { children: ReactNode; loading: ReactNode; failed: (retry: () => void) => ReactNode }) {
  const queryClient = useQueryClient();
  const { isPending, error, user, retry } = useSession();

  useEffect(() => {
    setUnauthenticatedHandler(() => endSession(queryClient));
    return () => setUnauthenticatedHandler(() => {});
  }, [queryClient]);

  if (isPending) return <>{loading}</>;
  if (error && !user) return <>{failed(retry)}</>;
  return <>{children}</>;
}
