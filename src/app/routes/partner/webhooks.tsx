import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getWebhooksQueryOptions } from '@/features/webhooks/api/get-webhooks';
import { CreateWebhookDialog } from '@/features/webhooks/components/create-webhook-dialog';
import { WebhookList } from '@/features/webhooks/components/webhook-list';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getWebhooksQueryOptions()).catch(() => undefined);
  return null;
};

export default function WebhooksPage() {
  return (
    <>
      <PageHeader
        title="Webhooks"
        description="Addresses on your side that Platterpost notifies, signed, whenever one of your cases changes. Failed deliveries are retried for a day."
        actions={<CreateWebhookDialog />}
      />
      <WebhookList />
    </>
  );
}
