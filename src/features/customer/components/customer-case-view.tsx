import type { ReactNode } from 'react';
import { formatMoney } from '@shared/domain/money';
import type { CustomerCaseDto } from '@shared/schemas/customer';
import { recoverabilityHints, recoverabilityLabels } from '@shared/schemas/lab-work';
import { caseStatusLabels, mediaTypeLabels, priorityCategoryLabels } from '@shared/vocabulary';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';
import { ImagingProgress } from '@/features/bench';
import { QuoteLines } from '@/features/quotes';
import { CaseSteps } from './case-steps';
import { FilesReview } from './files-review';
import { PayButton } from './pay-button';
import { ApproveQuote, DeclineQuote } from './quote-answer';
import { ReturnAddressForm } from './return-address-form';

/** One sentence on where the case is, in the customer's terms. */
function whereItIs(page: CustomerCaseDto): ReactNode {
  const lab = page.lab?.name ?? 'the recovery lab';
  switch (page.status) {
    case 'quote_sent':
      return `${lab} has examined your device and sent a quote. Nothing happens until you approve it.`;
    case 'quote_declined':
      return `You declined the quote. ${page.shop.name} arranges the return of your device.`;
    case 'approved':
      return 'You approved the quote. Pay securely to start the recovery.';
    case 'paid':
      return `Payment received. ${lab} starts copying your device.`;
    case 'recovering':
      return `${lab} is copying your device sector by sector and recovering the files.`;
    case 'ready_for_review':
      return page.files?.review.status === 'confirmed'
        ? 'You confirmed the files. The lab is preparing the new media for shipping.'
        : 'Your files are recovered. Please check that what matters to you is there.';
    case 'no_recovery':
      return `${lab} could not recover the data. You owe nothing; ${page.shop.name} arranges the return of your device.`;
    case 'received':
    case 'evaluating':
      return `${lab} has your device and is examining it.`;
    default:
      return caseStatusLabels[page.status];
  }
}

function device(page: CustomerCaseDto): string {
  const makeModel = [page.device.make, page.device.model].filter(Boolean).join(' ');
  return [mediaTypeLabels[page.device.mediaType], makeModel, page.device.capacityGb ? `${page.device.capacityGb.toLocaleString('en-US')} GB` : ''].filter(Boolean).join(' · ');
}

