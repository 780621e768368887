import { useState } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { deviceInterfaces } from '@shared/schemas/referrals';
import {
  batteryConditions,
  batteryMediaTypes,
  mediaTypeLabels,
  mediaTypes,
  priorityCategories,
  priorityCategoryLabels,
  symptomLabels,
  symptoms,
  type BatteryCondition,
} from '@shared/vocabulary';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { formatFileSize } from '@/lib/format';
import { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL, photoContentTypes } from '../api/upload-photos';
import type { IntakeFormValues } from '../utils/intake';
import { interfaceLabels } from '../utils/labels';

// The sections of the counter form. Each reads the one form through context.

const blankToUndefined = (value: unknown) => (value === '' || value === null || value === undefined ? undefined : value);
const toNumber = (value: unknown) => (value === '' || value === null || value === undefined ? undefined : Number(value));


const batteryConditionLabels: Record<BatteryCondition, string> = {
  intact: 'Looks intact',
  swollen: 'Swollen or bulging',
  damaged: 'Damaged (dented, punctured, cracked)',
  leaking: 'Leaking, hot or smelling',
};

function useIntakeForm() {
  return useFormContext<IntakeFormValues>();
}

export function CustomerSection() {
  const { register, formState } = useIntakeForm();
  const errors = formState.errors;
  return (
    <Card title="Customer" description="Who gets updates about the case. The lab does not see these details.">
      <div className="grid gap-4 sm:grid-cols-2">
        <Input label="Customer’s name" autoComplete="off" error={errors.customer?.name?.message} {...register('customer.name')} />
        <Input label="Customer’s e-mail" type="email" autoComplete="off" error={errors.customer?.email?.message} {...register('customer.email')} />
        <Input label="Customer’s phone" type="tel" optional autoComplete="off" error={errors.customer?.phone?.message} {...register('customer.phone')} />
        <Input
          label="Your ticket number"
          optional
          hint="From your own system, so you can find the case by it."
          autoComplete="off"
          error={errors.externalRef?.message}
          {...register('externalRef')}
        />
      </div>
    </Card>
  );
}

export function DeviceSection() {
  const { register, formState, control } = useIntakeForm();
  const errors = formState.errors;
  const mediaType = useWatch({ control, name: 'device.mediaType' });
  return (
    <Card title="Device" description="What the customer brought in.">
      <div className="grid gap-4 sm:grid-cols-2">
        <Select
          label="Kind of device"
          placeholder="Choose the kind of device"
          options={mediaTypes.map((m) => ({ value: m, label: mediaTypeLabels[m] }))}
          error={errors.device?.mediaType ? 'Choose the kind of device' : undefined}
          {...register('device.mediaType')}
        />
        {mediaType === 'raid_nas' ? (
          <Input
            label="Drives in the array"
            type="number"
            inputMode="numeric"
            min={2}
            max={64}
            hint="Every member drive must come with it."
            error={errors.device?.memberCount?.message}
            {...register('device.memberCount', { setValueAs: toNumber, shouldUnregister: true })}
          />
        ) : null}
        <Input
          label="Capacity in GB"
          type="number"
          inputMode="decimal"
          min={0}
          optional
          hint="1 TB is 1,000 GB."
          error={errors.device?.capacityGb?.message}
          {...register('device.capacityGb', { setValueAs: toNumber })}
        />
        <Select
          label="Connection"
          optional
          placeholder="Not sure"
          options={deviceInterfaces.map((i) => ({ value: i, label: interfaceLabels[i] }))}
          error={errors.device?.interface?.message}
          {...register('device.interface', { setValueAs: blankToUndefined })}
        />
        <Input label="Make" optional autoComplete="off" error={errors.device?.make?.message} {...register('device.make')} />
        <Input label="Model" optional autoComplete="off" error={errors.device?.model?.message} {...register('device.model')} />
        <Input label="Serial number" optional autoComplete="off" error={errors.device?.serial?.message} {...register('device.serial')} />
      </div>
    </Card>
  );
}

export function SymptomsSection() {
  const { register, formState } = useIntakeForm();
  const errors = formState.errors;
  return (
    <Card title="What happened" description="The cautions beside the form change with your answers.">
      <div className="flex flex-col gap-5">
        <ChoiceGroup
          type="checkbox"
          legend="What is wrong with it?"
          hint="Tick everything the customer or you noticed. Leave all unticked if you are not sure."
          columns={3}
          choices={symptoms.map((s) => ({ value: s, label: symptomLabels[s] }))}
          error={errors.symptoms?.message ?? errors.symptoms?.root?.message}
          {...register('symptoms')}
        />
        <Textarea
          label="In the customer’s words"
          optional
          hint="When it started, what was tried already, anything the lab should know."
          error={errors.description?.message}
          {...register('description')}
        />
      </div>
    </Card>
  );
}

