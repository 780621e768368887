import type { QueryClient } from '@tanstack/react-query';
import { PortalShell, type NavEntry } from '@/components/layouts/portal-shell';
import { paths } from '@/config/paths';
import { PortalGuard, portalLoader } from '../guard';

export const partnerNav: NavEntry[] = [
  { label: 'Cases', href: paths.partner.cases.getHref(), permission: paths.partner.cases.permission },
  { label: 'New referral', href: paths.partner.newReferral.getHref(), permission: paths.partner.newReferral.permission },
  { label: 'Earnings', href: paths.partner.earnings.getHref(), permission: paths.partner.earnings.permission },
  {
    label: 'Settings',
    items: [
      { label: 'Staff', href: paths.partner.staff.getHref(), permission: paths.partner.staff.permission },
      { label: 'API keys', href: paths.partner.apiKeys.getHref(), permission: paths.partner.apiKeys.permission },
      { label: 'API guide', href: paths.partner.apiGuide.getHref(), permission: paths.partner.apiGuide.permission },
      { label: 'Webhooks', href: paths.partner.webhooks.getHref(), permission: paths.partner.webhooks.permission },
    ],
  },
];

export function PartnerShell() {
  return <PortalShell portalName="Repair shop" navLabel="Shop" nav={partnerNav} />;
}

export const clientLoader = (queryClient: QueryClient) => portalLoader(queryClient, 'partner');
export const shouldRevalidate = () => true;

export default function PartnerLayout() {
  return (
    <PortalGuard portal="partner">
      <PartnerShell />
    </PortalGuard>
  );
}
