import { Navigate, useLocation, useSearchParams } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { useSession } from '@/lib/auth';
import { landingPathFor } from '@/lib/authorization';
import { SignInForm } from '@/features/auth/components/sign-in-form';

export default function SignInPage() {
  const { user } = useSession();
  const [searchParams] = useSearchParams();
  const location = useLocation();
  const notice = (location.state as { notice?: string } | null)?.notice;

  // Signed in already, or just now: go where `next` asks if this role may open it.
  if (user) return <Navigate to={landingPathFor(user, searchParams.get('next'))} replace />;

  return (
    <>
      <title>Sign in · Platterpost</title>
      <h1 id="sign-in-heading" className="text-2xl font-bold tracking-tight text-ink-strong">
        Sign in
      </h1>
      <p className="mt-1.5 mb-6 text-ink-muted">Welcome back. Use the e-mail address your organisation invited.</p>
      {notice ? (
        <Alert tone="success" live="polite" className="mb-5">
          {notice}
        </Alert>
      ) : null}
      <SignInForm />
    </>
  );
}
