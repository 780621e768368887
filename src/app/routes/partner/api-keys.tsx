import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="API keys"
      description="Keys that let your ticketing system open referrals and read their status."
      upcoming={[
        'Your shop’s keys, when each was last used, and a way to create or revoke one.',
        'A short guide to opening a referral from your own system.',
      ]}
    />
  );
}
