import { useState } from 'react';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { forgotPasswordInput, useForgotPassword } from '../api/forgot-password';

export function ForgotPasswordForm() {
  const forgot = useForgotPassword();
  const [sentTo, setSentTo] = useState<string | null>(null);

  if (sentTo) {
    // The same words whether or not the address has an account, as the server intends.
    return (
      <Alert tone="success" live="polite" title="Check your inbox">
        If an account exists for {sentTo}, we’ve sent a link to choose a new password. The link works once; if it
        does not arrive within a few minutes, look in your spam folder or ask again.
      </Alert>
    );
  }

  return (
    <Form
      schema={forgotPasswordInput}
      defaultValues={{ email: '' }}
      aria-labelledby="forgot-password-heading"
      onSubmit={async (values) => {
        await forgot.mutateAsync(values);
        setSentTo(values.email);
      }}
    >
      {({ register, formState }) => (
        <>
          <Input label="E-mail" type="email" autoComplete="email" inputMode="email" autoFocus error={formState.errors.email?.message} {...register('email')} />
          <Button type="submit" size="lg" isLoading={formState.isSubmitting} className="w-full">
            Send me a link
          </Button>
        </>
      )}
    </Form>
  );
}
