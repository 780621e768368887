import { custodyActionLabels } from '@shared/domain/custody-chain';
import type { CustodyEntryDto, CustodyLogDto } from '@shared/schemas/custody';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { formatCount, formatDateTime } from '@/lib/format';
import { useDownloadCustodyExport } from '../api/download-custody-export';

const actorWords: Record<CustodyEntryDto['actor']['type'], (name: string) => string> = {
  user: (name) => name,
  api_key: (name) => `${name} (system with an API key)`,
  system: (name) => name || 'Platterpost',
  carrier: (name) => name || 'The carrier',
  customer: () => 'The customer',
};

/** "3f7a9c12…e01b": enough to compare by eye; the whole hash is in the title and the signed PDF. */
const shortHash = (hash: string) => `${hash.slice(0, 10)}…${hash.slice(-4)}`;

function detailWords(details: Record<string, unknown>): string | null {
  const parts = Object.entries(details)
    .filter(([, value]) => value !== null && value !== '')
    .map(([key, value]) => `${key}: ${typeof value === 'string' ? value : JSON.stringify(value)}`);
  return parts.length ? parts.join(' · ') : null;
}

export function ChainStatus({ log }: { log: CustodyLogDto }) {
  const { verification } = log;
  if (verification.intact) {
    return (
      <Alert tone="success" title="Chain intact">
        {log.entries.length === 0
          ? 'No handling recorded yet.'
          : `All ${formatCount(log.entries.length, 'entry', 'entries')} match their SHA-256 hashes, each linked to the one before (checked ${formatDateTime(log.checkedAt)}).`}
      </Alert>
    );
  }
  return (
    <Alert tone="danger" title={`The log fails verification at entry ${verification.firstBrokenSequence}`}>
      {verification.reason}. Entries from there on cannot be relied on; the network admin has the database’s own record of who changed what.
    </Alert>
  );
}

function ExportButton({ log }: { log: CustodyLogDto }) {
  const download = useDownloadCustodyExport();
  if (!log.referral.legalEvidence) return null;
  if (!log.signedExportAvailable) {
    return <p className="text-sm text-ink-muted">The signed export is available once the log has entries and its chain is intact.</p>;
  }
  return (
    <Button
      variant="secondary"
      size="sm"
      isLoading={download.isPending}
      onClick={async () => {
        try {
          await download.mutateAsync({ caseId: log.referral.id, reference: log.referral.reference });
        } catch (error) {
          toast.error('The signed log could not be downloaded', isApiError(error) ? error.message : undefined);
        }
      }}
    >
      Download the signed log (PDF)
    </Button>
  );
}

/** Every handling of the device, oldest first, with who, when, where and the hash that links it to the one before. */
export function CustodyLog({ log }: { log: CustodyLogDto }) {
  return (
    <div className="flex flex-col gap-4">
      <ChainStatus log={log} />
      {log.entries.length > 0 ? (
        <ol aria-label="Custody log" className="flex flex-col divide-y divide-ink-hairline rounded-panel border border-ink-hairline">
          {log.entries.map((entry) => {
            const broken = !log.verification.intact && entry.sequence >= log.verification.firstBrokenSequence;
            const details = detailWords(entry.details);
            return (
              <li key={entry.id} className={broken ? 'bg-brick-bg/50 px-4 py-3' : 'px-4 py-3'}>
                <div className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1">
                  <p className="text-sm font-semibold text-ink-strong">
                    <span className="mr-2 font-mono text-ink-muted">{entry.sequence}.</span>
                    {custodyActionLabels[entry.action]}
                    {broken ? <span className="ml-2 text-xs font-semibold text-brick-text">(not verified)</span> : null}
                  </p>
                  <time dateTime={entry.at} className="text-xs text-ink-muted">
                    {formatDateTime(entry.at)}
                  </time>
                </div>
                <p className="text-sm text-ink">
                  {actorWords[entry.actor.type](entry.actor.name)}
                  {entry.location ? <span className="text-ink-muted"> · {entry.location}</span> : null}
                </p>
                {details ? <p className="text-xs text-ink-muted">{details}</p> : null}
                <p className="mt-1 text-xs text-ink-faint">
                  SHA-256 <code title={entry.hash} className="font-mono">{shortHash(entry.hash)}</code>
                </p>
              </li>
            );
          })}
        </ol>
      ) : null}
      <ExportButton log={log} />
    </div>
  );
}
