import { useEffect, useRef, type ReactNode } from 'react';
import { useParams, useSearchParams } from 'react-router';
import { Wordmark } from '@/components/brand/wordmark';
import { PanelError } from '@/components/errors/error-panel';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { useConfirmCheckout } from '@/features/customer/api/confirm-checkout';
import { useCustomerCase } from '@/features/customer/api/get-customer-case';
import { CustomerCaseView } from '@/features/customer/components/customer-case-view';

// The customer has no account: this page is reached only through the private link, and shows that
// one case and nothing else.

function Frame({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col bg-paper">
      <header className="bg-spruce-900 px-6 py-4 text-paper">
        <Wordmark />
      </header>
      <main id="main" className="mx-auto w-full max-w-4xl flex-1 px-4 py-8">
        {children}
      </main>
      <footer className="border-t border-ink-hairline px-6 py-4 text-center text-xs text-ink-muted">
        Platterpost connects repair shops with the recovery labs that can save their customers’ data.
      </footer>
    </div>
  );
}

/** Back from the payment page: ask the server to check the payment straight away, then tidy the address. */
function useReturnFromPayment(token: string) {
  const [params, setParams] = useSearchParams();
  const sessionId = params.get('session_id');
  const confirm = useConfirmCheckout(token);
  const asked = useRef(false);
  useEffect(() => {
    if (!sessionId || asked.current) return;
    asked.current = true;
    confirm.mutateAsync(sessionId).catch(() => undefined).finally(() => setParams({}, { replace: true }));
  }, [sessionId, confirm, setParams]);
  return Boolean(sessionId) || confirm.isPending;
}

export default function CustomerCasePage() {
  const { token = '' } = useParams();
  const page = useCustomerCase(token);
  const checking = useReturnFromPayment(token);

  if (page.isPending) {
    return (
      <Frame>
        <PageSpinner label="Loading your case" />
      </Frame>
    );
  }
  if (page.isError) {
    const gone = isApiError(page.error) && page.error.status === 404;
    return (
      <Frame>
        <title>Your recovery · Platterpost</title>
        <h1 className="text-2xl font-bold tracking-tight text-ink-strong">{gone ? 'This link does not open a case' : 'Your case could not be loaded'}</h1>
        {gone ? (
          <Card className="mt-6">
            <p className="text-sm">The link may have been switched off, or copied only in part. Ask your repair shop for a new link; it will show the same case.</p>
          </Card>
        ) : (
          <div className="mt-6">
            <PanelError onRetry={() => void page.refetch()} />
          </div>
        )}
      </Frame>
    );
  }
  return (
    <Frame>
      {checking ? (
        <Alert tone="info" live="polite" className="mb-6">
          Checking your payment with the payment provider…
        </Alert>
      ) : null}
      <CustomerCaseView token={token} page={page.data} />
    </Frame>
  );
}
