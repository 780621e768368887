import type { WebhookDeliveryDto } from '@shared/schemas/webhooks';
import { PanelError } from '@/components/errors/error-panel';
import { Badge, type BadgeTone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { formatDateTime } from '@/lib/format';
import { useDeliveries } from '../api/get-deliveries';
import { useResendDelivery } from '../api/resend-delivery';
import { partnerEventLabels } from './event-labels';

const statusBadge: Record<WebhookDeliveryDto['status'], { tone: BadgeTone; label: string }> = {
  pending: { tone: 'info', label: 'Waiting to retry' },
  succeeded: { tone: 'success', label: 'Delivered' },
  failed: { tone: 'danger', label: 'Failed' },
};

function attemptsText(d: WebhookDeliveryDto): string {
  if (d.attempts.length === 0) return 'Not tried yet';
  return d.attempts.map((a) => `${a.statusCode ?? a.error ?? 'no answer'} (${a.durationMs} ms)`).join(' → ');
}

export function DeliveryLog({ endpointId }: { endpointId: string }) {
  const deliveries = useDeliveries(endpointId);
  const resend = useResendDelivery();
  if (deliveries.isPending) return <Spinner label="Loading deliveries" />;
  if (deliveries.isError) return <PanelError title="The delivery log could not be loaded" onRetry={() => void deliveries.refetch()} />;
  const columns: TableColumn<WebhookDeliveryDto>[] = [
    { header: 'When', cell: (d) => formatDateTime(d.createdAt), className: 'whitespace-nowrap' },
    { header: 'Event', cell: (d) => <span title={d.eventType}>{partnerEventLabels[d.eventType]}</span> },
    { header: 'Status', cell: (d) => <Badge tone={statusBadge[d.status].tone}>{statusBadge[d.status].label}</Badge> },
    { header: 'Responses', cell: (d) => <span className="font-mono text-xs">{attemptsText(d)}</span> },
    {
      header: <span className="sr-only">Actions</span>,
      className: 'text-right',
      cell: (d) => (
        <Button
          size="sm"
          variant="secondary"
          aria-label={`Send ${partnerEventLabels[d.eventType]} again`}
          isLoading={resend.isPending && resend.variables?.deliveryId === d.id}
          onClick={async () => {
            await resend.mutateAsync({ endpointId, deliveryId: d.id });
            toast.info('Queued to send again');
          }}
        >
          Send again
        </Button>
      ),
    },
  ];
  return <Table caption="Recent deliveries to this endpoint" columns={columns} rows={deliveries.data} rowKey={(d) => d.id} empty="Nothing sent yet. Events appear here as your cases change." />;
}
