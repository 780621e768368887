import type { QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { getEarningsQueryOptions } from '../api/get-earnings';
import { PayeeProvider, type Payee } from '../payee';
import { EarningsOverview } from './earnings-overview';

/** The route loader of a payee's earnings page. A failure is shown by the page itself, with a retry. */
export const earningsLoader = (payee: Payee) => (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getEarningsQueryOptions(payee)).catch(() => undefined);
  return null;
};

/** A payee's earnings page; `?payouts=returned|refresh` is how the payment provider's set-up page sends people back. */
export function EarningsPage({ payee, description }: { payee: Payee; description: string }) {
  const [params] = useSearchParams();
  const back = params.get('payouts');
  return (
    <PayeeProvider payee={payee}>
      <PageHeader title="Earnings" description={description} />
      <EarningsOverview returned={back === 'returned' || back === 'refresh' ? back : null} />
    </PayeeProvider>
  );
}
