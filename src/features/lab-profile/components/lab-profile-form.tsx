import { useState } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { networkTimeZones, type LabProfileDto } from '@shared/schemas/labs';
import { labSkillLabels, labSkills, mediaTypeLabels, mediaTypes, type LabSkill } from '@shared/vocabulary';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { toast } from '@/components/ui/toast';
import { formatDate } from '@/lib/format';
import { useUpdateLabProfile } from '../api/update-lab-profile';
import { formValuesFrom, profileFormSchema, type LabProfileFormValues } from '../utils/profile-form';

const toNumber = (value: unknown) => (value === '' || value === null || value === undefined ? undefined : Number(value));

const weekdays = [
  { value: '1', label: 'Monday' },
  { value: '2', label: 'Tuesday' },
  { value: '3', label: 'Wednesday' },
  { value: '4', label: 'Thursday' },
  { value: '5', label: 'Friday' },
  { value: '6', label: 'Saturday' },
  { value: '7', label: 'Sunday' },
];

function useProfileForm() {
  return useFormContext<LabProfileFormValues>();
}

function SkillsSection() {
  const { control, register, formState } = useProfileForm();
  const { fields, append, remove } = useFieldArray({ control, name: 'skills' });
  const [adding, setAdding] = useState('');
  const offered = new Set(fields.map((f) => f.skill));
  const left = labSkills.filter((s) => !offered.has(s));
  const errors = formState.errors.skills;
  const listError = errors?.message ?? errors?.root?.message;

  return (
    <Card title="Skills and turnaround" description="Routing offers your lab only cases whose every skill is here. Turnaround is your typical business days from arrival to data ready.">
      <div className="flex flex-col gap-4">
        {listError ? (
          <Alert tone="danger" live="assertive">
            {listError}
          </Alert>
        ) : null}
        <ul className="flex flex-col gap-3" aria-label="Skills your lab offers">
          {fields.map((field, index) => (
            <li key={field.id} className="flex flex-wrap items-end gap-3 rounded-control border border-ink-hairline bg-paper px-3 py-3">
              <p className="min-w-56 flex-1 self-center text-sm font-semibold text-ink-strong">{labSkillLabels[field.skill]}</p>
              <Input
                label={
                  <>
                    <span className="sr-only">{labSkillLabels[field.skill]}: </span>Turnaround in business days
                  </>
                }
                type="number"
                inputMode="decimal"
                step="any"
                min={0}
                className="w-56"
                error={errors?.[index]?.turnaroundDays?.message ?? errors?.[index]?.skill?.message}
                {...register(`skills.${index}.turnaroundDays` as const, { setValueAs: toNumber })}
              />
              <Button size="sm" variant="ghost" onClick={() => remove(index)} aria-label={`Stop offering ${labSkillLabels[field.skill]}`}>
                Remove
              </Button>
            </li>
          ))}
        </ul>
        {left.length > 0 ? (
          <div className="flex flex-wrap items-end gap-3">
            <Select
              label="Add a skill"
              optional
              className="min-w-72"
              placeholder="Choose a skill"
              value={adding}
              onChange={(event) => setAdding(event.target.value)}
              options={left.map((s) => ({ value: s, label: labSkillLabels[s] }))}
            />
            <Button
              variant="secondary"
              disabled={!adding}
              onClick={() => {
                append({ skill: adding as LabSkill, turnaroundDays: undefined });
                setAdding('');
              }}
            >
              Add skill
            </Button>
          </div>
        ) : null}
      </div>
    </Card>
  );
}

function AutoAcceptSection() {
  const { control, register, formState } = useProfileForm();
  const { fields, append, remove } = useFieldArray({ control, name: 'autoAcceptRules' });
  const offered = useWatch({ control, name: 'skills' }) ?? [];
  const errors = formState.errors.autoAcceptRules;
  const choices = offered.filter((s) => s?.skill).map((s) => ({ value: s.skill, label: labSkillLabels[s.skill] }));

  return (
    <Card
      title="Accepting by rule"
      description="An offer is accepted without anyone answering it when every skill the case needs is ticked in a rule and the shop is within its distance."
    >
      <div className="flex flex-col gap-4">
        {fields.length === 0 ? <p className="text-sm text-ink-muted">No rules: a person answers every offer.</p> : null}
        {fields.map((field, index) => (
          <div key={field.id} className="flex flex-col gap-3 rounded-control border border-ink-hairline bg-paper px-3 py-3">
            <ChoiceGroup
              type="checkbox"
              legend={`Rule ${index + 1}: accept cases that need only`}
              columns={2}
              choices={choices}
              error={errors?.[index]?.skills?.message ?? errors?.[index]?.skills?.root?.message ?? errors?.[index]?.skills?.find?.((e) => e?.message)?.message}
              {...register(`autoAcceptRules.${index}.skills` as const)}
            />
            <div className="flex flex-wrap items-end gap-3">
              <Input
                label="From shops at most this far, in km"
                type="number"
                inputMode="decimal"
                min={0}
                className="w-64"
                error={errors?.[index]?.maxDistanceKm?.message}
                {...register(`autoAcceptRules.${index}.maxDistanceKm` as const, { setValueAs: toNumber })}
              />
              <Button size="sm" variant="ghost" onClick={() => remove(index)}>
                Remove rule {index + 1}
              </Button>
            </div>
          </div>
        ))}
        <div>
          <Button variant="secondary" onClick={() => append({ skills: [], maxDistanceKm: undefined })} disabled={choices.length === 0}>
            Add a rule
          </Button>
        </div>
      </div>
    </Card>
  );
}

