import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Inbound boxes"
      description="Boxes on their way to your lab, by tracking status, and the check-in for each arrival."
      upcoming={[
        'Every expected box with its carrier status and estimated arrival.',
        'Check-in on arrival: condition, seal and photos, with a hold when a box or battery is damaged.',
      ]}
    />
  );
}
