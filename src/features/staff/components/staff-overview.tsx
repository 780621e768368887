import { PageHeader } from '@/components/layouts/page-header';
import { Can } from '@/lib/auth';
import { InviteStaffDialog } from './invite-staff-dialog';
import { StaffList } from './staff-list';

/** The staff page, shared by the shop's settings and the lab portal. */
export function StaffOverview() {
  return (
    <>
      <PageHeader
        title="Staff"
        description="Everyone in your organisation who can sign in to Platterpost, and the invitations still waiting."
        actions={
          <Can permission="staff.invite">
            <InviteStaffDialog />
          </Can>
        }
      />
      <StaffList />
    </>
  );
}
