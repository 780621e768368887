import { z } from 'zod';
import type { LabCaseDto } from '@shared/schemas/lab-work';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { toast } from '@/components/ui/toast';
import { imagingReportInput, useReportImaging } from '../api/report-imaging';

// The technician types what the imager shows, in the units it shows them: gigabytes read (SI) and
// megabytes per second. The lab's own tooling posts bytes directly with the lab's key.

const number = (message: string) =>
  z
    .string()
    .trim()
    .min(1, message)
    .refine((v) => Number.isFinite(Number(v)) && Number(v) >= 0, 'Enter a number of 0 or more')
    .transform(Number);

const formSchema = z.object({
  gbRead: number('Enter how much has been read'),
  unreadableSectors: number('Enter the unreadable sectors (0 if none)').refine(Number.isInteger, 'Whole sectors'),
  rateMbPerSec: number('Enter the current read rate'),
  sectorSizeBytes: z.enum(['512', '4096']).transform(Number),
});

export function ImagingReportForm({ labCase }: { labCase: LabCaseDto }) {
  const report = useReportImaging();
  const previous = labCase.imaging;
  return (
    <Form
      schema={formSchema}
      aria-label="Report imaging progress"
      defaultValues={{
        gbRead: previous ? String(previous.bytesRead / 1e9) : '0',
        unreadableSectors: previous ? String(previous.unreadableSectors) : '0',
        rateMbPerSec: previous ? String(previous.rateBytesPerSec / 1e6) : '',
        sectorSizeBytes: '512',
      }}
      onSubmit={async (values, form) => {
        const body = imagingReportInput.safeParse({
          bytesRead: Math.round(values.gbRead * 1e9),
          unreadableSectors: values.unreadableSectors,
          rateBytesPerSec: values.rateMbPerSec * 1e6,
          sectorSizeBytes: values.sectorSizeBytes,
        });
        if (!body.success) {
          form.setError('gbRead', { message: body.error.issues[0]?.message ?? 'Check the numbers' });
          return;
        }
        await report.mutateAsync({ id: labCase.id, values: body.data });
        toast.success('Progress reported');
      }}
    >
      {({ register, formState: { errors } }) => (
        <>
          <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
            <Input label="Read so far (GB)" inputMode="decimal" error={errors.gbRead?.message} {...register('gbRead')} />
            <Input label="Unreadable sectors" inputMode="numeric" error={errors.unreadableSectors?.message} {...register('unreadableSectors')} />
            <Input label="Current rate (MB/s)" inputMode="decimal" hint="0 while paused" error={errors.rateMbPerSec?.message} {...register('rateMbPerSec')} />
            <Select label="Sector size" options={[{ value: '512', label: '512 bytes' }, { value: '4096', label: '4096 bytes' }]} {...register('sectorSizeBytes')} />
          </div>
          <div>
            <Button type="submit" isLoading={report.isPending}>
              Report progress
            </Button>
          </div>
        </>
      )}
    </Form>
  );
}
