import { useState } from 'react';
import type { AttentionItemDto } from '@shared/schemas/labs';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Dialog } from '@/components/ui/dialog';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { formatBusinessDays, formatMiles } from '@/lib/format';
import { assignLabInput, useAssignLab } from '../api/assign-lab';

/** The network admin picks the lab by hand: the ranked labs first, then those routing left out, with why. */
export function AssignLabDialog({ item }: { item: AttentionItemDto }) {
  const [open, setOpen] = useState(false);
  const assign = useAssignLab();
  const formId = `assign-${item.referral.id}`;
  const { candidates, excluded } = item.ranking;
  const choices = [
    ...candidates.map((c, index) => ({
      value: c.labId,
      label: `${index + 1}. ${c.labName}`,
      hint: `About ${formatBusinessDays(c.estimatedDays)} until data · ${formatMiles(c.distanceKm)}`,
    })),
    ...excluded.map((e) => ({ value: e.labId, label: e.labName, hint: `Left out: ${e.reasons.map((r) => r.message).join(' ')}` })),
  ];

  return (
    <>
      <Button size="sm" className="whitespace-nowrap" onClick={() => setOpen(true)} aria-label={`Assign a lab to ${item.referral.reference}`}>
        Assign a lab
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Assign a lab to ${item.referral.reference}`}
        description="The lab is offered the case with a fresh deadline. Labs routing left out can still be chosen when you know better; the note goes on the case’s timeline."
        className="w-[min(40rem,calc(100vw-2rem))]"
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" form={formId} isLoading={assign.isPending}>
              Offer the case
            </Button>
          </>
        }
      >
        <Form
          id={formId}
          schema={assignLabInput}
          defaultValues={{ labId: candidates[0]?.labId ?? '', note: '' }}
          aria-label={`Assign a lab to ${item.referral.reference}`}
          onSubmit={async (values) => {
            const referral = await assign.mutateAsync({ referralId: item.referral.id, input: { labId: values.labId, note: values.note || undefined } });
            setOpen(false);
            toast.success(`${referral.reference} offered`, referral.offer ? `Offered to ${referral.offer.labName}.` : undefined);
          }}
        >
          {({ register, formState }) => (
            <>
              <ChoiceGroup type="radio" legend="Lab" choices={choices} error={formState.errors.labId?.message} {...register('labId')} />
              <Textarea label="Note for the timeline" optional rows={3} error={formState.errors.note?.message} {...register('note')} />
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
