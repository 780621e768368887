import { useEffect } from 'react';
import { useNavigate, useParams, useSearchParams } from 'react-router';
import { Wordmark } from '@/components/brand/wordmark';
import { Card } from '@/components/ui/card';
import { PageSpinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { PAYING_TOKEN_KEY } from '@/features/customer/api/customer-request';

// The payment provider sends the customer here (its return address carries no token of ours); the
// case's link waited in this tab and takes them back to their page.
export default function CheckoutReturnPage() {
  const { outcome } = useParams();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const token = typeof sessionStorage === 'undefined' ? null : sessionStorage.getItem(PAYING_TOKEN_KEY);
  const sessionId = params.get('session_id');

  useEffect(() => {
    if (!token) return;
    sessionStorage.removeItem(PAYING_TOKEN_KEY);
    const back = paths.customer.case.getHref(token);
    navigate(outcome === 'done' && sessionId ? `${back}?session_id=${encodeURIComponent(sessionId)}` : back, { replace: true });
  }, [token, outcome, sessionId, navigate]);

  if (token) return <PageSpinner label="Taking you back to your case" />;
  return (
    <div className="flex min-h-screen flex-col bg-paper">
      <header className="bg-spruce-900 px-6 py-4 text-paper">
        <Wordmark />
      </header>
      <main id="main" className="mx-auto w-full max-w-2xl flex-1 px-4 py-10">
        <title>Payment · Platterpost</title>
        <h1 className="text-2xl font-bold tracking-tight text-ink-strong">{outcome === 'done' ? 'Thank you for your payment' : 'Payment not made'}</h1>
        <Card className="mt-6">
          <p className="text-sm">
            {outcome === 'done'
              ? 'The payment provider has your payment. Open your case from the link in your e-mail to see it.'
              : 'Nothing was charged. Open your case from the link in your e-mail to try again.'}
          </p>
        </Card>
      </main>
    </div>
  );
}
