import type { QueryClient } from '@tanstack/react-query';
import { PortalShell, type NavEntry } from '@/components/layouts/portal-shell';
import { paths } from '@/config/paths';
import { PortalGuard, portalLoader } from '../guard';

export const labNav: NavEntry[] = [
  { label: 'Offers', href: paths.lab.offers.getHref(), permission: paths.lab.offers.permission },
  { label: 'Inbound boxes', href: paths.lab.inbound.getHref(), permission: paths.lab.inbound.permission },
  { label: 'Check-in', href: paths.lab.checkIn.getHref(), permission: paths.lab.checkIn.permission },
  { label: 'Outbound', href: paths.lab.outbound.getHref(), permission: paths.lab.outbound.permission },
  { label: 'Bench queue', href: paths.lab.bench.getHref(), permission: paths.lab.bench.permission },
  { label: 'Lab profile', href: paths.lab.labProfile.getHref(), permission: paths.lab.labProfile.permission },
  { label: 'Staff', href: paths.lab.staff.getHref(), permission: paths.lab.staff.permission },
  { label: 'Earnings', href: paths.lab.earnings.getHref(), permission: paths.lab.earnings.permission },
];

export function LabShell() {
  return <PortalShell portalName="Recovery lab" navLabel="Lab" nav={labNav} />;
}

export const clientLoader = (queryClient: QueryClient) => portalLoader(queryClient, 'lab');
export const shouldRevalidate = () => true;

export default function LabLayout() {
  return (
    <PortalGuard portal="lab">
      <LabShell />
    </PortalGuard>
  );
}
