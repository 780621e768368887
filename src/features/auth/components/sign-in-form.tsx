import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { TextLink } from '@/components/ui/link';
import { paths } from '@/config/paths';
import { signInInput, useSignIn } from '../api/sign-in';

/**
 * Signs in; where to go next is decided by the sign-in page once the session exists,
 * so a reload of the page and a fresh sign-in land the same way.
 */
export function SignInForm() {
  const signIn = useSignIn();
  return (
    <Form schema={signInInput} defaultValues={{ email: '', password: '' }} onSubmit={(values) => signIn.mutateAsync(values)} aria-labelledby="sign-in-heading">
      {({ register, formState }) => (
        <>
          <Input label="E-mail" type="email" autoComplete="username" inputMode="email" autoFocus error={formState.errors.email?.message} {...register('email')} />
          <div>
            <Input label="Password" type="password" autoComplete="current-password" error={formState.errors.password?.message} {...register('password')} />
            <p className="mt-2 text-sm">
              <TextLink to={paths.auth.forgotPassword.getHref()}>Forgot your password?</TextLink>
            </p>
          </div>
          <Button type="submit" size="lg" isLoading={formState.isSubmitting} className="w-full">
            Sign in
          </Button>
        </>
      )}
    </Form>
  );
}
