import { useState } from 'react';
import { z } from 'zod';
import { emailSchema } from '@shared/schemas/auth';
import { networkTimeZones } from '@shared/schemas/labs';
import { onboardOrganizationInput, type OnboardableKind } from '@shared/schemas/organizations';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { toast } from '@/components/ui/toast';
import { useOnboardOrganization } from '../api/onboard-organization';

// The network admin adds a shop or a lab and invites the person who runs it there. The form keeps
// blanks as blanks; they are dropped before the request, whose schema is the server's own.

const words = {
  partner: { noun: 'shop', title: 'Add a shop', person: 'Shop admin', after: 'can open referrals and invite the rest of the shop once they join.' },
  lab: { noun: 'lab', title: 'Add a lab', person: 'Lab manager', after: 'can fill in the lab profile; no case is offered to the lab until it is saved.' },
} as const;

const formSchema = onboardOrganizationInput.extend({ email: z.union([z.literal(''), emailSchema]) });
type FormValues = z.input<typeof formSchema>;

/** The address without its blank lines (the server fills city and region in from the postal code). */
const blankless = <T extends Record<string, unknown>>(o: T) => Object.fromEntries(Object.entries(o).filter(([, v]) => v !== '')) as Partial<T>;

export function OnboardOrganizationDialog({ kind }: { kind: OnboardableKind }) {
  const [open, setOpen] = useState(false);
  const onboard = useOnboardOrganization();
  const w = words[kind];
  const formId = `onboard-${kind}-form`;
  const defaults: FormValues = {
    kind,
    name: '',
    email: '',
    phone: '',
    address: { line1: '', city: '', region: '', postalCode: '', country: 'US' },
    timeZone: 'America/New_York',
    admin: { name: '', email: '' },
  };

  return (
    <>
      <Button onClick={() => setOpen(true)}>{w.title}</Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={w.title}
        description={`The ${w.noun} is placed on the map by its ZIP or postal code (city and state come from the code when left blank). The person you name gets an e-mail with a link to join and choose a password.`}
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" form={formId} isLoading={onboard.isPending}>
              {`Add the ${w.noun} and invite`}
            </Button>
          </>
        }
      >
        <Form
          id={formId}
          schema={formSchema}
          defaultValues={defaults}
          aria-label={w.title}
          onSubmit={async (values) => {
            const { email, phone, address, ...rest } = values;
            const done = await onboard.mutateAsync({
              ...rest,
              ...(email ? { email } : {}),
              ...(phone ? { phone } : {}),
              address: { ...blankless(address), postalCode: address.postalCode },
            });
            setOpen(false);
            toast.success(`${done.organization.name} added`, `${done.admin.name} ${w.after} The invitation went to ${done.admin.email}.`);
          }}
        >
          {({ register, formState: { errors } }) => (
            <>
              <Input label="Name" autoComplete="off" error={errors.name?.message} {...register('name')} />
              <div className="grid gap-4 sm:grid-cols-2">
                <Input label="Contact e-mail" type="email" optional autoComplete="off" error={errors.email?.message} {...register('email')} />
                <Input label="Phone" type="tel" optional autoComplete="off" error={errors.phone?.message} {...register('phone')} />
              </div>
              <Input label="Street address" optional autoComplete="off" error={errors.address?.line1?.message} {...register('address.line1')} />
              <div className="grid gap-4 sm:grid-cols-2">
                <Input label="ZIP or postal code" autoComplete="off" error={errors.address?.postalCode?.message} {...register('address.postalCode')} />
                <Select
                  label="Country"
                  options={[
                    { value: 'US', label: 'United States' },
                    { value: 'CA', label: 'Canada' },
                  ]}
                  error={errors.address?.country?.message}
                  {...register('address.country')}
                />
                <Input label="City" optional autoComplete="off" error={errors.address?.city?.message} {...register('address.city')} />
                <Input label="State or province" optional autoComplete="off" error={errors.address?.region?.message} {...register('address.region')} />
              </div>
              <Select
                label="Time zone"
                options={networkTimeZones.map((z) => ({ value: z, label: z.replace(/_/g, ' ') }))}
                error={errors.timeZone?.message}
                {...register('timeZone')}
              />
              <fieldset className="flex flex-col gap-4 rounded-panel border border-ink-hairline p-4">
                <legend className="px-1 text-sm font-semibold text-ink-strong">{`${w.person} to invite`}</legend>
                <Input label={`${w.person}'s name`} autoComplete="off" error={errors.admin?.name?.message} {...register('admin.name')} />
                <Input label={`${w.person}'s e-mail`} type="email" autoComplete="off" error={errors.admin?.email?.message} {...register('admin.email')} />
              </fieldset>
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
