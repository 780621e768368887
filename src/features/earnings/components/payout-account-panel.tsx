import { useEffect, useState } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { PayoutAccountDto } from '@shared/schemas/money';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { getPayoutAccountQueryOptions } from '../api/get-payout-account';
import { earningsKeys } from '../api/keys';
import { useStartPayoutOnboarding } from '../api/start-payout-onboarding';
import { usePayee } from '../payee';

const statusText = (earning: string): Record<PayoutAccountDto['status'], { tone: 'success' | 'warning' | 'neutral' | 'info'; label: string; text: string }> => ({
  none: { tone: 'neutral', label: 'Not set up', text: `Set up a payout account so your monthly ${earning} can be paid. It takes a few minutes on our payment provider’s page.` },
  onboarding: { tone: 'info', label: 'Set-up not finished', text: 'The payment provider still needs some details before it can pay you. Continue where you left off.' },
  restricted: { tone: 'warning', label: 'Needs attention', text: 'The payment provider has your details but cannot pay out yet. Open the set-up again to see what it needs.' },
  enabled: { tone: 'success', label: 'Payouts enabled', text: `Your monthly ${earning} is paid to this account after each settlement.` },
});

/** The payee's payout account: its state at the provider, and the way to set it up or finish it. */
export function PayoutAccountPanel({ account: fromSummary, returned }: { account: PayoutAccountDto; returned: 'returned' | 'refresh' | null }) {
  const { payee, words } = usePayee();
  const start = useStartPayoutOnboarding(payee);
  const queryClient = useQueryClient();
  // Back from the provider's page: ask for the account's state every two seconds for a minute, until it is enabled.
  const [watchUntil] = useState(() => (returned === 'returned' ? Date.now() + 60_000 : 0));
  const live = useQuery({
    ...getPayoutAccountQueryOptions(payee),
    enabled: returned === 'returned' && fromSummary.status !== 'enabled',
    refetchInterval: (query) => (query.state.data?.status !== 'enabled' && Date.now() < watchUntil ? 2000 : false),
  });
  const account = live.data ?? fromSummary;
  useEffect(() => {
    if (live.data?.status === 'enabled' && fromSummary.status !== 'enabled') void queryClient.invalidateQueries({ queryKey: earningsKeys.summary(payee) });
  }, [live.data?.status, fromSummary.status, queryClient, payee]);
  const state = statusText(words.earningInText)[account.status];
  return (
    <Card
      title="Payout account"
      description={`Where your ${words.earningInText} is paid`}
      actions={<Badge tone={state.tone}>{state.label}</Badge>}
    >
      <div className="flex flex-col gap-3">
        {returned === 'returned' && account.status !== 'enabled' ? (
          <Alert tone="info" live="polite">
            Thanks — the payment provider is checking your details. This page shows the result as soon as it arrives.
          </Alert>
        ) : null}
        {returned === 'refresh' ? (
          <Alert tone="warning" live="polite">
            That set-up link had expired. Start again to get a new one.
          </Alert>
        ) : null}
        <p className="text-sm text-ink">{state.text}</p>
        {account.accountId ? (
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-ink-muted">Account</dt>
            <dd className="font-mono">{account.accountId}</dd>
            <dt className="text-ink-muted">Payouts</dt>
            <dd>{account.payoutsEnabled ? 'Enabled' : 'Not yet'}</dd>
            <dt className="text-ink-muted">Card payments</dt>
            <dd>{account.chargesEnabled ? 'Enabled' : 'Not yet'}</dd>
          </dl>
        ) : null}
        {account.status !== 'enabled' ? (
          <div>
            <Button onClick={() => start.mutate()} isLoading={start.isPending || start.isSuccess}>
              {account.status === 'none' ? 'Set up payouts' : 'Continue set-up'}
            </Button>
          </div>
        ) : null}
        {start.isError ? (
          <Alert tone="danger" live="assertive">
            The set-up could not be started: {start.error.message}
          </Alert>
        ) : null}
      </div>
    </Card>
  );
}
