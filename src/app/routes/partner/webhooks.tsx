import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Webhooks"
      description="Addresses on your side that Platterpost notifies when a case changes."
      upcoming={[
        'Your endpoints, the events each one receives, and recent deliveries with their responses.',
        'The signing secret for checking that a notification really came from Platterpost.',
      ]}
    />
  );
}
