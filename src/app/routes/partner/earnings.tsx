import { EarningsPage, earningsLoader } from '@/features/earnings/components/earnings-page';

export const clientLoader = earningsLoader('partner');

export default function PartnerEarningsPage() {
  return <EarningsPage payee="partner" description="Commission on every paid recovery you referred, settled once a month to your payout account." />;
}
