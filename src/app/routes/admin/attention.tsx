import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getAttentionQueryOptions } from '@/features/network/api/get-attention';
import { AttentionQueue } from '@/features/network/components/attention-queue';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getAttentionQueryOptions()).catch(() => undefined);
  return null;
};

export default function AttentionPage() {
  return (
    <>
      <PageHeader
        title="Needs attention"
        description="Cases no lab has taken: none qualified, every lab declined, or offers ran out of time. Each shows why, and the labs that would rank for it now."
      />
      <AttentionQueue />
    </>
  );
}
