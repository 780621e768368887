import type { Permission } from '@shared/permissions';

// Every link in the client comes from here. `path` is the route pattern the router
// uses; `getHref` builds a concrete link; `permission` (if any) is what a person needs
// to open the page, which both the navigation and the portal guards read.

interface PathEntry<Args extends unknown[] = []> {
  path: string;
  getHref: (...args: Args) => string;
  permission?: Permission;
}

function fixed(path: string, permission?: Permission): PathEntry {
  return { path, getHref: () => path, permission };
}

function withToken(path: string): PathEntry<[token?: string]> {
  return { path, getHref: (token?: string) => (token ? `${path}?token=${encodeURIComponent(token)}` : path) };
}

export const paths = {
  home: fixed('/'),
  profile: fixed('/profile', 'profile.read'),

  auth: {
    signIn: {
      path: '/sign-in',
      getHref: (next?: string) => (next ? `/sign-in?next=${encodeURIComponent(next)}` : '/sign-in'),
    } satisfies PathEntry<[next?: string]>,
    forgotPassword: fixed('/forgot-password'),
    resetPassword: withToken('/reset-password'),
    acceptInvitation: withToken('/accept-invitation'),
  },

  partner: {
    root: fixed('/partner'),
    cases: fixed('/partner/cases', 'referrals.read'),
    case: {
      path: '/partner/cases/:caseId',
      getHref: (caseId: string) => `/partner/cases/${encodeURIComponent(caseId)}`,
      permission: 'referrals.read',
    } satisfies PathEntry<[caseId: string]>,
    newReferral: fixed('/partner/referrals/new', 'referrals.create'),
    earnings: fixed('/partner/earnings', 'payouts.manage'),
    staff: fixed('/partner/settings/staff', 'staff.read'),
    apiKeys: fixed('/partner/settings/api-keys', 'api-keys.manage'),
    apiGuide: fixed('/partner/settings/api', 'api-keys.manage'),
    webhooks: fixed('/partner/settings/webhooks', 'webhooks.manage'),
  },

  lab: {
    root: fixed('/lab'),
    offers: fixed('/lab/offers', 'offers.respond'),
    offer: {
      path: '/lab/offers/:offerId',
      getHref: (offerId: string) => `/lab/offers/${encodeURIComponent(offerId)}`,
      permission: 'offers.respond',
    } satisfies PathEntry<[offerId: string]>,
    inbound: fixed('/lab/inbound', 'inbound.read'),
    checkIn: {
      path: '/lab/check-in',
      getHref: (code?: string) => (code ? `/lab/check-in?code=${encodeURIComponent(code)}` : '/lab/check-in'),
      permission: 'inbound.check-in',
    } satisfies PathEntry<[code?: string]>,
    outbound: fixed('/lab/outbound', 'outbound.ship'),
    case: {
      path: '/lab/cases/:caseId',
      getHref: (caseId: string) => `/lab/cases/${encodeURIComponent(caseId)}`,
      permission: 'bench.work',
    } satisfies PathEntry<[caseId: string]>,
    bench: fixed('/lab/bench', 'bench.work'),
    labProfile: fixed('/lab/profile', 'lab-profile.manage'),
    earnings: fixed('/lab/earnings', 'lab-payouts.manage'),
    staff: fixed('/lab/staff', 'staff.read'),
  },

  admin: {
    overview: fixed('/admin', 'network.manage'),
    attention: fixed('/admin/attention', 'network.manage'),
    labs: fixed('/admin/labs', 'network.organizations.read'),
    partners: fixed('/admin/partners', 'network.organizations.read'),
    settlement: fixed('/admin/settlement', 'settlement.run'),
    audit: fixed('/admin/audit', 'audit.read'),
  },

  customer: {
    case: {
      path: '/c/:token',
      getHref: (token: string) => `/c/${encodeURIComponent(token)}`,
    } satisfies PathEntry<[token: string]>,
    /** Where the payment provider's page sends the customer back; the token waits in the tab meanwhile. */
    checkoutReturn: {
      path: '/c/checkout/:outcome',
      getHref: (outcome: 'done' | 'cancelled') => `/c/checkout/${outcome}`,
    } satisfies PathEntry<[outcome: 'done' | 'cancelled']>,
  },
} as const;

export type Portal = 'partner' | 'lab' | 'admin';

/** Route patterns per portal, for the guards. The root entries only redirect onwards. */
export const portalPaths: Record<Portal, readonly { path: string; permission?: Permission }[]> = {
  partner: Object.values(paths.partner),
  lab: Object.values(paths.lab),
  admin: Object.values(paths.admin),
};

export const portalPrefixes: Record<Portal, string> = {
  partner: '/partner',
  lab: '/lab',
  admin: '/admin',
};
