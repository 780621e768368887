import { PanelError } from '@/components/errors/error-panel';
import { ErrorBoundary } from '@/components/errors/error-boundary';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { useCan } from '@/lib/auth';
import { DispositionSection } from '@/features/disposition';
import { useCustody } from '../api/get-custody';
import { CustodyLog } from './custody-log';
import { RecordCustodyForm } from './record-custody-form';

function CustodySection({ caseId }: { caseId: string }) {
  const log = useCustody(caseId);
  const can = useCan();
  if (log.isPending) return <Spinner label="Loading the custody log" />;
  if (log.isError) return <PanelError onRetry={() => void log.refetch()} />;
  return (
    <div className="flex flex-col gap-4">
      <CustodyLog log={log.data} />
      {can('custody.append') ? <RecordCustodyForm caseId={caseId} /> : null}
    </div>
  );
}

/**
 * The case record for the shop's and the lab's case pages: the custody log with its chain check, and
 * what became of the media with the certificates of sanitization. Each part fails on its own.
 */
export function CaseRecordPanel({ caseId }: { caseId: string }) {
  return (
    <div className="mt-6 flex flex-col gap-6">
      <Card title="Chain of custody" description="Every handling of the device, each entry linked to the one before by its SHA-256 hash.">
        <ErrorBoundary fallback={({ reset }) => <PanelError onRetry={reset} />}>
          <CustodySection caseId={caseId} />
        </ErrorBoundary>
      </Card>
      <Card title="Media disposition" description="The original media and any failed parts: returned, or sanitized by NIST SP 800-88 with a certificate.">
        <ErrorBoundary fallback={({ reset }) => <PanelError onRetry={reset} />}>
          <DispositionSection caseId={caseId} />
        </ErrorBoundary>
      </Card>
    </div>
  );
}
