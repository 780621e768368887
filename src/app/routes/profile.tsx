import { roleLabels } from '@shared/vocabulary';
import { PageHeader } from '@/components/layouts/page-header';
import { Card } from '@/components/ui/card';
import { useUser } from '@/lib/auth';
import { ChangePasswordForm } from '@/features/auth/components/change-password-form';
import { NotificationPreferencesCard } from '@/features/notification-preferences/components/notification-preferences-card';

export default function ProfilePage() {
  const user = useUser();
  const details: [string, string][] = [
    ['Name', user.name],
    ['E-mail', user.email],
    ['Role', roleLabels[user.role]],
    ['Organisation', user.organization.name],
  ];
  return (
    <>
      <PageHeader title="Your profile" description="How you sign in to Platterpost and who you work for." />
      <div className="grid items-start gap-6 lg:grid-cols-2">
        <Card title="Your details" description="Your organisation’s admin can change your role.">
          <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-3 text-sm">
            {details.map(([term, value]) => (
              <div key={term} className="contents">
                <dt className="text-ink-muted">{term}</dt>
                <dd className="font-semibold break-all text-ink-strong">{value}</dd>
              </div>
            ))}
          </dl>
        </Card>
        <Card title="Change password">
          <ChangePasswordForm />
        </Card>
        <NotificationPreferencesCard />
      </div>
    </>
  );
}
