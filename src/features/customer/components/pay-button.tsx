import { formatMoney } from '@shared/domain/money';
import type { CustomerCaseDto } from '@shared/schemas/customer';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { isApiError } from '@/lib/api-client';
import { PAYING_TOKEN_KEY } from '../api/customer-request';
import { useStartCheckout } from '../api/start-checkout';

/** Goes to the payment provider's page; the link's token waits in this tab to bring the customer back. */
export function PayButton({ token, page }: { token: string; page: CustomerCaseDto }) {
  const checkout = useStartCheckout(token);
  const quote = page.quote!;
  return (
    <div className="flex flex-col gap-3">
      {page.payment.lastFailure ? (
        <Alert tone="warning" title="The last payment did not go through">
          {page.payment.lastFailure} Nothing was charged; you can try again, with another card if need be.
        </Alert>
      ) : null}
      {checkout.isError && isApiError(checkout.error) && !checkout.error.isUnexpected ? (
        <Alert tone="danger" live="assertive">
          {checkout.error.message}
        </Alert>
      ) : null}
      <div>
        <Button
          size="lg"
          isLoading={checkout.isPending}
          onClick={async () => {
            const { url } = await checkout.mutateAsync();
            sessionStorage.setItem(PAYING_TOKEN_KEY, token);
            window.location.assign(url);
          }}
        >
          Pay {formatMoney(quote.totalMinor, quote.currency)} securely
        </Button>
      </div>
      <p className="text-xs text-ink-muted">The card is taken on the payment provider’s page; Platterpost never sees the card number.</p>
    </div>
  );
}
