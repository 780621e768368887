import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { getLabsQueryOptions } from '@/features/network/api/get-labs';
import { LabsOverview, skillFrom } from '@/features/network/components/labs-overview';
import { OnboardOrganizationDialog } from '@/features/network/components/onboard-organization-dialog';

export const clientLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await queryClient.ensureQueryData(getLabsQueryOptions(skillFrom(new URL(request.url).searchParams))).catch(() => undefined);
  return null;
};

export default function LabsPage() {
  return (
    <>
      <PageHeader
        title="Labs"
        description="Recovery labs in the network: where they are, what they can do, their clean-air class and how full their queues are."
        actions={<OnboardOrganizationDialog kind="lab" />}
      />
      <LabsOverview />
    </>
  );
}