/** The whole lab profile; saving replaces it (PUT), as the API expects. */
export function LabProfileForm({ profile }: { profile: LabProfileDto }) {
  const update = useUpdateLabProfile();
  // A lab elsewhere keeps its own zone among the choices.
  const zones = networkTimeZones.includes(profile.timeZone as (typeof networkTimeZones)[number]) ? networkTimeZones : [profile.timeZone, ...networkTimeZones];

  return (
    <Form
      schema={profileFormSchema}
      defaultValues={formValuesFrom(profile)}
      aria-label="Lab profile"
      onSubmit={async (values) => {
        await update.mutateAsync(values);
        toast.success('Lab profile saved', 'Routing uses it for the next case.');
      }}
    >
      {({ register, formState }) => {
        const errors = formState.errors;
        return (
          <>
            <Card title="Taking cases">
              <div className="flex flex-col gap-3">
                <Checkbox
                  label="Take new cases"
                  hint="Untick to pause: routing leaves your lab out until you tick it again. Cases you hold are not affected."
                  {...register('acceptingNewCases')}
                />
                <p className="text-sm text-ink-muted">
                  You hold {profile.openCases} open {profile.openCases === 1 ? 'case' : 'cases'} now.
                </p>
              </div>
            </Card>
            <SkillsSection />
            <Card title="Media you take">
              <ChoiceGroup
                type="checkbox"
                legend="Kinds of device"
                columns={3}
                choices={mediaTypes.map((m) => ({ value: m, label: mediaTypeLabels[m] }))}
                error={errors.mediaTypes?.message ?? errors.mediaTypes?.root?.message}
                {...register('mediaTypes')}
              />
            </Card>
            <Card title="Capacity" description="Queue days in the ranking are your open cases divided by what you finish in a week.">
              <div className="grid gap-4 sm:grid-cols-2">
                <Input
                  label="Cases finished in a typical week"
                  type="number"
                  inputMode="decimal"
                  step="any"
                  min={0}
                  error={errors.weeklyThroughput?.message}
                  {...register('weeklyThroughput', { setValueAs: toNumber })}
                />
                <Input
                  label="Most cases you hold at once"
                  type="number"
                  inputMode="numeric"
                  min={0}
                  hint="When the queue is this full, routing leaves you out."
                  error={errors.queueCapacity?.message}
                  {...register('queueCapacity', { setValueAs: toNumber })}
                />
              </div>
            </Card>
            <Card title="Address and hours" description="Distances are measured from the ZIP code; answer deadlines count your working hours, in your time zone, without public holidays.">
              <div className="grid gap-4 sm:grid-cols-2">
                <Input label="Street address" optional className="sm:col-span-2" error={errors.address?.line1?.message} {...register('address.line1')} />
                <Input label="City" optional error={errors.address?.city?.message} {...register('address.city')} />
                <Input label="State" optional error={errors.address?.region?.message} {...register('address.region')} />
                <Input label="ZIP code" inputMode="numeric" error={errors.address?.postalCode?.message} {...register('address.postalCode')} />
                <Select label="Time zone" options={zones.map((z) => ({ value: z, label: z.replace(/_/g, ' ') }))} error={errors.timeZone?.message} {...register('timeZone')} />
                <Input label="Opens at" type="time" error={errors.businessHours?.opensAt?.message} {...register('businessHours.opensAt')} />
                <Input label="Closes at" type="time" error={errors.businessHours?.closesAt?.message} {...register('businessHours.closesAt')} />
                <ChoiceGroup
                  type="checkbox"
                  legend="Working days"
                  columns={3}
                  className="sm:col-span-2"
                  choices={weekdays}
                  error={errors.businessHours?.workdays?.message ?? errors.businessHours?.workdays?.root?.message}
                  {...register('businessHours.workdays')}
                />
                <Input
                  label="State for public holidays"
                  optional
                  hint="Two letters, like AZ; leave empty for national holidays only."
                  error={errors.businessHours?.holidayRegion?.message}
                  {...register('businessHours.holidayRegion')}
                />
              </div>
            </Card>
            <Card title="Health-data agreement">
              <Checkbox
                label="Our lab has signed the network’s health-data agreement"
                hint={
                  profile.healthDataAgreement.signedAt
                    ? `Recorded as signed on ${formatDate(profile.healthDataAgreement.signedAt)}. Cases with health records are offered to your lab.`
                    : 'Cases with health records go only to labs that have signed it.'
                }
                {...register('healthDataAgreement.signed')}
              />
            </Card>
            <AutoAcceptSection />
            <div className="flex flex-wrap items-center gap-3">
              <Button type="submit" size="lg" isLoading={formState.isSubmitting}>
                Save lab profile
              </Button>
              {profile.updatedAt ? <p className="text-sm text-ink-muted">Last saved {formatDate(profile.updatedAt)}.</p> : null}
            </div>
          </>
        );
      }}
    </Form>
  );
}
