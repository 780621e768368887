import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Needs attention"
      description="Cases that no lab can take or that are stuck, and need a person to decide."
      upcoming={[
        'Cases with no matching lab, and the reasons each lab was left out.',
        'Boxes on hold, disputes raised by a shop or a customer, and overdue returns.',
      ]}
    />
  );
}
