import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getOffersQueryOptions } from '@/features/offers/api/get-offers';
import { OffersTable } from '@/features/offers/components/offers-table';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure here is shown by the table itself, with a retry.
  await queryClient.ensureQueryData(getOffersQueryOptions('pending')).catch(() => undefined);
  return null;
};

export default function OffersPage() {
  return (
    <>
      <PageHeader title="Offers" description="Cases the network has offered to your lab. Answer each before its deadline; an unanswered offer moves to the next lab by itself." />
      <OffersTable />
    </>
  );
}
