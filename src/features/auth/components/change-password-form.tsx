import { useState } from 'react';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { changePasswordInput, useChangePassword } from '../api/change-password';
import { withConfirmation } from './confirm-password';

const schema = withConfirmation(changePasswordInput, 'newPassword');
const empty = { currentPassword: '', newPassword: '', confirmPassword: '' };

export function ChangePasswordForm() {
  const change = useChangePassword();
  const [changed, setChanged] = useState(false);
  return (
    <Form
      schema={schema}
      defaultValues={empty}
      aria-label="Change password"
      onSubmit={async ({ currentPassword, newPassword }, form) => {
        setChanged(false);
        await change.mutateAsync({ currentPassword, newPassword });
        form.reset(empty);
        setChanged(true);
      }}
    >
      {({ register, formState }) => (
        <>
          <div role="status" className={changed ? undefined : 'sr-only'}>
            {changed ? <Alert tone="success">Your password is changed.</Alert> : null}
          </div>
          <Input label="Current password" type="password" autoComplete="current-password" error={formState.errors.currentPassword?.message} {...register('currentPassword')} />
          <Input
            label="New password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters."
            error={formState.errors.newPassword?.message}
            {...register('newPassword')}
          />
          <Input label="New password again" type="password" autoComplete="new-password" error={formState.errors.confirmPassword?.message} {...register('confirmPassword')} />
          <div>
            <Button type="submit" isLoading={formState.isSubmitting}>
              Change password
            </Button>
          </div>
        </>
      )}
    </Form>
  );
}
