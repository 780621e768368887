import type { QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { buttonClasses } from '@/components/ui/button';
import { paths } from '@/config/paths';
import { Can } from '@/lib/auth';
import { getInboundBoardQueryOptions } from '@/features/receiving/api/get-inbound-board';
import { InboundBoard } from '@/features/receiving/components/inbound-board';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getInboundBoardQueryOptions({ q: '' })).catch(() => undefined);
  return null;
};

export default function InboundPage() {
  return (
    <>
      <PageHeader
        title="Inbound boxes"
        description="Every box on its way to your lab, by tracking status. Delivered boxes wait here until they are checked in."
        actions={
          <Can permission="inbound.check-in">
            <Link to={paths.lab.checkIn.getHref()} className={buttonClasses()}>
              Check in a box
            </Link>
          </Can>
        }
      />
      <InboundBoard />
    </>
  );
}
