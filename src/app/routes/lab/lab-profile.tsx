import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Lab profile"
      description="What the network knows about your lab when it ranks labs for a case."
      upcoming={[
        'Your skills, clean-air certificate, weekly capacity and prices.',
        'Opening hours and time zone, which set the deadlines for answering offers.',
      ]}
    />
  );
}
