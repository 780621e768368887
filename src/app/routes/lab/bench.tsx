import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function Page() {
  return (
    <PlaceholderPage
      title="Bench queue"
      description="Cases in your lab waiting for evaluation, imaging or recovery."
      upcoming={[
        'The queue in order of promise date, with each case’s stage and who is working on it.',
        'Findings, imaging progress and the recovered-file list for the customer to review.',
      ]}
    />
  );
}
