import { useId, useRef, useState } from 'react';
import type { CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { createApiKeyInput, useCreateApiKey } from '../api/create-api-key';

const FORM_ID = 'create-api-key-form';

async function copyText(text: string, fallback: HTMLInputElement | null): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    // Without clipboard access (an http page, a locked-down browser) select the text instead.
    fallback?.select();
    return document.execCommand?.('copy') ?? false;
  }
}

/** The new key, shown once, with a copy button; closing the dialog forgets it. */
function NewKey({ created }: { created: CreatedApiKeyDto }) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<'yes' | 'no' | null>(null);
  const statusId = useId();
  return (
    <div className="flex flex-col gap-4">
      <Alert tone="warning" title="Copy the key now: you will not see it again">
        Platterpost keeps only a fingerprint of it. Store it where your ticketing system keeps its secrets. If it is lost, revoke it and create a new one.
      </Alert>
      <div className="flex items-end gap-2">
        <Input
          ref={input}
          label={`API key “${created.name}”`}
          readOnly
          value={created.key}
          className="min-w-0 flex-1 [&_input]:font-mono [&_input]:text-sm"
          onFocus={(event) => event.currentTarget.select()}
        />
        <Button
          variant="secondary"
          aria-describedby={statusId}
          onClick={async () => setCopied((await copyText(created.key, input.current)) ? 'yes' : 'no')}
        >
          Copy key
        </Button>
      </div>
      <p id={statusId} role="status" className="text-sm text-ink-muted">
        {copied === 'yes' ? 'Copied to the clipboard.' : copied === 'no' ? 'Copying was blocked; the key is selected, press Ctrl+C.' : ''}
      </p>
    </div>
  );
}

export function CreateApiKeyDialog() {
  const [open, setOpen] = useState(false);
  const [created, setCreated] = useState<CreatedApiKeyDto | null>(null);
  const create = useCreateApiKey();
  const close = () => {
    setOpen(false);
    setCreated(null);
  };

  return (
    <>
      <Button onClick={() => setOpen(true)}>Create a key</Button>
      <Dialog
        open={open}
        onClose={close}
        title={created ? 'Your new API key' : 'Create an API key'}
        description={created ? undefined : 'Give it the name of the system that will use it, so you know which key to revoke later.'}
        footer={
          created ? (
            <Button onClick={close}>I have copied it</Button>
          ) : (
            <>
              <Button variant="secondary" onClick={close}>
                Cancel
              </Button>
              <Button type="submit" form={FORM_ID} isLoading={create.isPending}>
                Create key
              </Button>
            </>
          )
        }
      >
        {created ? (
          <NewKey created={created} />
        ) : (
          <Form
            id={FORM_ID}
            schema={createApiKeyInput}
            defaultValues={{ name: '' }}
            aria-label="Create an API key"
            onSubmit={async (values) => setCreated(await create.mutateAsync(values))}
          >
            {({ register, formState }) => (
              <Input label="Name" placeholder="e.g. Front-desk ticketing" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
            )}
          </Form>
        )}
      </Dialog>
    </>
  );
}
