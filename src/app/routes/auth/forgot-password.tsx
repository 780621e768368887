import { Navigate } from 'react-router';
import { TextLink } from '@/components/ui/link';
import { paths } from '@/config/paths';
import { useSession } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';
import { ForgotPasswordForm } from '@/features/auth/components/forgot-password-form';

export default function ForgotPasswordPage() {
  const { user } = useSession();
  if (user) return <Navigate to={homePathFor(user.role)} replace />;
  return (
    <>
      <title>Forgot your password? · Platterpost</title>
      <h1 id="forgot-password-heading" className="text-2xl font-bold tracking-tight text-ink-strong">
        Choose a new password
      </h1>
      <p className="mt-1.5 mb-6 text-ink-muted">Tell us the e-mail address you sign in with and we’ll send you a link to set a new password.</p>
      <ForgotPasswordForm />
      <p className="mt-6 text-sm">
        <TextLink to={paths.auth.signIn.getHref()}>Back to sign in</TextLink>
      </p>
    </>
  );
}
