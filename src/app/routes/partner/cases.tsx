import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Cases"
      description="Every referral your shop has opened, from the counter to the customer's returned data."
      upcoming={[
        'A list of your shop’s cases with their current status, the lab handling each one and when it last changed.',
        'Filters for open, waiting on the customer and closed cases, and a search by case reference or customer name.',
        'A link into each case for its timeline, shipping label and the customer’s private link.',
      ]}
    />
  );
}
