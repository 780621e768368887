import type { QueryClient } from '@tanstack/react-query';
import { PortalShell, type NavEntry } from '@/components/layouts/portal-shell';
import { paths } from '@/config/paths';
import { PortalGuard, portalLoader } from '../guard';

export const adminNav: NavEntry[] = [
  { label: 'Overview', href: paths.admin.overview.getHref(), permission: paths.admin.overview.permission },
  { label: 'Needs attention', href: paths.admin.attention.getHref(), permission: paths.admin.attention.permission },
  { label: 'Labs', href: paths.admin.labs.getHref(), permission: paths.admin.labs.permission },
  { label: 'Partners', href: paths.admin.partners.getHref(), permission: paths.admin.partners.permission },
  { label: 'Settlement', href: paths.admin.settlement.getHref(), permission: paths.admin.settlement.permission },
  { label: 'Audit', href: paths.admin.audit.getHref(), permission: paths.admin.audit.permission },
];

export function AdminShell() {
  return <PortalShell portalName="Network administration" navLabel="Network" nav={adminNav} />;
}

export const clientLoader = (queryClient: QueryClient) => portalLoader(queryClient, 'admin');
export const shouldRevalidate = () => true;

export default function AdminLayout() {
  return (
    <PortalGuard portal="admin">
      <AdminShell />
    </PortalGuard>
  );
}
