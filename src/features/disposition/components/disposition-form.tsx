import { sanitizationLevelLabels, sanitizationLevels, sanitizationTechniqueLabels, sanitizationTechniques } from '@shared/domain/sanitization';
import {
  dispositionItemLabels,
  returnRecipients,
  verificationMethodLabels,
  verificationMethods,
  type CaseDispositionDto,
  type DispositionItem,
} from '@shared/schemas/disposition';
import { mediaTypeLabels, mediaTypes } from '@shared/vocabulary';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/checkbox';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { recordDispositionInput, useRecordDisposition } from '../api/record-disposition';
import { EquipmentHazards, SanitizationCheck } from './sanitization-guidance';

const recipientLabels = { shop: 'The shop that referred the case', customer: 'The customer directly' } as const;

type FieldErrors = Record<string, { message?: string } | Record<string, { message?: string }> | undefined>;
/** The discriminated union gives each branch its own error shape; the form reads them by name. */
const errorAt = (errors: FieldErrors, path: string): string | undefined => {
  const [head, tail] = path.split('.');
  const entry = errors[head!] as Record<string, unknown> | undefined;
  if (!entry) return undefined;
  if (!tail) return (entry as { message?: string }).message;
  return (entry[tail] as { message?: string } | undefined)?.message;
};

