import type { QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import { PanelError } from '@/components/errors/error-panel';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { getOfferQueryOptions, useOffer } from '@/features/offers/api/get-offer';
import { OfferDetail } from '@/features/offers/components/offer-detail';

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  if (params.offerId) await queryClient.ensureQueryData(getOfferQueryOptions(params.offerId)).catch(() => undefined);
  return null;
};

export default function OfferPage() {
  const { offerId = '' } = useParams();
  const offer = useOffer(offerId);
  if (offer.isPending) return <PageSpinner label="Loading the offer" />;
  if (offer.isError) {
    const missing = isApiError(offer.error) && (offer.error.status === 404 || offer.error.status === 400);
    return (
      <>
        <PageHeader title={missing ? 'Offer not found' : 'The offer could not be loaded'} />
        {missing ? (
          <div className="flex flex-col items-start gap-4">
            <p className="text-ink-muted">There is no offer to your lab at this address.</p>
            <Link to={paths.lab.offers.getHref()} className={buttonClasses({ variant: 'secondary' })}>
              Go to your offers
            </Link>
          </div>
        ) : (
          <PanelError onRetry={() => void offer.refetch()} />
        )}
      </>
    );
  }
  return <OfferDetail offer={offer.data} />;
}
