import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Network overview"
      description="How the network is doing today: cases moving, offers waiting and money to settle."
      upcoming={[
        'Counts of cases by stage across every lab and shop.',
        'Offers close to their deadline and labs near the limit of their queue.',
      ]}
    />
  );
}
