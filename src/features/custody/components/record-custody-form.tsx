import { manualCustodyActions } from '@shared/schemas/custody';
import { custodyActionLabels } from '@shared/domain/custody-chain';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { toast } from '@/components/ui/toast';
import { appendCustodyInput, useRecordCustody } from '../api/record-custody';

/** For the lab's people: a handling step inside the lab that no system records by itself. */
export function RecordCustodyForm({ caseId }: { caseId: string }) {
  const record = useRecordCustody(caseId);
  return (
    <Form
      schema={appendCustodyInput}
      defaultValues={{ action: 'to_clean_bench', location: '', note: '' }}
      aria-label="Record a handling step"
      className="gap-3"
      onSubmit={async (values, form) => {
        await record.mutateAsync(values);
        form.reset({ action: values.action, location: '', note: '' });
        toast.success('Added to the custody log');
      }}
    >
      {({ register, formState }) => (
        <div className="grid gap-3 sm:grid-cols-[12rem_1fr_1fr_auto] sm:items-end">
          <Select label="Step" options={manualCustodyActions.map((a) => ({ value: a, label: custodyActionLabels[a] }))} error={formState.errors.action?.message} {...register('action')} />
          <Input label="Where" placeholder="e.g. Clean bench 2" error={formState.errors.location?.message} {...register('location')} />
          <Input label="Note" optional error={formState.errors.note?.message} {...register('note')} />
          <Button type="submit" variant="secondary" isLoading={record.isPending}>
            Add to the log
          </Button>
        </div>
      )}
    </Form>
  );
}
