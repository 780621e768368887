import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { getEarningsQueryOptions } from '@/features/earnings/api/get-earnings';
import { EarningsOverview } from '@/features/earnings/components/earnings-overview';
import { PayeeProvider } from '@/features/earnings/payee';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure here is shown by the page itself, with a retry, inside the portal.
  await queryClient.ensureQueryData(getEarningsQueryOptions('lab')).catch(() => undefined);
  return null;
};

export default function LabEarningsPage() {
  const [params] = useSearchParams();
  const back = params.get('payouts');
  return (
    <PayeeProvider payee="lab">
      <PageHeader
        title="Earnings"
        description="The lab’s share of every recovery its customers have paid for, settled once a month to the lab’s payout account."
      />
      <EarningsOverview returned={back === 'returned' || back === 'refresh' ? back : null} />
    </PayeeProvider>
  );
}
