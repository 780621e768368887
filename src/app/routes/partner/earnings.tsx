import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Earnings"
      description="Commission your shop has earned on paid recoveries, settled once a month."
      upcoming={[
        'This month’s running commission and the cases it comes from.',
        'Monthly statements you can reconcile line by line, and the payout account they are paid to.',
      ]}
    />
  );
}
