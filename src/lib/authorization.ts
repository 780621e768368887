import { matchPath } from 'react-router';
import { roleHome, type Permission } from '@shared/permissions';
import { roleOrganizationKind, type Role } from '@shared/vocabulary';
import type { MeResponse } from '@shared/schemas/auth';
import { paths, portalPaths, portalPrefixes, type Portal } from '@/config/paths';

// Pure decisions about who may open what. The server still decides; these only keep
// people away from pages that would answer 403 and send them somewhere useful instead.

export function can(user: Pick<MeResponse, 'permissions'> | null | undefined, permission: Permission): boolean {
  return !!user && user.permissions.includes(permission);
}

const portalByKind = { partner: 'partner', lab: 'lab', network: 'admin' } as const satisfies Record<string, Portal>;

export function portalForRole(role: Role): Portal {
  return portalByKind[roleOrganizationKind[role]];
}

const homeHref: Record<(typeof roleHome)[Role], string> = {
  'partner.cases': paths.partner.cases.getHref(),
  'lab.inbound': paths.lab.inbound.getHref(),
  'lab.offers': paths.lab.offers.getHref(),
  'lab.bench': paths.lab.bench.getHref(),
  'admin.overview': paths.admin.overview.getHref(),
};

export function homePathFor(role: Role): string {
  return homeHref[roleHome[role]];
}

function portalOfPath(pathname: string): Portal | null {
  for (const [portal, prefix] of Object.entries(portalPrefixes) as [Portal, string][]) {
    if (pathname === prefix || pathname.startsWith(`${prefix}/`)) return portal;
  }
  return null;
}

export type PathAccess = 'allowed' | 'forbidden' | 'unknown';

/**
 * Whether this signed-in person may open a path: another portal's pages are forbidden,
 * pages of their own portal need the page's permission, anything we have no page for
 * is unknown (the not-found page answers it).
 */
export function pathAccess(user: MeResponse, pathname: string): PathAccess {
  if (matchPath(paths.profile.path, pathname)) return can(user, 'profile.read') ? 'allowed' : 'forbidden';
  const portal = portalOfPath(pathname);
  if (!portal) return 'unknown';
  if (portal !== portalForRole(user.role)) return 'forbidden';
  const entry = portalPaths[portal].find((candidate) => matchPath({ path: candidate.path, end: true }, pathname));
  if (!entry) return 'unknown';
  return !entry.permission || can(user, entry.permission) ? 'allowed' : 'forbidden';
}

/**
 * Where to go after sign-in: `next` when it is a same-origin path this person may
 * open, otherwise their home. Guards against open redirects such as "//evil.example".
 */
export function landingPathFor(user: MeResponse, next: string | null | undefined, origin = window.location.origin): string {
  const home = homePathFor(user.role);
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return home;
  let url: URL;
  try {
    url = new URL(next, origin);
  } catch {
    return home;
  }
  if (url.origin !== origin) return home;
  if (pathAccess(user, url.pathname) !== 'allowed') return home;
  return `${url.pathname}${url.search}${url.hash}`;
}

export type GuardDecision = { redirectTo: string } | null;

/**
 * The portal guard: signed out → sign-in with `next` (unless the person signed out on
 * purpose); another portal, or a page the role may not open → the role's home.
 */
export function guardPortal(
  user: MeResponse | null | undefined,
  portal: Portal | 'any',
  location: { pathname: string; search: string },
  { offerReturn = true }: { offerReturn?: boolean } = {},
): GuardDecision {
  if (!user) return { redirectTo: paths.auth.signIn.getHref(offerReturn ? `${location.pathname}${location.search}` : undefined) };
  if (portal !== 'any' && portalForRole(user.role) !== portal) return { redirectTo: homePathFor(user.role) };
  if (pathAccess(user, location.pathname) === 'forbidden') return { redirectTo: homePathFor(user.role) };
  return null;
}
