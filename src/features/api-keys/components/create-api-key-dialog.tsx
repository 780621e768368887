import type { CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { Form } from '@/components/form/form';
import { ShownOnceDialog, ShownOnceSecret } from '@/components/secret/shown-once';
import { Input } from '@/components/ui/input';
import { createApiKeyInput, useCreateApiKey } from '../api/create-api-key';

const FORM_ID = 'create-api-key-form';

export function CreateApiKeyDialog() {
  const create = useCreateApiKey();
  return (
    <ShownOnceDialog<CreatedApiKeyDto>
      openLabel="Create a key"
      title="Create an API key"
      createdTitle="Your new API key"
      description="Give it the name of the system that will use it, so you know which key to revoke later."
      formId={FORM_ID}
      submitLabel="Create key"
      isPending={create.isPending}
      form={(onCreated) => (
        <Form id={FORM_ID} schema={createApiKeyInput} defaultValues={{ name: '' }} aria-label="Create an API key" onSubmit={async (values) => onCreated(await create.mutateAsync(values))}>
          {({ register, formState }) => (
            <Input label="Name" placeholder="e.g. Front-desk ticketing" autoComplete="off" error={formState.errors.name?.message} {...register('name')} />
          )}
        </Form>
      )}
      shown={(created) => (
        <ShownOnceSecret label={`API key “${created.name}”`} value={created.key} copyLabel="Copy key" warning="Copy the key now: you will not see it again">
          Platterpost keeps only a fingerprint of it. Store it where your ticketing system keeps its secrets. If it is lost, revoke it and create a new one.
        </ShownOnceSecret>
      )}
    />
  );
}
