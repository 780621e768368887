import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Audit"
      description="A record of who changed what, and when, across the network."
      upcoming={[
        'Searchable entries by person, organisation, case and date.',
        'Exports for a dispute or a review.',
      ]}
    />
  );
}
