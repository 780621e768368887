import { useState } from 'react';
import type { ApiKeyDto } from '@shared/schemas/partner-api';
import { API_KEY_PREFIX } from '@shared/schemas/partner-api';
import { PanelError } from '@/components/errors/error-panel';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { formatDate, formatDateTime } from '@/lib/format';
import { useApiKeys } from '../api/get-api-keys';
import { useRevokeApiKey } from '../api/revoke-api-key';

/** How a key is shown after it was created: its public part only. */
export function maskedKey(prefix: string): string {
  return `${API_KEY_PREFIX}${prefix}_…`;
}

function RevokeKey({ apiKey }: { apiKey: ApiKeyDto }) {
  const [open, setOpen] = useState(false);
  const revoke = useRevokeApiKey();
  return (
    <>
      <Button size="sm" variant="secondary" onClick={() => setOpen(true)} aria-label={`Revoke ${apiKey.name}`}>
        Revoke
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Revoke “${apiKey.name}”?`}
        description="Requests with this key are refused from now on. Systems that use it stop working until they get a new key."
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Keep it
            </Button>
            <Button
              variant="danger"
              isLoading={revoke.isPending}
              onClick={async () => {
                await revoke.mutateAsync(apiKey.id);
                setOpen(false);
                toast.success(`“${apiKey.name}” revoked`);
              }}
            >
              Revoke key
            </Button>
          </>
        }
      >
        <p className="text-sm text-ink">
          Key <code className="font-mono">{maskedKey(apiKey.prefix)}</code>, created {formatDate(apiKey.createdAt)}.
        </p>
      </Dialog>
    </>
  );
}

const columns: TableColumn<ApiKeyDto>[] = [
  { header: 'Name', cell: (key) => <span className="font-semibold text-ink-strong">{key.name}</span> },
  { header: 'Key', cell: (key) => <code className="font-mono text-sm break-all">{maskedKey(key.prefix)}</code> },
  { header: 'Created', cell: (key) => formatDate(key.createdAt), className: 'whitespace-nowrap' },
  { header: 'Last used', cell: (key) => (key.lastUsedAt ? formatDateTime(key.lastUsedAt) : 'Never'), className: 'whitespace-nowrap' },
  {
    header: 'Status',
    cell: (key) => (key.revokedAt ? <Badge tone="neutral">Revoked {formatDate(key.revokedAt)}</Badge> : <Badge tone="success">Active</Badge>),
  },
  { header: <span className="sr-only">Actions</span>, cell: (key) => (key.revokedAt ? null : <RevokeKey apiKey={key} />), className: 'text-right' },
];

export function ApiKeyList() {
  const keys = useApiKeys();
  if (keys.isPending) return <Spinner label="Loading API keys" />;
  if (keys.isError) return <PanelError title="Your API keys could not be loaded" onRetry={() => void keys.refetch()} />;
  return (
    <Table
      caption="Your shop’s API keys"
      columns={columns}
      rows={keys.data}
      rowKey={(key) => key.id}
      empty="No keys yet. Create one for each system that should open referrals for your shop."
    />
  );
}
