import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getCommissionPlansQueryOptions, getPartnersQueryOptions } from '@/features/network/api/commission-plans';
import { CommissionPlansCard, PartnersCard } from '@/features/network/components/commission-plans';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure here is shown by the cards themselves, with a retry.
  await Promise.all([queryClient.ensureQueryData(getCommissionPlansQueryOptions()), queryClient.ensureQueryData(getPartnersQueryOptions())]).catch(() => undefined);
  return null;
};

export default function PartnersPage() {
  return (
    <>
      <PageHeader title="Partners" description="Repair shops and resellers that refer cases to the network, and the commission plans they earn on." />
      <div className="flex flex-col gap-6">
        <CommissionPlansCard />
        <PartnersCard />
      </div>
    </>
  );
}
