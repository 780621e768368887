import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { getAuditEventsQueryOptions } from '@/features/audit/api/get-audit-events';
import { getAuditFacetsQueryOptions } from '@/features/audit/api/get-audit-facets';
import { AuditLog, auditQueryFrom } from '@/features/audit/components/audit-log';

export const clientLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  const filters = auditQueryFrom(new URL(request.url).searchParams);
  await Promise.all([
    queryClient.ensureQueryData(getAuditFacetsQueryOptions()).catch(() => undefined),
    queryClient.ensureQueryData(getAuditEventsQueryOptions({ ...filters, cursor: undefined })).catch(() => undefined),
  ]);
  return null;
};

export default function AuditPage() {
  return (
    <>
      <PageHeader
        title="Audit log"
        description="Security and money actions across the network: sign-ins, keys and endpoints, commission plans, settlement runs, routing by hand, custody exports and sanitizations."
      />
      <AuditLog />
    </>
  );
}
