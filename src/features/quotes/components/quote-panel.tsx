import { useState } from 'react';
import { formatMoney } from '@shared/domain/money';
import type { LabCaseDto } from '@shared/schemas/lab-work';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { useCan } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { QuoteForm } from './quote-form';
import { QuoteLines } from './quote-lines';

const QUOTABLE: readonly LabCaseDto['status'][] = ['evaluating', 'quote_sent', 'quote_declined'];

/** The quote on the lab's case page: the manager writes or revises it; everyone in the lab reads it. */
export function QuotePanel({ labCase }: { labCase: LabCaseDto }) {
  const can = useCan();
  const { quote, evaluation, payment } = labCase;
  const mayQuote = can('quotes.send') && QUOTABLE.includes(labCase.status) && evaluation !== null && evaluation.recoverability !== 'none';
  // A quote already sent is shown as the customer sees it; revising opens the form.
  const [revising, setRevising] = useState(false);
  const editing = mayQuote && (!quote || revising);
  if (!quote && !mayQuote) {
    if (labCase.status !== 'evaluating') return null;
    return (
      <Card title="Quote">
        <p className="text-sm text-ink-muted">{evaluation ? 'The lab manager sends the quote from here.' : 'The quote follows the evaluation.'}</p>
      </Card>
    );
  }
  return (
    <Card title="Quote" description={quote ? `Version ${quote.version}, sent ${formatDateTime(quote.sentAt)} by ${quote.sentBy}` : 'Nothing is charged until the customer approves and pays.'}>
      <div className="flex flex-col gap-5">
        {quote?.approval ? (
          <Alert tone="success" title={`Approved by “${quote.approval.fullName}”`}>
            {formatDateTime(quote.approval.at)}. {payment.state === 'paid' ? `Paid ${formatMoney(payment.amountMinor!, payment.currency!)} on ${formatDateTime(payment.paidAt!)}.` : 'Waiting for the payment.'}
          </Alert>
        ) : null}
        {quote?.decline ? (
          <Alert tone="warning" title="The customer declined this quote">
            {quote.decline.reason ? `“${quote.decline.reason}”` : 'No reason given.'}
          </Alert>
        ) : null}
        {quote && !editing ? <QuoteLines quote={quote} /> : null}
        {mayQuote && !editing ? (
          <div>
            <Button variant="secondary" onClick={() => setRevising(true)}>
              Revise the quote
            </Button>
          </div>
        ) : null}
        {editing ? <QuoteForm labCase={labCase} onSent={() => setRevising(false)} /> : null}
      </div>
    </Card>
  );
}
