import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { Can } from '@/lib/auth';
import { getReferralsQueryOptions } from '@/features/referrals/api/get-referrals';
import { CaseTable, casesQueryFrom } from '@/features/referrals/components/case-table';

export const clientLoader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  // A failure here is shown by the table itself, with a retry, inside the portal.
  await queryClient.ensureQueryData(getReferralsQueryOptions({ ...casesQueryFrom(new URL(request.url).searchParams), cursor: undefined })).catch(() => undefined);
  return null;
};

export default function CasesPage() {
  return (
    <>
      <PageHeader
        title="Cases"
        description="Every referral your shop has opened, from the counter to the customer’s returned data."
        actions={
          <Can permission="referrals.create">
            <Link to={paths.partner.newReferral.getHref()} className={buttonClasses()}>
              New referral
            </Link>
          </Can>
        }
      />
      <CaseTable />
    </>
  );
}
