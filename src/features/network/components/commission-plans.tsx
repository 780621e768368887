import { useState } from 'react';
import { useFieldArray } from 'react-hook-form';
import { formatBasisPoints } from '@shared/domain/commission';
import type { CommissionPlanDto } from '@shared/schemas/money';
import { PanelError } from '@/components/errors/error-panel';
import { Form, type FormMethods } from '@/components/form/form';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { useAssignCommissionPlan, useCommissionPlans, useCreateCommissionPlan, usePartners, useUpdateCommissionPlan, type PartnerRow } from '../api/commission-plans';
import { planFormSchema, planFormValuesFrom, planInputFrom } from '../utils/plan-form';
import { OnboardOrganizationDialog } from './onboard-organization-dialog';
import { SwitchOrganizationButton } from './switch-organization';

/** "10 % · 14 % at 20+ paid": each tier's rate, and from how many paid referrals (90 days) it applies. */
export function describeTiers(plan: Pick<CommissionPlanDto, 'tiers'>): string {
  return plan.tiers.map((t) => (t.minPaidReferrals === 0 ? formatBasisPoints(t.basisPoints) : `${formatBasisPoints(t.basisPoints)} at ${t.minPaidReferrals}+ paid`)).join(' · ');
}

function PlanDialog({ plan, open, onClose }: { plan: CommissionPlanDto | null; open: boolean; onClose: () => void }) {
  const create = useCreateCommissionPlan();
  const update = useUpdateCommissionPlan();
  const formId = plan ? `plan-${plan.id}` : 'plan-new';
  const title = plan ? `Edit ${plan.name}` : 'New commission plan';
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={title}
      description="A shop's rate is the tier its paid referrals of the last 90 days reach. A change applies to cases paid from now on; lines already earned keep their rate."
      className="w-[min(40rem,calc(100vw-2rem))]"
      footer={
        <>
          <Button variant="secondary" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" form={formId} isLoading={create.isPending || update.isPending}>
            {plan ? 'Save the plan' : 'Create the plan'}
          </Button>
        </>
      }
    >
      <Form
        id={formId}
        schema={planFormSchema}
        defaultValues={planFormValuesFrom(plan)}
        aria-label={title}
        onSubmit={async (values) => {
          const input = planInputFrom(values);
          if (plan) {
            // Only a switch to default is sent: a plan stops being the default when another becomes it.
            await update.mutateAsync({ id: plan.id, patch: { name: input.name, tiers: input.tiers, networkFeeBasisPoints: input.networkFeeBasisPoints, ...(input.isDefault && !plan.isDefault ? { isDefault: true } : {}) } });
          } else {
            await create.mutateAsync(input);
          }
          onClose();
          toast.success(plan ? `${input.name} saved` : `${input.name} created`);
        }}
      >
        {(form) => <PlanFields form={form} lockedDefault={plan?.isDefault ?? false} />}
      </Form>
    </Dialog>
  );
}

function PlanFields({ form, lockedDefault }: { form: FormMethods<typeof planFormSchema>; lockedDefault: boolean }) {
  const { register, control, formState } = form;
  const { fields, append, remove } = useFieldArray({ control, name: 'tiers' });
  const errors = formState.errors;
  const tiersError = errors.tiers?.message ?? errors.tiers?.root?.message;
  return (
    <>
      <Input label="Name" error={errors.name?.message} {...register('name')} />
      <Input label="Network fee (%)" hint="Kept by the network from each paid recovery, before the lab's share." inputMode="decimal" error={errors.networkFeePercent?.message} {...register('networkFeePercent')} />
      <fieldset className="flex flex-col gap-3">
        <legend className="text-sm font-semibold text-ink-strong">Tiers</legend>
        {tiersError ? <p className="text-sm text-danger">{tiersError}</p> : null}
        <ol className="flex flex-col gap-3" aria-label="Tiers">
          {fields.map((field, index) => (
            <li key={field.id} className="flex flex-wrap items-end gap-3 rounded-control border border-ink-hairline bg-paper px-3 py-3">
              <Input
                label={`Tier ${index + 1}: from paid referrals (90 days)`}
                inputMode="numeric"
                readOnly={index === 0}
                hint={index === 0 ? 'The first tier starts at 0.' : undefined}
                error={errors.tiers?.[index]?.minPaidReferrals?.message}
                {...register(`tiers.${index}.minPaidReferrals`)}
              />
              <Input label={`Tier ${index + 1}: commission (%)`} inputMode="decimal" error={errors.tiers?.[index]?.percent?.message} {...register(`tiers.${index}.percent`)} />
              {index > 0 ? (
                <Button size="sm" variant="secondary" onClick={() => remove(index)} aria-label={`Remove tier ${index + 1}`}>
                  Remove
                </Button>
              ) : null}
            </li>
          ))}
        </ol>
        {fields.length < 10 ? (
          <div>
            <Button size="sm" variant="secondary" onClick={() => append({ minPaidReferrals: '', percent: '' })}>
              Add a tier
            </Button>
          </div>
        ) : null}
      </fieldset>
      {lockedDefault ? (
        <p className="text-sm text-ink-muted">This is the default plan: shops without a plan of their own are on it.</p>
      ) : (
        <Checkbox label="Make this the default plan" hint="Shops without a plan of their own are on the default plan." {...register('isDefault')} />
      )}
    </>
  );
}

