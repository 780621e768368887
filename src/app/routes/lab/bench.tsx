import type { QueryClient } from '@tanstack/react-query';
import { PageHeader } from '@/components/layouts/page-header';
import { Can } from '@/lib/auth';
import { getBenchQueryOptions } from '@/features/bench/api/get-bench';
import { BenchTable } from '@/features/bench/components/bench-table';
import { ToolKeys } from '@/features/bench/components/tool-keys';

export const clientLoader = (queryClient: QueryClient) => async () => {
  // A failure is shown by the table itself, with a retry.
  await queryClient.ensureQueryData(getBenchQueryOptions()).catch(() => undefined);
  return null;
};

export default function BenchPage() {
  return (
    <>
      <PageHeader title="Bench queue" description="Your lab’s received cases, the soonest promise first: evaluation, quote, imaging and the recovered files." />
      <div className="flex flex-col gap-8">
        <BenchTable />
        <Can permission="lab-api-keys.manage">
          <ToolKeys />
        </Can>
      </div>
    </>
  );
}
