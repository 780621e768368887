import { useNavigate } from 'react-router';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { paths } from '@/config/paths';
import { ApiError, isApiError } from '@/lib/api-client';
import { resetPasswordInput, useResetPassword } from '../api/reset-password';
import { withConfirmation } from './confirm-password';

const schema = withConfirmation(resetPasswordInput.pick({ password: true }), 'password');

export const passwordChangedNotice = 'Your password is changed. Sign in with the new one.';

export function ResetPasswordForm({ token }: { token: string }) {
  const reset = useResetPassword();
  const navigate = useNavigate();
  return (
    <Form
      schema={schema}
      defaultValues={{ password: '', confirmPassword: '' }}
      aria-labelledby="reset-password-heading"
      onSubmit={async ({ password }) => {
        try {
          await reset.mutateAsync({ token, password });
        } catch (error) {
          if (isApiError(error) && error.code === 'invalid_token') {
            throw new ApiError(error.status, error.code, 'This link has expired or was already used. Ask for a new one below.');
          }
          throw error;
        }
        await navigate(paths.auth.signIn.getHref(), { state: { notice: passwordChangedNotice } });
      }}
    >
      {({ register, formState }) => (
        <>
          <Input
            label="New password"
            type="password"
            autoComplete="new-password"
            hint="At least 10 characters. A few unrelated words make a strong one."
            autoFocus
            error={formState.errors.password?.message}
            {...register('password')}
          />
          <Input label="New password again" type="password" autoComplete="new-password" error={formState.errors.confirmPassword?.message} {...register('confirmPassword')} />
          <Button type="submit" size="lg" isLoading={formState.isSubmitting} className="w-full">
            Save new password
          </Button>
        </>
      )}
    </Form>
  );
}
