import type { LabCaseDto } from '@shared/schemas/lab-work';
import {
  evaluationPartLabels,
  evaluationParts,
  partConditionLabels,
  partConditions,
  recoverabilityHints,
  recoverabilityLabels,
  recoverabilityLevels,
  type EvaluationPart,
  type PartCondition,
} from '@shared/schemas/lab-work';
import type { MediaType } from '@shared/vocabulary';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { evaluationInput, useRecordEvaluation } from '../api/record-evaluation';

/** Parts that a kind of device has; the others start as "not on this device". */
const partsOf: Record<MediaType, readonly EvaluationPart[]> = {
  hdd_3_5: ['heads', 'electronics', 'firmware', 'surface'],
  hdd_2_5: ['heads', 'electronics', 'firmware', 'surface'],
  raid_nas: ['heads', 'electronics', 'firmware', 'surface', 'controller'],
  ssd_sata: ['electronics', 'firmware', 'controller', 'memory_chips'],
  ssd_m2_nvme: ['electronics', 'firmware', 'controller', 'memory_chips'],
  usb_flash: ['electronics', 'controller', 'memory_chips'],
  memory_card: ['controller', 'memory_chips'],
  phone: ['board', 'memory_chips', 'firmware'],
  tablet: ['board', 'memory_chips', 'firmware'],
  tape: ['heads', 'surface', 'electronics'],
  other: evaluationParts,
};

function defaultsFor(labCase: LabCaseDto) {
  const present = partsOf[labCase.device.mediaType];
  const recorded = new Map(labCase.evaluation?.findings.map((f) => [f.part, f]));
  return {
    findings: evaluationParts.map((part) => {
      const f = recorded.get(part);
      const condition: PartCondition = f?.condition ?? (present.includes(part) ? 'not_checked' : 'not_applicable');
      return { part, condition, note: f?.note ?? '' };
    }),
    recoverability: labCase.evaluation?.recoverability,
    plan: labCase.evaluation?.plan ?? '',
  };
}

const conditionOptions = partConditions.map((c) => ({ value: c, label: partConditionLabels[c] }));

/** Findings per part, how much can come back, and the plan. "None" ends the case with no charge. */
export function EvaluationForm({ labCase, onRecorded }: { labCase: LabCaseDto; onRecorded?: () => void }) {
  const record = useRecordEvaluation();
  return (
    <Form
      schema={evaluationInput}
      defaultValues={defaultsFor(labCase) as never}
      aria-label="Evaluation"
      onSubmit={async (values) => {
        const saved = await record.mutateAsync({ id: labCase.id, values });
        toast.success(saved.status === 'no_recovery' ? 'Recorded: no recovery possible' : 'Evaluation recorded');
        onRecorded?.();
      }}
    >
      {({ register, watch, formState: { errors } }) => (
        <>
          <fieldset className="flex flex-col gap-3">
            <legend className="text-sm font-semibold text-ink-strong">Findings per part</legend>
            {errors.findings?.root?.message || errors.findings?.message ? (
              <p className="text-sm text-brick-text">{errors.findings?.root?.message ?? errors.findings?.message}</p>
            ) : null}
            {evaluationParts.map((part, i) => (
              <div key={part} className="grid gap-3 sm:grid-cols-[13rem_minmax(0,1fr)] sm:items-start">
                <input type="hidden" {...register(`findings.${i}.part` as const)} />
                <Select label={evaluationPartLabels[part]} options={conditionOptions} error={errors.findings?.[i]?.condition?.message} {...register(`findings.${i}.condition` as const)} />
                <Input
                  label="Note"
                  aria-label={`Note on ${evaluationPartLabels[part].toLowerCase()}`}
                  optional
                  placeholder={watch(`findings.${i}.condition` as const) === 'failed' ? 'What failed' : ''}
                  error={errors.findings?.[i]?.note?.message}
                  {...register(`findings.${i}.note` as const)}
                />
              </div>
            ))}
          </fieldset>
          <ChoiceGroup
            type="radio"
            legend="How much data can come back?"
            choices={recoverabilityLevels.map((level) => ({ value: level, label: recoverabilityLabels[level], hint: recoverabilityHints[level] }))}
            columns={2}
            error={errors.recoverability?.message}
            {...register('recoverability')}
          />
          {watch('recoverability') === 'none' ? (
            <p className="rounded-control border border-brick-line bg-brick-bg px-3 py-2 text-sm text-brick-text">
              “None” closes the case as no recovery possible: the customer pays nothing, nothing is owed to anyone, and the device goes back to the shop.
            </p>
          ) : null}
          <Textarea label="Plan" hint="What you will do, in words the customer can follow (or, for no recovery, why not)." rows={4} error={errors.plan?.message} {...register('plan')} />
          <div>
            <Button type="submit" isLoading={record.isPending}>
              Record the evaluation
            </Button>
          </div>
        </>
      )}
    </Form>
  );
}
