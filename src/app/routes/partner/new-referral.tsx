import { PageHeader } from '@/components/layouts/page-header';
import { ReferralForm } from '@/features/referrals/components/referral-form';

export default function NewReferralPage() {
  return (
    <>
      <PageHeader
        title="New referral"
        description="Describe the device and what happened to it. The network works out the skills it needs and offers it to the lab that can get the customer’s data back soonest."
      />
      <ReferralForm />
    </>
  );
}
