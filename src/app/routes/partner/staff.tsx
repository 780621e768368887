import type { QueryClient } from '@tanstack/react-query';
import { getStaffQueryOptions } from '@/features/staff/api/get-staff';
import { StaffOverview } from '@/features/staff/components/staff-overview';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure here is shown by the list itself, with a retry, inside the portal.
  await queryClient.ensureQueryData(getStaffQueryOptions()).catch(() => undefined);
  return null;
};

export default function PartnerStaffPage() {
  return <StaffOverview />;
}
