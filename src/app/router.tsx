import { useMemo, type ComponentType } from 'react';
import { createBrowserRouter, RouterProvider, type LoaderFunction, type RouteObject, type ShouldRevalidateFunction } from 'react-router';
import { useQueryClient, type QueryClient } from '@tanstack/react-query';
import { PageSpinner } from '@/components/ui/spinner';
import { paths, type Portal } from '@/config/paths';
// Error and not-found pages are bundled with the router, not lazy: they must show even
// when loading a page's code is what failed.
import RouteErrorPage, { PortalPageError } from './routes/error';
import NotFoundPage, { NotFoundInPortal } from './routes/not-found';
import { guardedLoader } from './routes/guard';
import RootLayout from './routes/root';

/** What a route module may export; the router turns it into a lazy route. */
interface RouteModule {
  default: ComponentType;
  /** Given the query client, returns the loader that fills the cache for the page. */
  clientLoader?: (queryClient: QueryClient) => LoaderFunction;
  shouldRevalidate?: ShouldRevalidateFunction;
}

function convert(queryClient: QueryClient, portal?: Portal | 'any') {
  return ({ default: Component, clientLoader, shouldRevalidate }: RouteModule) => {
    const loader = clientLoader?.(queryClient);
    return {
      Component,
      shouldRevalidate,
      loader: loader && portal ? guardedLoader(queryClient, portal, loader) : loader,
    };
  };
}

/** Pages of a portal sit under a pathless route, so a failing page keeps the portal's frame. */
function portalPages(children: RouteObject[]): RouteObject[] {
  return [{ ErrorBoundary: PortalPageError, children }];
}

/** The portal paths are absolute in `paths`; child routes need them relative to the portal. */
function under(prefix: string, path: string): string {
  return path === prefix ? '' : path.slice(prefix.length + 1);
}

export function createAppRouter(queryClient: QueryClient) {
  const page = (portal: Portal | 'any' | undefined, load: () => Promise<RouteModule>) => () => load().then(convert(queryClient, portal));

  const partner = (path: string) => under(paths.partner.root.path, path);
  const lab = (path: string) => under(paths.lab.root.path, path);
  const admin = (path: string) => under(paths.admin.overview.path, path);

  return createBrowserRouter([
    {
      Component: RootLayout,
      ErrorBoundary: RouteErrorPage,
      HydrateFallback: PageSpinner,
      children: [
        { index: true, lazy: page(undefined, () => import('./routes/landing')) },

        {
          lazy: page(undefined, () => import('./routes/auth/layout')),
          children: [
            { path: paths.auth.signIn.path, lazy: page(undefined, () => import('./routes/auth/sign-in')) },
            { path: paths.auth.forgotPassword.path, lazy: page(undefined, () => import('./routes/auth/forgot-password')) },
            { path: paths.auth.resetPassword.path, lazy: page(undefined, () => import('./routes/auth/reset-password')) },
            { path: paths.auth.acceptInvitation.path, lazy: page(undefined, () => import('./routes/auth/accept-invitation')) },
          ],
        },

        {
          path: paths.partner.root.path,
          lazy: page(undefined, () => import('./routes/partner/layout')),
          children: portalPages([
            { index: true, lazy: page(undefined, () => import('./routes/portal-home')) },
            { path: partner(paths.partner.cases.path), lazy: page('partner', () => import('./routes/partner/cases')) },
            { path: partner(paths.partner.case.path), lazy: page('partner', () => import('./routes/partner/case')) },
            { path: partner(paths.partner.newReferral.path), lazy: page('partner', () => import('./routes/partner/new-referral')) },
            { path: partner(paths.partner.earnings.path), lazy: page('partner', () => import('./routes/partner/earnings')) },
            { path: partner(paths.partner.staff.path), lazy: page('partner', () => import('./routes/partner/staff')) },
            { path: partner(paths.partner.apiKeys.path), lazy: page('partner', () => import('./routes/partner/api-keys')) },
            { path: partner(paths.partner.apiGuide.path), lazy: page('partner', () => import('./routes/partner/api-guide')) },
            { path: partner(paths.partner.webhooks.path), lazy: page('partner', () => import('./routes/partner/webhooks')) },
            { path: '*', Component: NotFoundInPortal },
          ]),
        },

        {
          path: paths.lab.root.path,
          lazy: page(undefined, () => import('./routes/lab/layout')),
          children: portalPages([
            { index: true, lazy: page(undefined, () => import('./routes/portal-home')) },
            { path: lab(paths.lab.offers.path), lazy: page('lab', () => import('./routes/lab/offers')) },
            { path: lab(paths.lab.offer.path), lazy: page('lab', () => import('./routes/lab/offer')) },
            { path: lab(paths.lab.inbound.path), lazy: page('lab', () => import('./routes/lab/inbound')) },
            { path: lab(paths.lab.checkIn.path), lazy: page('lab', () => import('./routes/lab/check-in')) },
            { path: lab(paths.lab.outbound.path), lazy: page('lab', () => import('./routes/lab/outbound')) },
            { path: lab(paths.lab.bench.path), lazy: page('lab', () => import('./routes/lab/bench')) },
            { path: lab(paths.lab.case.path), lazy: page('lab', () => import('./routes/lab/case')) },
            { path: lab(paths.lab.labProfile.path), lazy: page('lab', () => import('./routes/lab/lab-profile')) },
            { path: lab(paths.lab.staff.path), lazy: page('lab', () => import('./routes/lab/staff')) },
            { path: lab(paths.lab.earnings.path), lazy: page('lab', () => import('./routes/lab/earnings')) },
            { path: '*', Component: NotFoundInPortal },
          ]),
        },

        {
          path: paths.admin.overview.path,
          lazy: page(undefined, () => import('./routes/admin/layout')),
          children: portalPages([
            { index: true, lazy: page('admin', () => import('./routes/admin/overview')) },
            { path: admin(paths.admin.attention.path), lazy: page('admin', () => import('./routes/admin/attention')) },
            { path: admin(paths.admin.labs.path), lazy: page('admin', () => import('./routes/admin/labs')) },
            { path: admin(paths.admin.partners.path), lazy: page('admin', () => import('./routes/admin/partners')) },
            { path: admin(paths.admin.settlement.path), lazy: page('admin', () => import('./routes/admin/settlement')) },
            { path: admin(paths.admin.audit.path), lazy: page('admin', () => import('./routes/admin/audit')) },
            { path: '*', Component: NotFoundInPortal },
          ]),
        },

        {
          lazy: page(undefined, () => import('./routes/role-layout')),
          children: portalPages([{ path: paths.profile.path, lazy: page('any', () => import('./routes/profile')) }]),
        },

        { path: paths.customer.checkoutReturn.path, lazy: page(undefined, () => import('./routes/public/checkout-return')) },
        { path: paths.customer.case.path, lazy: page(undefined, () => import('./routes/public/customer-case')) },

        { path: '*', Component: NotFoundPage },
      ],
    },
  ]);
}

/** Created once the session is known, so the first navigation's guards see it. */
export function AppRouter() {
  const queryClient = useQueryClient();
  const router = useMemo(() => createAppRouter(queryClient), [queryClient]);
  return <RouterProvider router={router} />;
}
