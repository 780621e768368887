import { useSearchParams } from 'react-router';
import { PageHeader } from '@/components/layouts/page-header';
import { CheckInStation } from '@/features/receiving/components/check-in-station';

export default function CheckInPage() {
  const [params] = useSearchParams();
  const code = params.get('code') ?? undefined;
  return (
    <>
      <PageHeader title="Check in a box" description="Scan or type the tracking code or the case reference, then record the box, its seal, its contents and the battery." />
      <CheckInStation key={code ?? ''} initialCode={code} />
    </>
  );
}
