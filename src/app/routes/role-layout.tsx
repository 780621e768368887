import type { QueryClient } from '@tanstack/react-query';
import { useUser } from '@/lib/auth';
import { portalForRole } from '@/lib/authorization';
import { AdminShell } from './admin/layout';
import { LabShell } from './lab/layout';
import { PartnerShell } from './partner/layout';
import { PortalGuard, portalLoader } from './guard';

// Pages every role has (the profile) sit in the frame of the person's own portal.
const shells = { partner: PartnerShell, lab: LabShell, admin: AdminShell } as const;

function OwnShell() {
  const Shell = shells[portalForRole(useUser().role)];
  return <Shell />;
}

export const clientLoader = (queryClient: QueryClient) => portalLoader(queryClient, 'any');
export const shouldRevalidate = () => true;

export default function RoleLayout() {
  return (
    <PortalGuard portal="any">
      <OwnShell />
    </PortalGuard>
  );
}
