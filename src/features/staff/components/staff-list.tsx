import type { StaffMember } from '@shared/schemas/auth';
import { roleLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDate } from '@/lib/format';
import { useStaff } from '../api/get-staff';

const statusBadge: Record<StaffMember['status'], { tone: BadgeTone; label: string }> = {
  active: { tone: 'success', label: 'Active' },
  invited: { tone: 'info', label: 'Invitation sent' },
  disabled: { tone: 'neutral', label: 'Disabled' },
};

const columns: TableColumn<StaffMember>[] = [
  {
    header: 'Name',
    cell: (member) => (
      <>
        <span className="block font-semibold text-ink-strong">{member.name}</span>
        <span className="block text-ink-muted break-all">{member.email}</span>
      </>
    ),
  },
  { header: 'Role', cell: (member) => roleLabels[member.role] },
  {
    header: 'Status',
    cell: (member) => <Badge tone={statusBadge[member.status].tone}>{statusBadge[member.status].label}</Badge>,
  },
  { header: 'Added', cell: (member) => formatDate(member.createdAt), className: 'whitespace-nowrap' },
];

export function StaffList() {
  const staff = useStaff();
  if (staff.isPending) return <Spinner label="Loading staff" />;
  if (staff.isError) return <PanelError title="The staff list could not be loaded" onRetry={() => void staff.refetch()} />;
  return (
    <Table
      caption="People in your organisation"
      columns={columns}
      rows={staff.data}
      rowKey={(member) => member.id}
      empty="Nobody here yet. Invite a colleague to give them their own sign-in."
    />
  );
}