/** Asked for phones, tablets and other devices, which usually carry a lithium battery. */
export function BatterySection() {
  const { register, formState, control } = useIntakeForm();
  const errors = formState.errors;
  const mediaType = useWatch({ control, name: 'device.mediaType' });
  const installed = useWatch({ control, name: 'battery.installed' });
  if (!mediaType || !(batteryMediaTypes as readonly string[]).includes(mediaType)) return null;
  return (
    <Card title="Battery" description="Lithium batteries decide how the box may travel.">
      <div className="flex flex-col gap-4">
        <ChoiceGroup
          type="radio"
          legend="Is a battery installed?"
          choices={[
            { value: 'yes', label: 'Yes' },
            { value: 'no', label: 'No, or it has been removed' },
          ]}
          error={errors.battery?.installed?.message}
          {...register('battery.installed', { shouldUnregister: true })}
        />
        {installed === 'yes' ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <Select
              label="Battery condition"
              placeholder="Choose its condition"
              className="sm:col-span-2"
              hint="Look at it without charging or switching the device on."
              options={batteryConditions.map((c) => ({ value: c, label: batteryConditionLabels[c] }))}
              error={errors.battery?.condition?.message}
              {...register('battery.condition', { setValueAs: blankToUndefined, shouldUnregister: true })}
            />
            <Input
              label="Rating in watt-hours (Wh)"
              type="number"
              inputMode="decimal"
              step="any"
              optional
              className="sm:col-span-2"
              hint="Printed on the battery or the device label. If only volts and mAh are printed, give those instead."
              error={errors.battery?.wattHours?.message}
              {...register('battery.wattHours', { setValueAs: toNumber, shouldUnregister: true })}
            />
            <Input
              label="Volts (V)"
              type="number"
              inputMode="decimal"
              step="any"
              optional
              error={errors.battery?.volts?.message}
              {...register('battery.volts', { setValueAs: toNumber, shouldUnregister: true })}
            />
            <Input
              label="Capacity (mAh)"
              type="number"
              inputMode="decimal"
              step="any"
              optional
              error={errors.battery?.milliampHours?.message}
              {...register('battery.milliampHours', { setValueAs: toNumber, shouldUnregister: true })}
            />
          </div>
        ) : null}
      </div>
    </Card>
  );
}

export function PrioritiesSection() {
  const { register, formState, control } = useIntakeForm();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'priorities' });
  const [adding, setAdding] = useState('');
  const chosen = new Set(fields.map((f) => f.category));
  const left = priorityCategories.filter((c) => !chosen.has(c));
  const errors = formState.errors.priorities;

  return (
    <Card title="Files that matter most" description="In order of importance. The lab checks these first when it recovers the data.">
      <div className="flex flex-col gap-4">
        {fields.length > 0 ? (
          <ol className="flex flex-col gap-3" aria-label="Files that matter most, most important first">
            {fields.map((field, index) => {
              const label = priorityCategoryLabels[field.category];
              return (
                <li key={field.id} className="rounded-control border border-ink-hairline bg-paper px-3 py-3">
                  <div className="flex flex-wrap items-end gap-3">
                    <p className="flex items-center gap-2 self-center text-sm font-semibold text-ink-strong">
                      <span aria-hidden="true" className="flex size-6 items-center justify-center rounded-full bg-spruce-100 text-xs text-spruce-800">
                        {index + 1}
                      </span>
                      <span>
                        <span className="sr-only">{`Priority ${index + 1}: `}</span>
                        {label}
                      </span>
                    </p>
                    <Input
                      label={`Note for ${label.toLowerCase()}`}
                      optional
                      className="min-w-48 flex-1"
                      placeholder="e.g. 2019–2023 family photos"
                      error={errors?.[index]?.note?.message ?? errors?.[index]?.category?.message}
                      {...register(`priorities.${index}.note` as const)}
                    />
                    <div className="flex gap-1.5">
                      <Button size="sm" variant="secondary" disabled={index === 0} onClick={() => move(index, index - 1)} aria-label={`Move ${label} up`}>
                        Up
                      </Button>
                      <Button
                        size="sm"
                        variant="secondary"
                        disabled={index === fields.length - 1}
                        onClick={() => move(index, index + 1)}
                        aria-label={`Move ${label} down`}
                      >
                        Down
                      </Button>
                      <Button size="sm" variant="ghost" onClick={() => remove(index)} aria-label={`Remove ${label}`}>
                        Remove
                      </Button>
                    </div>
                  </div>
                </li>
              );
            })}
          </ol>
        ) : (
          <p className="text-sm text-ink-muted">None chosen yet. Without priorities the lab recovers everything it can in its usual order.</p>
        )}
        {left.length > 0 ? (
          <div className="flex flex-wrap items-end gap-3">
            <Select
              label={fields.length ? 'Add the next kind of file' : 'Add the most important kind of file'}
              optional
              className="min-w-56"
              placeholder="Choose a kind of file"
              value={adding}
              onChange={(event) => setAdding(event.target.value)}
              options={left.map((c) => ({ value: c, label: priorityCategoryLabels[c] }))}
            />
            <Button
              variant="secondary"
              disabled={!adding}
              onClick={() => {
                append({ category: adding as (typeof priorityCategories)[number], note: '' });
                setAdding('');
              }}
            >
              Add to the list
            </Button>
          </div>
        ) : null}
      </div>
    </Card>
  );
}

