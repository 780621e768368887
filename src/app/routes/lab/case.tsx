import type { QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import { PanelError } from '@/components/errors/error-panel';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { getLabCaseQueryOptions, useLabCase } from '@/features/bench/api/get-lab-case';
import { LabCaseView } from '@/features/bench/components/lab-case-view';
import { QuotePanel } from '@/features/quotes';
import { RefundPanel } from '@/features/refunds';
import { CaseRecordPanel } from '@/features/custody';

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  // A failure (another lab's case, a mistyped link) is shown by the page itself.
  if (params.caseId) await queryClient.ensureQueryData(getLabCaseQueryOptions(params.caseId)).catch(() => undefined);
  return null;
};

export default function LabCasePage() {
  const { caseId = '' } = useParams();
  const labCase = useLabCase(caseId);
  if (labCase.isPending) return <PageSpinner label="Loading the case" />;
  if (labCase.isError) {
    const missing = isApiError(labCase.error) && labCase.error.status === 404;
    return (
      <>
        <PageHeader title={missing ? 'Case not found' : 'The case could not be loaded'} />
        {missing ? (
          <div className="flex flex-col items-start gap-4">
            <p className="text-ink-muted">Your lab holds no case at this address.</p>
            <Link to={paths.lab.bench.getHref()} className={buttonClasses({ variant: 'secondary' })}>
              Go to the bench queue
            </Link>
          </div>
        ) : (
          <PanelError onRetry={() => void labCase.refetch()} />
        )}
      </>
    );
  }
  return (
    <>
      <LabCaseView
        labCase={labCase.data}
        quoteSection={
          <>
            <QuotePanel labCase={labCase.data} />
            <RefundPanel labCase={labCase.data} />
          </>
        }
      />
      <CaseRecordPanel caseId={labCase.data.id} />
    </>
  );
}
