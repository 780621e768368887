import { useState } from 'react';
import { partnerEventTypes } from '@shared/schemas/webhooks';
import { Form } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Dialog } from '@/components/ui/dialog';
import { Input } from '@/components/ui/input';
import { createWebhookEndpointInput, useCreateWebhook, type CreatedWebhookEndpoint } from '../api/create-webhook';
import { partnerEventLabels } from './event-labels';

const FORM_ID = 'create-webhook-form';
const eventChoices = partnerEventTypes.map((type) => ({ value: type, label: partnerEventLabels[type], hint: type }));

function NewSecret({ created }: { created: CreatedWebhookEndpoint }) {
  return (
    <div className="flex flex-col gap-4">
      <Alert tone="warning" title="Copy the signing secret now: you will not see it again">
        Your system checks each request&rsquo;s <code>webhook-signature</code> header with this secret (the Standard Webhooks scheme), so it
        knows the request came from Platterpost.
      </Alert>
      <Input label="Signing secret" readOnly value={created.secret} className="[&_input]:font-mono [&_input]:text-sm" onFocus={(e) => e.currentTarget.select()} />
    </div>
  );
}

export function CreateWebhookDialog() {
  const [open, setOpen] = useState(false);
  const [created, setCreated] = useState<CreatedWebhookEndpoint | null>(null);
  const create = useCreateWebhook();
  const close = () => {
    setOpen(false);
    setCreated(null);
  };
  return (
    <>
      <Button onClick={() => setOpen(true)}>Add an endpoint</Button>
      <Dialog
        open={open}
        onClose={close}
        title={created ? 'Endpoint added' : 'Add a webhook endpoint'}
        description={created ? undefined : 'An HTTPS address on your side that we notify when your cases change (plain http only for localhost while developing).'}
        footer={
          created ? (
            <Button onClick={close}>I have copied it</Button>
          ) : (
            <>
              <Button variant="secondary" onClick={close}>
                Cancel
              </Button>
              <Button type="submit" form={FORM_ID} isLoading={create.isPending}>
                Add endpoint
              </Button>
            </>
          )
        }
      >
        {created ? (
          <NewSecret created={created} />
        ) : (
          <Form
            id={FORM_ID}
            schema={createWebhookEndpointInput}
            defaultValues={{ url: '', description: '', events: ['referral.created', 'referral.accepted', 'shipment.delivered', 'referral.received'] }}
            aria-label="Add a webhook endpoint"
            onSubmit={async (values) => setCreated(await create.mutateAsync(values))}
          >
            {({ register, formState }) => (
              <div className="flex flex-col gap-4">
                <Input label="Endpoint URL" placeholder="https://tickets.example.com/platterpost" autoComplete="off" error={formState.errors.url?.message} {...register('url')} />
                <Input label="Description" optional placeholder="e.g. Front-desk ticketing" error={formState.errors.description?.message} {...register('description')} />
                <ChoiceGroup type="checkbox" legend="Events to send" columns={2} choices={eventChoices} error={formState.errors.events?.message} {...register('events')} />
              </div>
            )}
          </Form>
        )}
      </Dialog>
    </>
  );
}