export function SensitivitySection() {
  const { register, formState } = useIntakeForm();
  return (
    <Card title="Sensitive data" description="Some data may only go to labs with the right agreements.">
      <ChoiceGroup
        type="checkbox"
        legend="Does the device hold any of these?"
        optional
        hint="Leave all unticked if none applies."
        choices={[
          { value: 'health_records', label: 'Health records', hint: 'Only labs that signed the network’s health-data agreement are offered the case.' },
          { value: 'legal_evidence', label: 'Legal evidence', hint: 'Needs a lab that keeps a forensic chain of custody.' },
          { value: 'financial', label: 'Financial records' },
        ]}
        error={formState.errors.sensitivity?.message}
        {...register('sensitivity')}
      />
    </Card>
  );
}

export function OriginSection({ shopName }: { shopName: string }) {
  const { register, formState, control } = useIntakeForm();
  const errors = formState.errors;
  const shipsFrom = useWatch({ control, name: 'shipsFrom' });
  return (
    <Card title="Ships from" description="Distance to each lab is measured from here.">
      <div className="flex flex-col gap-4">
        <ChoiceGroup
          type="radio"
          legend="Where will the box be collected?"
          choices={[
            { value: 'shop', label: `Our shop (${shopName})` },
            { value: 'elsewhere', label: 'Another address' },
          ]}
          {...register('shipsFrom')}
        />
        {shipsFrom === 'elsewhere' ? (
          <div className="grid gap-4 sm:grid-cols-2">
            <Input label="Street address" optional className="sm:col-span-2" error={errors.origin?.line1?.message} {...register('origin.line1')} />
            <Input label="City" optional error={errors.origin?.city?.message} {...register('origin.city')} />
            <Input label="State" optional hint="Two letters, like AZ." error={errors.origin?.region?.message} {...register('origin.region')} />
            <Input label="ZIP code" inputMode="numeric" autoComplete="postal-code" error={errors.origin?.postalCode?.message} {...register('origin.postalCode')} />
          </div>
        ) : null}
      </div>
    </Card>
  );
}

export function PhotosField({ files, onChange, problems }: { files: File[]; onChange: (files: File[]) => void; problems: string[] }) {
  return (
    <Card title="Photos" description="Optional: the drive’s label, any damage, the state it arrived in.">
      <div className="flex flex-col gap-3">
        <Input
          label="Photos of the device"
          optional
          type="file"
          multiple
          accept={photoContentTypes.join(',')}
          hint={`Up to ${PHOTOS_PER_REFERRAL} photos, ${formatFileSize(PHOTO_MAX_BYTES)} each. They upload when the referral is opened.`}
          error={problems.length ? problems.join(' ') : undefined}
          className="[&_input]:h-auto [&_input]:py-2"
          onChange={(event) => onChange(Array.from(event.target.files ?? []))}
        />
        {files.length > 0 ? (
          <ul className="text-sm text-ink-muted" aria-label="Photos chosen">
            {files.map((file) => (
              <li key={file.name + file.size}>
                {file.name} · {formatFileSize(file.size)}
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    </Card>
  );
}
