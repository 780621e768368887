import type { QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import { PanelError } from '@/components/errors/error-panel';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { getReferralQueryOptions, useReferral } from '@/features/referrals/api/get-referral';
import { CaseDetail } from '@/features/referrals/components/case-detail';
import { ShipSection } from '@/features/shipping/components/ship-section';
import { CaseRecordPanel } from '@/features/custody';
import { ShopLabWork } from '@/features/customer';

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  // A failure (another shop's case, a mistyped link) is shown by the page itself.
  if (params.caseId) await queryClient.ensureQueryData(getReferralQueryOptions(params.caseId)).catch(() => undefined);
  return null;
};

export default function CasePage() {
  const { caseId = '' } = useParams();
  const referral = useReferral(caseId);

  if (referral.isPending) return <PageSpinner label="Loading the case" />;
  if (referral.isError) {
    const missing = isApiError(referral.error) && (referral.error.status === 404 || referral.error.status === 400);
    return (
      <>
        <PageHeader title={missing ? 'Case not found' : 'The case could not be loaded'} />
        {missing ? (
          <div className="flex flex-col items-start gap-4">
            <p className="text-ink-muted">There is no case at this address for your shop. Check the link, or find the case in your list.</p>
            <Link to={paths.partner.cases.getHref()} className={buttonClasses({ variant: 'secondary' })}>
              Go to your cases
            </Link>
          </div>
        ) : (
          <PanelError onRetry={() => void referral.refetch()} />
        )}
      </>
    );
  }
  return (
    <>
      <CaseDetail referral={referral.data} />
      <ShipSection referralId={referral.data.id} />
      <div className="mt-6">
        <ShopLabWork referralId={referral.data.id} customerEmail={referral.data.customer.email} />
      </div>
      <CaseRecordPanel caseId={referral.data.id} />
    </>
  );
}
