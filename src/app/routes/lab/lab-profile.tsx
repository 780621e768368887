import type { QueryClient } from '@tanstack/react-query';
import { PanelError } from '@/components/errors/error-panel';
import { PageHeader } from '@/components/layouts/page-header';
import { Alert } from '@/components/ui/alert';
import { PageSpinner } from '@/components/ui/spinner';
import { getLabProfileQueryOptions, useLabProfile } from '@/features/lab-profile/api/get-lab-profile';
import { CleanAirCertificates } from '@/features/lab-profile/components/clean-air-certificates';
import { LabProfileForm } from '@/features/lab-profile/components/lab-profile-form';

export const clientLoader = (queryClient: QueryClient) => async () => {
  await queryClient.ensureQueryData(getLabProfileQueryOptions()).catch(() => undefined);
  return null;
};

export default function LabProfilePage() {
  const profile = useLabProfile();
  return (
    <>
      <PageHeader title="Lab profile" description="What the network knows about your lab when it ranks labs for a case: skills, media, capacity, hours, agreements and clean air." />
      {profile.isPending ? (
        <PageSpinner label="Loading your lab profile" />
      ) : profile.isError ? (
        <PanelError title="Your lab profile could not be loaded" onRetry={() => void profile.refetch()} />
      ) : (
        <div className="flex flex-col gap-6">
          {!profile.data.configured ? (
            <Alert tone="warning" title="Your profile is not complete">
              Routing leaves your lab out until the profile is saved with at least one skill and one kind of device.
            </Alert>
          ) : null}
          <LabProfileForm key={profile.data.updatedAt ?? 'new'} profile={profile.data} />
          <CleanAirCertificates profile={profile.data} />
        </div>
      )}
    </>
  );
}
