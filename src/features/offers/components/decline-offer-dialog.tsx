import { useState } from 'react';
import type { LabOfferDto } from '@shared/schemas/labs';
import { declineReasonLabels, declineReasons } from '@shared/schemas/referrals';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { declineOfferInput, useDeclineOffer } from '../api/decline-offer';

const FORM_ID = 'decline-offer-form';

export function DeclineOfferDialog({ offer }: { offer: LabOfferDto }) {
  const [open, setOpen] = useState(false);
  const decline = useDeclineOffer();
  return (
    <>
      <Button variant="secondary" size="lg" onClick={() => setOpen(true)}>
        Decline
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Decline ${offer.case.reference}?`}
        description="The next lab in the ranking is offered the case at once. Your reason helps the network route similar cases."
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Keep the offer
            </Button>
            <Button type="submit" form={FORM_ID} variant="danger" isLoading={decline.isPending}>
              Decline the case
            </Button>
          </>
        }
      >
        <Form
          id={FORM_ID}
          schema={declineOfferInput}
          defaultValues={{ note: '' }}
          aria-label="Why you decline"
          onSubmit={async (values) => {
            await decline.mutateAsync({ id: offer.id, input: { ...values, note: values.note || undefined } });
            setOpen(false);
            toast.success(`${offer.case.reference} declined`, 'The network offers it to the next lab.');
          }}
        >
          {({ register, formState }) => (
            <>
              <Select
                label="Reason"
                placeholder="Choose a reason"
                options={declineReasons.map((reason) => ({ value: reason, label: declineReasonLabels[reason] }))}
                error={formState.errors.reason?.message}
                {...register('reason')}
              />
              <Textarea
                label="Note for the network"
                optional
                hint="Needed when the reason is “Other”."
                rows={3}
                error={formState.errors.note?.message}
                {...register('note')}
              />
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
