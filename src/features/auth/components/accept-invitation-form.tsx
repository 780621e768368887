import type { InvitationPreview } from '@shared/schemas/auth';
import { roleLabels } from '@shared/vocabulary';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { acceptInvitationInput, useAcceptInvitation } from '../api/accept-invitation';
import { withConfirmation } from './confirm-password';

const schema = withConfirmation(acceptInvitationInput.pick({ name: true, password: true }), 'password');

/** Accepting signs the person in; the page then sends them to their home. */
export function AcceptInvitationForm({ token, invitation }: { token: string; invitation: InvitationPreview }) {
  const accept = useAcceptInvitation();
  return (
    <Form
      schema={schema}
      defaultValues={{ name: invitation.name, password: '', confirmPassword: '' }}
      aria-labelledby="accept-invitation-heading"
      onSubmit={({ name, password }) => accept.mutateAsync({ token, name, password })}
    >
      {({ register, formState }) => (
        <>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-control bg-paper-sunken px-4 py-3 text-sm">
            <dt className="text-ink-muted">E-mail</dt>
            <dd className="font-semibold break-all text-ink-strong">{invitation.email}</dd>
            <dt className="text-ink-muted">Role</dt>
            <dd className="font-semibold text-ink-strong">{roleLabels[invitation.role]}</dd>
          </dl>
          <Input label="Your name" autoComplete="name" hint="As your colleagues and the network will see it." error={formState.errors.name?.message} {...register('name')} />
          <Input
            label="Choose a password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters. A few unrelated words make a strong one."
            error={formState.errors.password?.message}
            {...register('password')}
          />
          <Input label="Password again" type="password" autoComplete="new-password" error={formState.errors.confirmPassword?.message} {...register('confirmPassword')} />
          <Button type="submit" size="lg" isLoading={formState.isSubmitting} className="w-full">
            Join and sign in
          </Button>
        </>
      )}
    </Form>
  );
}
