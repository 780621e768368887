import { useState } from 'react';
import { organizationActiveInput } from '@shared/schemas/organizations';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { useSetOrganizationActive } from '../api/set-organization-active';

// The network admin switches a shop or lab off (with a reason, kept in the audit log) or on again.

const consequences = {
  partner: 'Its people can no longer sign in and its API keys stop working. Cases already open carry on at their labs, and customers keep their pages.',
  lab: 'Its people can no longer sign in, and no case is offered to it. Each offer it has not answered yet goes to the next lab at once. Cases it already holds stay with it until it is switched on again.',
} as const;

export function SwitchOrganizationButton({ organization }: { organization: { id: string; name: string; kind: 'partner' | 'lab'; active: boolean } }) {
  const [open, setOpen] = useState(false);
  const change = useSetOrganizationActive();
  const formId = `switch-off-${organization.id}`;

  if (!organization.active) {
    return (
      <Button
        size="sm"
        variant="secondary"
        aria-label={`Switch ${organization.name} on`}
        isLoading={change.isPending}
        onClick={() =>
          change.mutate(
            { id: organization.id, active: true },
            {
              onSuccess: () => toast.success(`${organization.name} is switched on`, organization.kind === 'lab' ? 'Cases can be offered to it again.' : 'Its people can sign in again.'),
              onError: (error) => toast.error(`${organization.name} could not be switched on: ${error.message}`),
            },
          )
        }
      >
        Switch on
      </Button>
    );
  }
  return (
    <>
      <Button size="sm" variant="secondary" aria-label={`Switch ${organization.name} off`} onClick={() => setOpen(true)}>
        Switch off
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Switch ${organization.name} off`}
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" form={formId} variant="danger" isLoading={change.isPending}>
              Switch off
            </Button>
          </>
        }
      >
        <Form
          id={formId}
          schema={organizationActiveInput}
          defaultValues={{ active: false, reason: '' }}
          aria-label={`Switch ${organization.name} off`}
          onSubmit={async (values) => {
            await change.mutateAsync({ id: organization.id, ...values });
            setOpen(false);
            toast.success(`${organization.name} is switched off`, 'The audit log keeps your reason.');
          }}
        >
          {({ register, formState: { errors } }) => (
            <>
              <Alert tone="warning">{consequences[organization.kind]}</Alert>
              <Textarea label="Why" rows={3} error={errors.reason?.message} {...register('reason')} />
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