/** Every plan with its tiers and shops, and the way to change them. */
export function CommissionPlansCard() {
  const plans = useCommissionPlans();
  const [editing, setEditing] = useState<CommissionPlanDto | 'new' | null>(null);
  const columns: TableColumn<CommissionPlanDto>[] = [
    {
      header: 'Plan',
      cell: (p) => (
        <span className="flex items-center gap-2 font-semibold text-ink-strong">
          {p.name}
          {p.isDefault ? <Badge tone="info">Default</Badge> : null}
        </span>
      ),
    },
    { header: 'Commission', cell: (p) => describeTiers(p) },
    { header: 'Network fee', cell: (p) => formatBasisPoints(p.networkFeeBasisPoints), className: 'tabular-nums whitespace-nowrap' },
    { header: 'Shops on it', cell: (p) => (p.partners.length ? p.partners.map((s) => s.name).join(', ') : p.isDefault ? 'Every shop without its own plan' : 'None') },
    {
      header: <span className="sr-only">Actions</span>,
      cell: (p) => (
        <Button size="sm" variant="secondary" onClick={() => setEditing(p)} aria-label={`Edit ${p.name}`}>
          Edit
        </Button>
      ),
    },
  ];
  return (
    <Card
      title="Commission plans"
      description="What each shop earns on the recoveries it refers, by how many of its referrals were paid in the last 90 days."
      actions={<Button size="sm" onClick={() => setEditing('new')}>New plan</Button>}
    >
      {plans.isPending ? (
        <Spinner label="Loading the plans" />
      ) : plans.isError ? (
        <PanelError title="The plans could not be loaded" onRetry={() => void plans.refetch()} />
      ) : (
        <Table caption="Commission plans" columns={columns} rows={plans.data.plans} rowKey={(p) => p.id} empty="No commission plans yet." />
      )}
      {editing ? <PlanDialog key={editing === 'new' ? 'new' : editing.id} plan={editing === 'new' ? null : editing} open onClose={() => setEditing(null)} /> : null}
    </Card>
  );
}

function PlanChoice({ partner, plans }: { partner: PartnerRow; plans: CommissionPlanDto[] }) {
  const assign = useAssignCommissionPlan();
  const own = plans.find((p) => p.partners.some((s) => s.id === partner.id));
  const fallback = plans.find((p) => p.isDefault);
  return (
    <Select
      label={<span className="sr-only">Commission plan of {partner.name}</span>}
      value={own?.id ?? ''}
      disabled={assign.isPending}
      options={[{ value: '', label: `Default plan${fallback ? ` (${fallback.name})` : ''}` }, ...plans.filter((p) => !p.isDefault).map((p) => ({ value: p.id, label: p.name }))]}
      onChange={(event) => {
        const planId = event.target.value || null;
        assign.mutate(
          { partnerId: partner.id, planId },
          {
            onSuccess: () => toast.success(`${partner.name} is on ${planId ? plans.find((p) => p.id === planId)?.name : 'the default plan'}`),
            onError: (error) => toast.error(`The plan of ${partner.name} could not be changed: ${error.message}`),
          },
        );
      }}
    />
  );
}

/** The network's shops, each with the plan it is on. */
export function PartnersCard() {
  const partners = usePartners();
  const plans = useCommissionPlans();
  const columns: TableColumn<PartnerRow>[] = [
    { header: 'Shop', cell: (s) => <span className="font-semibold text-ink-strong">{s.name}</span> },
    { header: 'Place', cell: (s) => [s.address.city, s.address.region].filter(Boolean).join(', ') || '—' },
    { header: 'Status', cell: (s) => (s.active ? <Badge tone="success">Active</Badge> : <Badge tone="neutral">Switched off</Badge>) },
    { header: 'Commission plan', cell: (s) => <PlanChoice partner={s} plans={plans.data?.plans ?? []} /> },
    { header: <span className="sr-only">Switch on or off</span>, cell: (s) => <SwitchOrganizationButton organization={{ ...s, kind: 'partner' }} /> },
  ];
  return (
    <Card title="Shops" description="Every repair shop and reseller that refers cases, with the commission plan it is on." actions={<OnboardOrganizationDialog kind="partner" />}>
      {partners.isPending || plans.isPending ? (
        <Spinner label="Loading the shops" />
      ) : partners.isError || plans.isError ? (
        <PanelError title="The shops could not be loaded" onRetry={() => void Promise.all([partners.refetch(), plans.refetch()])} />
      ) : (
        <Table caption="Shops and their commission plans" columns={columns} rows={partners.data} rowKey={(s) => s.id} empty="No shops yet." />
      )}
    </Card>
  );
}
