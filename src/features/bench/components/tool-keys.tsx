import { useState } from 'react';
import type { ApiKeyDto, CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { formatDateTime } from '@/lib/format';
import { createLabKeyInput, useCreateToolKey } from '../api/create-tool-key';
import { useToolKeys } from '../api/get-tool-keys';
import { useRevokeToolKey } from '../api/revoke-tool-key';

function RevokeButton({ tool }: { tool: ApiKeyDto }) {
  const revoke = useRevokeToolKey();
  return (
    <Button variant="ghost" size="sm" isLoading={revoke.isPending} onClick={() => revoke.mutateAsync(tool.id).then(() => toast.success(`“${tool.name}” switched off`))}>
      Switch off
    </Button>
  );
}

const columns: TableColumn<ApiKeyDto>[] = [
  { header: 'Tool', cell: (k) => <span className="font-semibold text-ink-strong">{k.name}</span> },
  { header: 'Key starts', cell: (k) => <code className="text-xs">ppk_live_{k.prefix}_…</code> },
  { header: 'Last used', cell: (k) => (k.lastUsedAt ? formatDateTime(k.lastUsedAt) : 'Never') },
  { header: '', cell: (k) => (k.revokedAt ? <span className="text-ink-muted">Switched off {formatDateTime(k.revokedAt)}</span> : <RevokeButton tool={k} />) },
];

/** Keys for the lab's imagers and recovery software, which post progress and file lists themselves. */
export function ToolKeys() {
  const keys = useToolKeys();
  const create = useCreateToolKey();
  const [created, setCreated] = useState<CreatedApiKeyDto | null>(null);
  return (
    <Card
      title="Keys for your imaging tools"
      description="A tool with a key posts imaging progress (POST /api/lab/cases/{case}/imaging) and the recovered-file list (…/manifest) for your lab’s cases."
    >
      <div className="flex flex-col gap-4">
        {created ? (
          <Alert tone="success" live="polite" title={`Key for “${created.name}”: copy it now, it is not shown again`}>
            <code className="block break-all select-all">{created.key}</code>
          </Alert>
        ) : null}
        <Form
          schema={createLabKeyInput}
          className="flex-row flex-wrap items-end gap-3"
          aria-label="New tool key"
          onSubmit={async (values, form) => {
            setCreated(await create.mutateAsync(values));
            form.reset({ name: '' });
          }}
        >
          {({ register, formState: { errors } }) => (
            <>
              <Input label="Tool name" placeholder="Imager bay 2" className="w-64" error={errors.name?.message} {...register('name')} />
              <Button type="submit" variant="secondary" isLoading={create.isPending}>
                Create a key
              </Button>
            </>
          )}
        </Form>
        {keys.isPending ? (
          <Spinner label="Loading the keys" />
        ) : keys.data ? (
          <Table caption="Tool keys" columns={columns} rows={keys.data} rowKey={(k) => k.id} empty="No tool has a key yet." />
        ) : null}
      </div>
    </Card>
  );
}
