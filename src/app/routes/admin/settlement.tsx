import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Settlement"
      description="Monthly commission runs: what each shop is owed and what has been paid."
      upcoming={[
        'The current month’s draft run, with each shop’s total and the cases behind it.',
        'Past runs, their statements and the payouts they produced.',
      ]}
    />
  );
}
