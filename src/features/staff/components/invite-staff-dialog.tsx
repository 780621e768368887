import { useState } from 'react';
import { z } from 'zod';
import { roleLabels, roleOrganizationKind, roles, type OrganizationKind, type Role } from '@shared/vocabulary';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { toast } from '@/components/ui/toast';
import { useUser } from '@/lib/auth';
import { inviteStaffInput, useInviteStaff } from '../api/invite-staff';

const FORM_ID = 'invite-staff-form';

/** Only roles of the inviter's own kind of organisation can be offered (a shop cannot invite a lab technician). */
function rolesFor(kind: OrganizationKind): Role[] {
  return roles.filter((role) => roleOrganizationKind[role] === kind);
}

export function InviteStaffDialog() {
  const user = useUser();
  const [open, setOpen] = useState(false);
  const invite = useInviteStaff();
  const offered = rolesFor(user.organization.kind);
  const schema = inviteStaffInput.extend({
    role: z.enum(roles, { error: 'Choose a role' }).refine((role) => offered.includes(role), 'Choose one of the roles listed'),
  });

  return (
    <>
      <Button onClick={() => setOpen(true)}>Invite a person</Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title="Invite a person"
        description={`They get an e-mail with a link to join ${user.organization.name} and choose a password.`}
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" form={FORM_ID} isLoading={invite.isPending}>
              Send invitation
            </Button>
          </>
        }
      >
        <Form
          id={FORM_ID}
          schema={schema}
          defaultValues={{ name: '', email: '' }}
          aria-label="Invite a person"
          onSubmit={async (values) => {
            const member = await invite.mutateAsync(values);
            setOpen(false);
            toast.success('Invitation sent', `${member.name} can now join from the e-mail sent to ${member.email}.`);
          }}
        >
          {({ register, formState }) => (
            <>
              <Input label="Name" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
              <Input label="E-mail" type="email" autoComplete="off" error={formState.errors.email?.message} {...register('email')} />
              <Select
                label="Role"
                placeholder="Choose a role"
                options={offered.map((role) => ({ value: role, label: roleLabels[role] }))}
                error={formState.errors.role?.message}
                {...register('role')}
              />
            </>
          )}
        </Form>
      </Dialog>
    </>
  );
}
