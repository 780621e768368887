import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import { FullPageMessage } from '@/components/errors/full-page-message';
import { PageHeader } from '@/components/layouts/page-header';
import { Button, buttonClasses } from '@/components/ui/button';
import { paths } from '@/config/paths';
import NotFoundPage from './not-found';

/** A new release replaces the hashed page bundles; an open tab then fails to load the next page. */
function isStaleBundle(error: unknown): boolean {
  return error instanceof TypeError && /dynamically imported module|Importing a module script failed/i.test(error.message);
}

function messageFor(error: unknown): { title: string; body: string } {
  if (isStaleBundle(error)) {
    return { title: 'Platterpost was updated', body: 'Reload the page to get the newest version. Nothing you saved is lost.' };
  }
  return {
    title: 'Something went wrong',
    body: 'This page could not be shown. Reload to try again; if it keeps happening, tell the network team what you were doing.',
  };
}

const reload = () => window.location.reload();

/** The router's last resort, for errors outside any portal. */
export default function RouteErrorPage() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFoundPage />;
  console.error(error);
  const { title, body } = messageFor(error);
  return (
    <FullPageMessage
      title={title}
      actions={
        <>
          <Button onClick={reload}>Reload</Button>
          <Link to={paths.home.getHref()} className={buttonClasses({ variant: 'secondary' })}>
            Go to your home page
          </Link>
        </>
      }
    >
      {body}
    </FullPageMessage>
  );
}

/** Errors of one page inside a portal: the header and navigation stay usable. */
export function PortalPageError() {
  const error = useRouteError();
  console.error(error);
  const { title, body } = messageFor(error);
  return (
    <>
      <PageHeader title={title} description={body} />
      <Button onClick={reload}>Reload</Button>
    </>
  );
}
