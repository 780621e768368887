import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { TextLink } from '@/components/ui/link';
import { paths } from '@/config/paths';
import { getApiKeysQueryOptions } from '@/features/api-keys/api/get-api-keys';
import { ApiKeyList } from '@/features/api-keys/components/api-key-list';
import { CreateApiKeyDialog } from '@/features/api-keys/components/create-api-key-dialog';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getApiKeysQueryOptions()).catch(() => undefined);
  return null;
};

export default function ApiKeysPage() {
  return (
    <>
      <PageHeader
        title="API keys"
        description={
          <>
            Keys let your ticketing system open referrals and follow their status. Each key is shown once, when you create it. The{' '}
            <TextLink to={paths.partner.apiGuide.getHref()}>API guide</TextLink> shows every request with examples.
          </>
        }
        actions={<CreateApiKeyDialog />}
      />
      <ApiKeyList />
    </>
  );
}
