import { Link, useLocation } from 'react-router';
import { FullPageMessage } from '@/components/errors/full-page-message';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { useSession } from '@/lib/auth';
import { homePathFor } from '@/lib/authorization';

function HomeLink() {
  const { user } = useSession();
  return user ? (
    <Link to={homePathFor(user.role)} className={buttonClasses()}>
      Go to your home page
    </Link>
  ) : (
    <Link to={paths.auth.signIn.getHref()} className={buttonClasses()}>
      Go to sign in
    </Link>
  );
}

/** Inside a portal: the frame stays, only the page says it is missing. */
export function NotFoundInPortal() {
  const { pathname } = useLocation();
  return (
    <>
      <PageHeader title="Page not found" description={`There is no page at ${pathname}. The link may be old, or the address mistyped.`} />
      <HomeLink />
    </>
  );
}

export default function NotFoundPage() {
  return (
    <FullPageMessage title="Page not found" actions={<HomeLink />}>
      There is no page at this address. The link may be old, or the address mistyped.
    </FullPageMessage>
  );
}
