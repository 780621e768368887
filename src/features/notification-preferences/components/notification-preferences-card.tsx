import { emailGroupLabels, emailGroups, type NotificationPreferenceDto } from '@shared/schemas/notification-preferences';
import { PanelError } from '@/components/errors/error-panel';
import { Form } from '@/components/form/form';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { Spinner } from '@/components/ui/spinner';
import { toast } from '@/components/ui/toast';
import { useNotificationPreferences } from '../api/get-notification-preferences';
import { updateNotificationPreferencesInput, useUpdateNotificationPreferences } from '../api/update-notification-preferences';

function PreferencesForm({ messages }: { messages: NotificationPreferenceDto[] }) {
  const update = useUpdateNotificationPreferences();
  const choosable = messages.filter((m) => !m.required);
  return (
    <Form
      schema={updateNotificationPreferencesInput}
      aria-label="E-mail preferences"
      defaultValues={{ preferences: Object.fromEntries(choosable.map((m) => [m.template, m.enabled])) }}
      onSubmit={async (values, form) => {
        const saved = await update.mutateAsync(values);
        form.reset({ preferences: Object.fromEntries(saved.messages.filter((m) => !m.required).map((m) => [m.template, m.enabled])) });
        toast.success('E-mail preferences saved');
      }}
    >
      {({ register, formState }) => (
        <div className="flex flex-col gap-5">
          {emailGroups.map((group) => {
            const inGroup = messages.filter((m) => m.group === group);
            if (inGroup.length === 0) return null;
            return (
              <fieldset key={group} className="flex flex-col gap-3">
                <legend className="mb-1 text-sm font-semibold text-ink-strong">{emailGroupLabels[group]}</legend>
                {inGroup.map((m) =>
                  m.required ? (
                    <Checkbox
                      key={m.template}
                      label={m.label}
                      hint={`${m.description} Always sent: your account’s security needs it.`}
                      checked
                      disabled
                      readOnly
                    />
                  ) : (
                    <Checkbox key={m.template} label={m.label} hint={m.description} {...register(`preferences.${m.template}`)} />
                  ),
                )}
              </fieldset>
            );
          })}
          <div>
            <Button type="submit" isLoading={update.isPending} disabled={!formState.isDirty}>
              Save e-mail preferences
            </Button>
          </div>
        </div>
      )}
    </Form>
  );
}

/** The profile page's e-mail choices. */
export function NotificationPreferencesCard() {
  const preferences = useNotificationPreferences();
  return (
    <Card title="E-mail" description="Choose which messages Platterpost e-mails you. The case pages show everything either way.">
      {preferences.isPending ? (
        <Spinner label="Loading your e-mail preferences" />
      ) : preferences.isError ? (
        <PanelError onRetry={() => void preferences.refetch()} />
      ) : (
        <PreferencesForm messages={preferences.data.messages} />
      )}
    </Card>
  );
}
