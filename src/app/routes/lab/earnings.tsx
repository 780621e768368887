import { EarningsPage, earningsLoader } from '@/features/earnings/components/earnings-page';

export const clientLoader = earningsLoader('lab');

export default function LabEarningsPage() {
  return (
    <EarningsPage payee="lab" description="The lab’s share of every recovery its customers have paid for, settled once a month to the lab’s payout account." />
  );
}
