import type { ReactNode } from 'react';
import { Navigate, redirect, useLocation, type LoaderFunction } from 'react-router';
import type { QueryClient } from '@tanstack/react-query';
import type { Portal } from '@/config/paths';
import { useSession, wasSignedOutByPerson, type Session } from '@/lib/auth';
import { guardPortal } from '@/lib/authorization';
import { authKeys } from '@/lib/query-keys';

function decide(user: Session | undefined, portal: Portal | 'any', location: { pathname: string; search: string }) {
  return guardPortal(user, portal, location, { offerReturn: !wasSignedOutByPerson() });
}

/**
 * The guard as a loader, so that no page loader starts a request the server would
 * refuse. Runs before each navigation inside the portal (see shouldRevalidate).
 */
export function portalLoader(queryClient: QueryClient, portal: Portal | 'any'): LoaderFunction {
  return ({ request }) => {
    const decision = decide(queryClient.getQueryData<Session>(authKeys.me), portal, new URL(request.url));
    if (decision) throw redirect(decision.redirectTo);
    return null;
  };
}

/** Wraps a page's loader so it does nothing when the guard is about to redirect. */
export function guardedLoader(queryClient: QueryClient, portal: Portal | 'any', loader: LoaderFunction): LoaderFunction {
  return (args) => {
    const decision = decide(queryClient.getQueryData<Session>(authKeys.me), portal, new URL(args.request.url));
    if (decision) throw redirect(decision.redirectTo);
    return loader(args);
  };
}

/** The same guard while on the page: reacts when the session ends (sign-out, expiry). */
export function PortalGuard({ portal, children }: { portal: Portal | 'any'; children: ReactNode }) {
  const { user } = useSession();
  const location = useLocation();
  const decision = decide(user, portal, location);
  if (decision) return <Navigate to={decision.redirectTo} replace />;
  return <>{children}</>;
}
