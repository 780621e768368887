import { useState } from 'react';
import { formatMoney } from '@shared/domain/money';
import { recoverabilityHints, recoverabilityLabels } from '@shared/schemas/lab-work';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { Spinner } from '@/components/ui/spinner';
import { toast } from '@/components/ui/toast';
import { Can } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { ImagingProgress, ManifestSummary } from '@/features/bench';
import { QuoteLines } from '@/features/quotes';
import { useCustomerLinks } from '../api/get-customer-links';
import { useShopLabWork } from '../api/get-shop-lab-work';
import { useIssueCustomerLink } from '../api/issue-customer-link';
import { useRevokeCustomerLinks } from '../api/revoke-customer-links';

const reasonWords: Record<string, string> = {
  shop: 'handed over by the shop',
  quote_sent: 'e-mailed with the quote',
  files_ready: 'e-mailed with the file list',
  no_recovery: 'e-mailed with the lab’s findings',
};

function CustomerLinks({ referralId, customerEmail }: { referralId: string; customerEmail: string }) {
  const links = useCustomerLinks(referralId);
  const issue = useIssueCustomerLink(referralId);
  const revoke = useRevokeCustomerLinks(referralId);
  const [sendEmail, setSendEmail] = useState(true);
  const [shown, setShown] = useState<string | null>(null);
  const live = (links.data ?? []).filter((l) => !l.revokedAt && new Date(l.expiresAt).getTime() > Date.now());
  return (
    <div className="flex flex-col gap-3 text-sm">
      <p className="text-ink-muted">The customer follows the case, approves the quote, pays and checks the files on a private page. Anyone with its address can see the case.</p>
      {links.isPending ? (
        <Spinner label="Loading the links" />
      ) : live.length ? (
        <ul className="flex flex-col gap-1">
          {live.map((l) => (
            <li key={l.id}>
              Link {reasonWords[l.reason] ?? l.reason}, {formatDateTime(l.issuedAt)} · {l.lastUsedAt ? `last opened ${formatDateTime(l.lastUsedAt)}` : 'not opened yet'}
            </li>
          ))}
        </ul>
      ) : (
        <p>No live link.</p>
      )}
      {shown ? (
        <Alert tone="success" live="polite" title="New link: copy it now, it is not shown again">
          <code className="block break-all select-all">{shown}</code>
        </Alert>
      ) : null}
      <Can permission="customer-link.manage">
        <div className="flex flex-col gap-3 border-t border-ink-hairline pt-3">
          <Checkbox label={`Also e-mail it to ${customerEmail}`} checked={sendEmail} onChange={(e) => setSendEmail(e.target.checked)} />
          <div className="flex flex-wrap gap-2">
            <Button
              variant="secondary"
              size="sm"
              isLoading={issue.isPending}
              onClick={async () => {
                const issued = await issue.mutateAsync(sendEmail);
                setShown(issued.url);
              }}
            >
              New link for the customer
            </Button>
            {live.length ? (
              <Button
                variant="ghost"
                size="sm"
                isLoading={revoke.isPending}
                onClick={async () => {
                  await revoke.mutateAsync();
                  setShown(null);
                  toast.success('The customer’s links are switched off');
                }}
              >
                Switch off every link
              </Button>
            ) : null}
          </div>
        </div>
      </Can>
    </div>
  );
}

/** The shop's panel on its case: the lab's findings, quote, imaging, the file counts, the payment and the customer link. */
export function ShopLabWork({ referralId, customerEmail }: { referralId: string; customerEmail: string }) {
  const work = useShopLabWork(referralId);
  const w = work.data;
  return (
    <Card title="Lab work and the customer">
      <div className="flex flex-col gap-5">
        {w?.evaluation ? (
          <p className="text-sm">
            <span className="font-semibold text-ink-strong">Lab’s estimate: {recoverabilityLabels[w.evaluation.recoverability]}</span> — {recoverabilityHints[w.evaluation.recoverability]}.
          </p>
        ) : null}
        {w?.quote ? (
          <div className="flex flex-col gap-2">
            <p className="text-sm font-semibold text-ink-strong">
              Quote {w.quote.approval ? `approved by “${w.quote.approval.fullName}”` : w.quote.decline ? 'declined by the customer' : 'waiting for the customer'}
            </p>
            <QuoteLines quote={w.quote} />
          </div>
        ) : null}
        {w?.payment.state === 'paid' ? (
          <p className="text-sm text-moss-text">
            Paid {formatMoney(w.payment.amountMinor!, w.payment.currency!)} on {formatDateTime(w.payment.paidAt!)}.
            {w.payment.refundedMinor > 0 ? ` ${formatMoney(w.payment.refundedMinor, w.payment.currency!)} refunded by the lab.` : null}
          </p>
        ) : null}
        {w?.imaging ? <ImagingProgress imaging={w.imaging} detail="simple" /> : null}
        {w?.manifest ? <ManifestSummary manifest={w.manifest} /> : null}
        <CustomerLinks referralId={referralId} customerEmail={customerEmail} />
      </div>
    </Card>
  );
}
