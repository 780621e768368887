import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Labs"
      description="Recovery labs in the network: their skills, certificates and queues."
      upcoming={[
        'Every lab with its status, clean-air class and certificate dates.',
        'Onboarding a new lab and pausing one that cannot take work.',
      ]}
    />
  );
}