export function CustomerCaseView({ token, page }: { token: string; page: CustomerCaseDto }) {
  const { quote, evaluation } = page;
  return (
    <div className="flex flex-col gap-6">
      <div>
        <title>{`Case ${page.reference} · Platterpost`}</title>
        <p className="text-sm font-semibold text-copper-600">Case {page.reference}</p>
        <h1 className="text-2xl font-bold tracking-tight text-ink-strong sm:text-3xl">Your data recovery</h1>
        <p className="mt-1 text-ink-muted">
          {device(page)} · for {page.customerName}
        </p>
      </div>
      <CaseSteps status={page.status} />
      <Alert tone={page.status === 'no_recovery' ? 'warning' : 'info'} live="polite">
        {whereItIs(page)}
      </Alert>

      {quote && ['quote_sent', 'quote_declined', 'approved', 'paid', 'recovering', 'ready_for_review', 'returned', 'closed'].includes(page.status) ? (
        <Card title="The lab’s quote" description={`Sent ${formatDateTime(quote.sentAt)}${quote.version > 1 ? ` (revised, version ${quote.version})` : ''}`}>
          <div className="flex flex-col gap-5">
            {evaluation ? (
              <div className="text-sm">
                <p>
                  <span className="font-semibold text-ink-strong">The lab’s estimate: {recoverabilityLabels[evaluation.recoverability].toLowerCase()}</span> — {recoverabilityHints[evaluation.recoverability]}.
                </p>
                <p className="mt-1 whitespace-pre-line text-ink">{evaluation.plan}</p>
              </div>
            ) : null}
            <QuoteLines quote={quote} />
            {quote.note ? <p className="text-sm text-ink-muted">{quote.note}</p> : null}
            {quote.approval ? (
              <p className="text-sm text-moss-text">
                Approved {formatDateTime(quote.approval.at)}, signed “{quote.approval.fullName}”.
              </p>
            ) : null}
            {page.actions.respondToQuote ? (
              <div className="flex flex-col gap-4 border-t border-ink-hairline pt-4">
                <ApproveQuote token={token} quote={quote} labName={page.lab?.name ?? 'The lab'} />
                <div>
                  <DeclineQuote token={token} quote={quote} />
                </div>
              </div>
            ) : null}
          </div>
        </Card>
      ) : null}

      {page.status === 'no_recovery' && evaluation ? (
        <Card title="What the lab found">
          <p className="text-sm whitespace-pre-line">{evaluation.plan}</p>
        </Card>
      ) : null}

      {page.actions.pay ? (
        <Card title="Payment">
          <PayButton token={token} page={page} />
        </Card>
      ) : page.payment.state === 'paid' ? (
        <p className="text-sm text-moss-text">
          Paid {formatMoney(page.payment.amountMinor!, page.payment.currency!)} on {formatDateTime(page.payment.paidAt!)}. Thank you.
          {page.payment.refundedMinor > 0 ? ` ${formatMoney(page.payment.refundedMinor, page.payment.currency!)} has been refunded to your card.` : null}
        </p>
      ) : null}

      {page.imaging ? (
        <Card title="Copying your device" description="The lab copies the whole device before recovering files from the copy, so the original is read as little as possible.">
          <ImagingProgress imaging={page.imaging} detail="simple" />
        </Card>
      ) : null}

      {page.files ? (
        <Card title="Your recovered files" description="Grouped by the kinds of files you said matter most.">
          <FilesReview token={token} page={page} />
        </Card>
      ) : null}

      {page.actions.setReturnAddress || page.returnAddress ? (
        <Card title="Where should your data go?" description="The recovered files come back on new media, sent to this address.">
          {page.actions.setReturnAddress ? (
            <ReturnAddressForm token={token} page={page} />
          ) : (
            <address className="text-sm not-italic">
              {page.returnAddress!.name}, {page.returnAddress!.line1}, {page.returnAddress!.city}, {page.returnAddress!.region} {page.returnAddress!.postalCode}
            </address>
          )}
        </Card>
      ) : null}

      <div className="grid gap-6 md:grid-cols-2">
        <Card title="What has happened">
          <ol aria-label="Timeline" className="flex flex-col gap-3 border-l-2 border-spruce-100 pl-4">
            {[...page.timeline].reverse().map((e, i) => (
              <li key={`${e.at}-${i}`}>
                <p className="text-sm font-medium text-ink-strong">{e.summary}</p>
                <p className="text-xs text-ink-muted">
                  <time dateTime={e.at}>{formatDateTime(e.at)}</time>
                </p>
              </li>
            ))}
          </ol>
        </Card>
        <div className="flex flex-col gap-6">
          {page.priorities.length ? (
            <Card title="What you said matters most">
              <ol className="list-decimal pl-5 text-sm">
                {page.priorities.map((p) => (
                  <li key={p.category}>
                    {priorityCategoryLabels[p.category]}
                    {p.note ? <span className="text-ink-muted"> — {p.note}</span> : null}
                  </li>
                ))}
              </ol>
            </Card>
          ) : null}
          <Card title="Questions?">
            <p className="text-sm">
              Your repair shop, <span className="font-semibold">{page.shop.name}</span>, follows your case
              {page.shop.phone ? <>: {page.shop.phone}</> : null}
              {page.shop.email ? (
                <>
                  {' '}
                  ·{' '}
                  <a className="font-semibold text-spruce-700 underline" href={`mailto:${page.shop.email}`}>
                    {page.shop.email}
                  </a>
                </>
              ) : null}
              .
            </p>
            <p className="mt-2 text-xs text-ink-muted">Keep this page’s address to yourself: anyone who has it can see the case. Your shop can switch the link off and send you a new one.</p>
          </Card>
        </div>
      </div>
    </div>
  );
}
