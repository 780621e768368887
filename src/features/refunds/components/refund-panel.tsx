import { useState } from 'react';
import { formatMoney } from '@shared/domain/money';
import { dollarsToCents, refundFormSchema, refundReasonLabels, refundReasons, toRefundInput, type LabCaseDto, type RefundFormValues } from '@shared/schemas/lab-work';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { useCan } from '@/lib/auth';
import { useIssueRefund } from '../api/issue-refund';

const reasonOptions = refundReasons.map((r) => ({ value: r, label: refundReasonLabels[r] }));

/** The lab manager's refunds on a paid case: what was paid, what went back, and a form for the rest or part of it. */
export function RefundPanel({ labCase }: { labCase: LabCaseDto }) {
  const can = useCan();
  const { payment } = labCase;
  const [open, setOpen] = useState(false);
  if (payment.state !== 'paid' || !can('refunds.issue')) return null;
  const paid = payment.amountMinor!;
  const currency = payment.currency!;
  const left = paid - payment.refundedMinor;
  return (
    <Card title="Refunds" description={`The customer paid ${formatMoney(paid, currency)}.`}>
      <div className="flex flex-col gap-4">
        <p className="text-sm text-ink">
          {payment.refundedMinor === 0
            ? 'Nothing has been refunded.'
            : `${formatMoney(payment.refundedMinor, currency)} refunded so far; ${formatMoney(left, currency)} is left.`}
        </p>
        {left > 0 && !open ? (
          <div>
            <Button variant="secondary" onClick={() => setOpen(true)}>
              Refund the customer
            </Button>
          </div>
        ) : null}
        {left > 0 && open ? <RefundForm labCase={labCase} leftMinor={left} currency={currency} onDone={() => setOpen(false)} /> : null}
      </div>
    </Card>
  );
}

function RefundForm({ labCase, leftMinor, currency, onDone }: { labCase: LabCaseDto; leftMinor: number; currency: string; onDone: () => void }) {
  const refund = useIssueRefund();
  // Kept while the form is open, so a second press of the button (or a retry) refunds once.
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const schema = refundFormSchema(leftMinor, currency);
  const defaults: RefundFormValues = { amount: (leftMinor / 100).toFixed(2), reason: '', note: '' };
  return (
    <Form
      schema={schema}
      defaultValues={defaults}
      aria-label="Refund"
      onSubmit={async (values) => {
        const done = await refund.mutateAsync({ id: labCase.id, values: toRefundInput(values), idempotencyKey });
        toast.success('Refund made', `${formatMoney(done.payment.refundedMinor, currency)} has gone back to the customer’s card in all; they have an e-mail.`);
        onDone();
      }}
    >
      {(form) => {
        const {
          register,
          watch,
          formState: { errors },
        } = form;
        const cents = dollarsToCents(watch('amount') ?? '');
        return (
          <>
            <Input label={`Amount (${currency})`} inputMode="decimal" error={errors.amount?.message} {...register('amount')} />
            <Select label="Reason" options={reasonOptions} placeholder="Choose a reason" error={errors.reason?.message} {...register('reason')} />
            <Textarea label="Note for the record" optional rows={2} error={errors.note?.message} {...register('note')} />
            <p className="text-sm text-ink-muted">The money goes back to the card the customer paid with. A refund cannot be taken back.</p>
            <div className="flex flex-wrap gap-2">
              <Button type="submit" isLoading={refund.isPending}>
                {cents !== null && cents > 0 ? `Refund ${formatMoney(cents, currency)}` : 'Refund'}
              </Button>
              <Button variant="ghost" onClick={onDone}>
                Cancel
              </Button>
            </div>
          </>
        );
      }}
    </Form>
  );
}
