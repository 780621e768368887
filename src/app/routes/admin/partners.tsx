import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Partners"
      description="Repair shops and resellers that refer cases to the network."
      upcoming={[
        'Every shop with its staff count, open cases and commission plan.',
        'Onboarding a new shop and changing its commission plan.',
      ]}
    />
  );
}