/** Returning or sanitizing the original media or a failed part, with the rules and the machine's hazards beside the step. */
export function DispositionForm({ record }: { record: CaseDispositionDto }) {
  const save = useRecordDisposition(record.referral.id);
  const items: DispositionItem[] = [...(record.acceptsOriginal ? (['original_media'] as const) : []), ...(record.acceptsFailedParts ? (['failed_part'] as const) : [])];
  if (items.length === 0) return null;

  return (
    <Form
      schema={recordDispositionInput}
      aria-label="Record what happened to the media"
      defaultValues={{
        outcome: 'sanitized',
        item: items[0],
        description: '',
        serialNumber: '',
        mediaType: record.referral.mediaType,
        level: 'purge',
        technique: undefined,
        selfEncrypting: false,
        driveCommand: false,
        techniqueDetails: '',
        tool: { name: '', version: '', serialNumber: '' },
        verification: { method: undefined, note: '' },
        destination: '',
        note: '',
        returnedTo: 'shop',
        trackingCode: '',
      } as never}
      onSubmit={async (values, form) => {
        const result = await save.mutateAsync(values);
        const last = result.dispositions.at(-1);
        toast.success(last?.certificate ? `Certificate ${last.certificate.number} issued` : 'Recorded');
        form.reset();
      }}
    >
      {({ register, watch, formState }) => {
        // The union's branches have different fields; the form addresses them by name.
        const field = register as unknown as (name: string) => ReturnType<typeof register>;
        const values = watch() as unknown as Record<string, unknown>;
        const errors = formState.errors as FieldErrors;
        const outcome = values.outcome;
        const level = values.level;
        const technique = values.technique;
        return (
          <div className="flex flex-col gap-5">
            <div className="grid gap-5 md:grid-cols-2">
              <ChoiceGroup
                type="radio"
                legend="Item"
                choices={items.map((item) => ({
                  value: item,
                  label: dispositionItemLabels[item],
                  hint: item === 'original_media' ? 'Recording it closes the case.' : 'Heads, a board, a RAID member: each recorded on its own.',
                }))}
                error={errorAt(errors, 'item')}
                {...register('item')}
              />
              <ChoiceGroup
                type="radio"
                legend="What happened to it"
                choices={[
                  { value: 'sanitized', label: 'Sanitized', hint: 'Cleared, purged or destroyed here; a certificate is issued.' },
                  { value: 'returned', label: 'Returned', hint: 'Sent back with the case.' },
                ]}
                error={errorAt(errors, 'outcome')}
                {...register('outcome')}
              />
            </div>
            <div className="grid gap-4 md:grid-cols-3">
              <Input label="Description" hint="Make, model, what it is" error={errorAt(errors, 'description')} {...register('description')} />
              <Input label="Serial number" optional error={errorAt(errors, 'serialNumber')} {...register('serialNumber')} />
              <Select
                label="Media type"
                hint="As Appendix A sorts it; a RAID member is its own drive type"
                options={mediaTypes.map((m) => ({ value: m, label: mediaTypeLabels[m] }))}
                error={errorAt(errors, 'mediaType')}
                {...register('mediaType')}
              />
            </div>

            {outcome === 'returned' ? (
              <div className="grid gap-4 md:grid-cols-2">
                <Select
                  label="Returned to"
                  options={returnRecipients.map((r) => ({ value: r, label: recipientLabels[r] }))}
                  error={errorAt(errors, 'returnedTo')}
                  {...field('returnedTo')}
                />
                <Input label="Tracking code" optional error={errorAt(errors, 'trackingCode')} {...field('trackingCode')} />
              </div>
            ) : (
              <>
                <div className="grid gap-4 md:grid-cols-2">
                  <Select
                    label="Level (NIST SP 800-88)"
                    options={sanitizationLevels.map((l) => ({ value: l, label: sanitizationLevelLabels[l] }))}
                    error={errorAt(errors, 'level')}
                    {...field('level')}
                  />
                  <Select
                    label="Technique"
                    placeholder="Choose the technique"
                    options={sanitizationTechniques.map((t) => ({ value: t, label: sanitizationTechniqueLabels[t] }))}
                    error={errorAt(errors, 'technique')}
                    {...field('technique')}
                  />
                </div>
                <div className="grid gap-3 md:grid-cols-2">
                  <Checkbox label="The device encrypts all stored data itself" hint="A self-encrypting drive or an encrypted phone; confirmed, not assumed." {...field('selfEncrypting')} />
                  <Checkbox label="Run as the drive’s own sanitize or secure-erase command" hint="Not written sector by sector from the host." {...field('driveCommand')} />
                </div>
                <SanitizationCheck
                  mediaType={values.mediaType}
                  level={level}
                  technique={technique}
                  selfEncrypting={values.selfEncrypting === true}
                  driveCommand={values.driveCommand === true}
                />
                <EquipmentHazards technique={technique} />
                <Input
                  label="Technique details"
                  optional
                  hint="Passes and pattern, the command, or the particle size"
                  error={errorAt(errors, 'techniqueDetails')}
                  {...field('techniqueDetails')}
                />
                <div className="grid gap-4 md:grid-cols-3">
                  <Input label="Tool or machine" hint="Make and model" error={errorAt(errors, 'tool.name')} {...field('tool.name')} />
                  <Input label="Tool version" optional error={errorAt(errors, 'tool.version')} {...field('tool.version')} />
                  <Input label="Tool serial number" optional error={errorAt(errors, 'tool.serialNumber')} {...field('tool.serialNumber')} />
                </div>
                <div className="grid gap-4 md:grid-cols-2">
                  <Select
                    label="Verification"
                    placeholder="Choose how the result was checked"
                    hint={level === 'destroy' ? 'Destroyed media is inspected, not read back.' : 'Read the media back, in full or by a representative sample.'}
                    options={verificationMethods.map((m) => ({ value: m, label: verificationMethodLabels[m] }))}
                    error={errorAt(errors, 'verification.method')}
                    {...field('verification.method')}
                  />
                  <Input label="Verification note" optional error={errorAt(errors, 'verification.note')} {...field('verification.note')} />
                </div>
                <Checkbox label="The verification passed" error={errorAt(errors, 'verified')} {...field('verified')} />
                <Input label="Where the media goes now" optional placeholder="e.g. Certified electronics recycler" error={errorAt(errors, 'destination')} {...field('destination')} />
              </>
            )}
            <Textarea label="Note" optional rows={2} error={errorAt(errors, 'note')} {...register('note')} />
            <div>
              <Button type="submit" isLoading={save.isPending}>
                {outcome === 'returned' ? 'Record the return' : 'Record the sanitization'}
              </Button>
            </div>
          </div>
        );
      }}
    </Form>
  );
}
