import { useParams } from 'react-router';
import { PlaceholderPage } from '@/components/layouts/placeholder-page';

export default function CasePage() {
  const { caseId = '' } = useParams();
  return (
    <PlaceholderPage
      title={`Case ${caseId}`}
      description="Everything about one referral, from intake to the returned data."
      upcoming={[
        'The timeline of the case: every change, who made it and when.',
        'The shipping label, packing rules for this device and the box’s tracking.',
        'The lab’s findings and quote, and the customer’s private link.',
      ]}
    />
  );
}
