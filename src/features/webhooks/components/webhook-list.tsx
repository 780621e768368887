import { useState } from 'react';
import type { WebhookEndpointDto } from '@shared/schemas/webhooks';
import { PanelError } from '@/components/errors/error-panel';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { toast } from '@/components/ui/toast';
import { formatDateTime } from '@/lib/format';
import { useDeleteWebhook } from '../api/delete-webhook';
import { useWebhooks } from '../api/get-webhooks';
import { useUpdateWebhook } from '../api/update-webhook';
import { DeliveryLog } from './delivery-log';
import { partnerEventLabels } from './event-labels';

function Endpoint({ endpoint }: { endpoint: WebhookEndpointDto }) {
  const [showLog, setShowLog] = useState(false);
  const update = useUpdateWebhook();
  const remove = useDeleteWebhook();
  const logId = `deliveries-${endpoint.id}`;
  return (
    <Card>
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h2 className="font-mono text-sm font-semibold break-all text-ink-strong">{endpoint.url}</h2>
          {endpoint.description ? <p className="text-sm text-ink-muted">{endpoint.description}</p> : null}
          <p className="mt-2 flex flex-wrap items-center gap-2">
            {endpoint.status === 'active' ? <Badge tone="success">Active</Badge> : <Badge tone="danger">Disabled</Badge>}
            {endpoint.failingSince && endpoint.status === 'active' ? <Badge tone="warning">Failing since {formatDateTime(endpoint.failingSince)}</Badge> : null}
          </p>
          {endpoint.disabledReason ? <p className="mt-1 text-sm text-brick-text">{endpoint.disabledReason}.</p> : null}
          <p className="mt-2 text-sm text-ink">Sends: {endpoint.events.map((e) => partnerEventLabels[e]).join(', ')}</p>
        </div>
        <div className="flex flex-wrap gap-2">
          <Button size="sm" variant="secondary" aria-expanded={showLog} aria-controls={logId} onClick={() => setShowLog((v) => !v)}>
            {showLog ? 'Hide deliveries' : 'Show deliveries'}
          </Button>
          <Button
            size="sm"
            variant="secondary"
            isLoading={update.isPending}
            onClick={async () => {
              await update.mutateAsync({ id: endpoint.id, enabled: endpoint.status !== 'active' });
              toast.success(endpoint.status === 'active' ? 'Endpoint disabled' : 'Endpoint enabled');
            }}
          >
            {endpoint.status === 'active' ? 'Disable' : 'Enable'}
          </Button>
          <Button
            size="sm"
            variant="danger"
            aria-label={`Remove ${endpoint.url}`}
            isLoading={remove.isPending}
            onClick={async () => {
              if (!window.confirm(`Remove ${endpoint.url}? Its delivery log goes with it.`)) return;
              await remove.mutateAsync(endpoint.id);
              toast.success('Endpoint removed');
            }}
          >
            Remove
          </Button>
        </div>
      </div>
      {showLog ? (
        <div id={logId} className="mt-4">
          <DeliveryLog endpointId={endpoint.id} />
        </div>
      ) : null}
    </Card>
  );
}

export function WebhookList() {
  const endpoints = useWebhooks();
  if (endpoints.isPending) return <Spinner label="Loading webhook endpoints" />;
  if (endpoints.isError) return <PanelError title="Your webhook endpoints could not be loaded" onRetry={() => void endpoints.refetch()} />;
  if (endpoints.data.length === 0) {
    return <p className="text-sm text-ink-muted">No endpoints yet. Add one to have your ticketing system hear about every change to your cases.</p>;
  }
  return (
    <div className="flex flex-col gap-4">
      {endpoints.data.map((e) => (
        <Endpoint key={e.id} endpoint={e} />
      ))}
    </div>
  );
}
