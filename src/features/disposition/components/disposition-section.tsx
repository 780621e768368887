import { disposableStatuses } from '@shared/schemas/disposition';
import { caseStatusLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { useCan } from '@/lib/auth';
import { useDispositions } from '../api/get-dispositions';
import { DispositionForm } from './disposition-form';
import { DispositionList } from './disposition-list';

const whenPossible = disposableStatuses.map((s) => caseStatusLabels[s].toLowerCase()).join(', ');

/** The media's disposition on a case: what was recorded, the certificates, and for the lab the form. */
export function DispositionSection({ caseId }: { caseId: string }) {
  const record = useDispositions(caseId);
  const can = useCan();
  if (record.isPending) return <Spinner label="Loading the media disposition" />;
  if (record.isError) return <PanelError onRetry={() => void record.refetch()} />;
  const data = record.data;
  const mayRecord = can('disposition.record');
  return (
    <div className="flex flex-col gap-5">
      <DispositionList record={data} />
      {mayRecord && (data.acceptsOriginal || data.acceptsFailedParts) ? (
        // A fresh form after each record: the choices (original or failed part) change with it.
        <DispositionForm key={data.dispositions.length} record={data} />
      ) : null}
      {mayRecord && !data.acceptsOriginal && !data.acceptsFailedParts ? (
        <p className="text-sm text-ink-muted">The media is returned or sanitized once the work on the case is over ({whenPossible}).</p>
      ) : null}
    </div>
  );
}
