import { useState } from 'react';
import { formatMoney } from '@shared/domain/money';
import type { CustomerCaseDto } from '@shared/schemas/customer';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/checkbox';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { approveQuoteInput, useApproveQuote } from '../api/approve-quote';
import { declineQuoteInput, useDeclineQuote } from '../api/decline-quote';

type Quote = NonNullable<CustomerCaseDto['quote']>;

/** The terms the customer agrees to by approving; stored with the approval under their version. */
export function QuoteTerms({ labName }: { labName: string }) {
  return (
    <div className="rounded-control border border-ink-hairline bg-paper px-4 py-3 text-sm text-ink">
      <p className="font-semibold text-ink-strong">What you agree to</p>
      <ul className="mt-1 list-disc pl-5">
        <li>{labName} carries out the plan above for the total shown; nothing is added to it.</li>
        <li>Recovery is an attempt, not a promise. Before the data ships back you can check the list of recovered files and tell the lab if something that matters is missing.</li>
        <li>Your data is handled under the privacy terms you accepted with your repair shop, and the new media is sent to the address you give here.</li>
      </ul>
    </div>
  );
}

export function ApproveQuote({ token, quote, labName }: { token: string; quote: Quote; labName: string }) {
  const approve = useApproveQuote(token);
  return (
    <Form
      schema={approveQuoteInput}
      defaultValues={{ quoteId: quote.id, fullName: '', acceptTerms: false as never }}
      aria-label="Approve the quote"
      onSubmit={async (values) => {
        await approve.mutateAsync(values);
        toast.success('Quote approved', 'Next: pay securely to start the recovery.');
      }}
    >
      {({ register, formState: { errors } }) => (
        <>
          <QuoteTerms labName={labName} />
          <input type="hidden" {...register('quoteId')} />
          <Input label="Your full name" autoComplete="name" hint="Typing your name signs the approval." error={errors.fullName?.message} {...register('fullName')} />
          <Checkbox label="I have read the quote and agree to the terms above" error={errors.acceptTerms?.message} {...register('acceptTerms')} />
          <div>
            <Button type="submit" isLoading={approve.isPending}>
              Approve the quote of {formatMoney(quote.totalMinor, quote.currency)}
            </Button>
          </div>
        </>
      )}
    </Form>
  );
}

export function DeclineQuote({ token, quote }: { token: string; quote: Quote }) {
  const [open, setOpen] = useState(false);
  const decline = useDeclineQuote(token);
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Decline the quote
      </Button>
      <Dialog open={open} onClose={() => setOpen(false)} title="Decline the quote?" description="Nothing is charged. Your repair shop arranges the return of your device.">
        <Form
          schema={declineQuoteInput}
          defaultValues={{ quoteId: quote.id, reason: '' }}
          aria-label="Decline the quote"
          onSubmit={async (values) => {
            await decline.mutateAsync(values);
            setOpen(false);
            toast.info('Quote declined');
          }}
        >
          {({ register, formState: { errors } }) => (
            <>
              <input type="hidden" {...register('quoteId')} />
              <Textarea label="Why (it helps the lab)" optional rows={3} error={errors.reason?.message} {...register('reason')} />
              <div className="flex justify-end gap-2">
                <Button variant="secondary" onClick={() => setOpen(false)}>
                  Keep the quote
                </Button>
                <Button type="submit" variant="danger" isLoading={decline.isPending}>
                  Decline
                </Button>
              </div>
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
