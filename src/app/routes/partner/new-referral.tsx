import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="New referral"
      description="Open a case for a customer's failed drive, phone or memory card and let the network find the right lab."
      upcoming={[
        'A short intake: the device, what happened to it, and which files matter most to the customer.',
        'Handling cautions for the device (for example: do not power a clicking drive again) before you pack it.',
        'A battery declaration for phones and tablets, and the lab the network suggests, with its reasons.',
      ]}
    />
  );
}
