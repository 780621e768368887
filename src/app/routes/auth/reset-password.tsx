import { useSearchParams } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { TextLink } from '@/components/ui/link';
import { paths } from '@/config/paths';
import { ResetPasswordForm } from '@/features/auth/components/reset-password-form';

export default function ResetPasswordPage() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get('token') ?? '';
  return (
    <>
      <title>Set a new password · Platterpost</title>
      <h1 id="reset-password-heading" className="text-2xl font-bold tracking-tight text-ink-strong">
        Set a new password
      </h1>
      {token ? (
        <>
          <p className="mt-1.5 mb-6 text-ink-muted">Choose the password you will sign in with from now on.</p>
          <ResetPasswordForm token={token} />
        </>
      ) : (
        <Alert tone="warning" title="This link is not complete" className="mt-6">
          Open the link from the e-mail again, or copy the whole address into your browser.
        </Alert>
      )}
      <p className="mt-6 flex flex-wrap gap-x-6 gap-y-2 text-sm">
        <TextLink to={paths.auth.forgotPassword.getHref()}>Ask for a new link</TextLink>
        <TextLink to={paths.auth.signIn.getHref()}>Back to sign in</TextLink>
      </p>
    </>
  );
}
