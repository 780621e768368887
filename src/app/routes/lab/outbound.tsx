import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getOutboundQueryOptions } from '@/features/receiving/api/get-outbound';
import { OutboundList } from '@/features/receiving/components/outbound-list';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getOutboundQueryOptions()).catch(() => undefined);
  return null;
};

export default function OutboundPage() {
  return (
    <>
      <PageHeader title="Outbound" description="Devices your lab holds: returns to the shop or the customer, and transfers to the lab that took a case over." />
      <OutboundList />
    </>
  );
}
