import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getSettlementOverviewQueryOptions } from '@/features/settlement/api/get-settlement-overview';
import { SettlementOverview } from '@/features/settlement/components/settlement-overview';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure here is shown by the page itself, with a retry, inside the portal.
  await queryClient.ensureQueryData(getSettlementOverviewQueryOptions()).catch(() => undefined);
  return null;
};

export default function SettlementPage() {
  return (
    <>
      <PageHeader
        title="Settlement"
        description="Monthly payouts: commission to every shop and its share to every lab, one transfer each, never twice."
      />
      <SettlementOverview />
    </>
  );
}
