import { partnerEventTypes } from '@shared/schemas/webhooks';
import { Form } from '@/components/form/form';
import { ShownOnceDialog, ShownOnceSecret } from '@/components/secret/shown-once';
import { ChoiceGroup } from '@/components/ui/choice-group';
import { Input } from '@/components/ui/input';
import { createWebhookEndpointInput, useCreateWebhook, type CreatedWebhookEndpoint } from '../api/create-webhook';
import { partnerEventLabels } from './event-labels';

const FORM_ID = 'create-webhook-form';
const eventChoices = partnerEventTypes.map((type) => ({ value: type, label: partnerEventLabels[type], hint: type }));

export function CreateWebhookDialog() {
  const create = useCreateWebhook();
  return (
    <ShownOnceDialog<CreatedWebhookEndpoint>
      openLabel="Add an endpoint"
      title="Add a webhook endpoint"
      createdTitle="Endpoint added"
      description="An HTTPS address on your side that we notify when your cases change (plain http only for localhost while developing)."
      formId={FORM_ID}
      submitLabel="Add endpoint"
      isPending={create.isPending}
      form={(onCreated) => (
        <Form
          id={FORM_ID}
          schema={createWebhookEndpointInput}
          defaultValues={{ url: '', description: '', events: ['referral.created', 'referral.accepted', 'shipment.delivered', 'referral.received'] }}
          aria-label="Add a webhook endpoint"
          onSubmit={async (values) => onCreated(await create.mutateAsync(values))}
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
      shown={(created) => (
        <ShownOnceSecret label="Signing secret" value={created.secret} copyLabel="Copy secret" warning="Copy the signing secret now: you will not see it again">
          Your system checks each request&rsquo;s <code>webhook-signature</code> header with this secret (the Standard Webhooks scheme), so it knows the
          request came from Platterpost.
        </ShownOnceSecret>
      )}
    />
  );
}
