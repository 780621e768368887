import { Navigate, useSearchParams } from 'react-router';
import { Alert } from '@/components/ui/alert';
import { TextLink } from '@/components/ui/link';
import { Spinner } from '@/components/ui/spinner';
import { paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { useSession } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';
import { useInvitation } from '@/features/auth/api/get-invitation';
import { AcceptInvitationForm } from '@/features/auth/components/accept-invitation-form';

function Heading({ children }: { children: string }) {
  return (
    <>
      <title>{`${children} · Platterpost`}</title>
      <h1 id="accept-invitation-heading" className="text-2xl font-bold tracking-tight text-ink-strong">
        {children}
      </h1>
    </>
  );
}

export default function AcceptInvitationPage() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get('token') ?? '';
  const invitation = useInvitation(token);
  const { user } = useSession();

  // Accepting signs the new person in; from then on they belong on their home page.
  if (user && invitation.isSuccess && user.email === invitation.data.email) return <Navigate to={homePathFor(user.role)} replace />;

  if (!token) {
    return (
      <>
        <Heading>Join Platterpost</Heading>
        <Alert tone="warning" title="This link is not complete" className="mt-6">
          Open the link from your invitation e-mail again, or copy the whole address into your browser.
        </Alert>
      </>
    );
  }

  if (invitation.isPending) return <Spinner size="lg" label="Checking your invitation" />;

  if (invitation.isError) {
    const gone = isApiError(invitation.error) && invitation.error.status === 404;
    return (
      <>
        <Heading>Join Platterpost</Heading>
        <Alert tone={gone ? 'warning' : 'danger'} title={gone ? 'This invitation can no longer be used' : 'We could not check this invitation'} className="mt-6">
          {gone
            ? 'It may have expired or been used already. Ask the person who invited you to send a new one.'
            : 'Try the link again in a moment.'}
        </Alert>
        <p className="mt-6 text-sm">
          <TextLink to={paths.auth.signIn.getHref()}>Go to sign in</TextLink>
        </p>
      </>
    );
  }

  return (
    <>
      <Heading>{`Join ${invitation.data.organizationName}`}</Heading>
      <p className="mt-1.5 mb-6 text-ink-muted">You’ve been invited to Platterpost. Confirm your name and choose a password to start.</p>
      <AcceptInvitationForm token={token} invitation={invitation.data} />
    </>
  );
}
