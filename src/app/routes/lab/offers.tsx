import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Offers"
      description="Cases the network has offered to your lab, each with a deadline to accept or decline."
      upcoming={[
        'Open offers with the device, the skills it needs and the time left to answer.',
        'Accept or decline with a reason; an offer nobody answers moves to the next lab by itself.',
      ]}
    />
  );
}
