import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { getApiDocumentQueryOptions } from '@/features/api-keys/api/get-api-document';
import { ApiGuide } from '@/features/api-keys/components/api-guide';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getApiDocumentQueryOptions()).catch(() => undefined);
  return null;
};

export default function ApiGuidePage() {
  return (
    <>
      <PageHeader title="API guide" description="How your own system opens referrals, follows them and adds photos: every request, its fields, and an example to try." />
      <ApiGuide />
    </>
  );
}
