import { sanitizationLevelLabels, sanitizationTechniqueLabels } from '@shared/domain/sanitization';
import { dispositionItemLabels, verificationMethodLabels, type CaseDispositionDto, type CertificateDto, type DispositionDto } from '@shared/schemas/disposition';
import { mediaTypeLabels } from '@shared/vocabulary';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatFileSize } from '@/lib/format';
import { useDownloadCertificate } from '../api/download-certificate';

export function CertificateButton({ certificate }: { certificate: CertificateDto }) {
  const download = useDownloadCertificate();
  return (
    <Button
      size="sm"
      variant="secondary"
      isLoading={download.isPending}
      onClick={async () => {
        try {
          await download.mutateAsync(certificate);
        } catch (error) {
          toast.error('The certificate could not be downloaded', isApiError(error) ? error.message : undefined);
        }
      }}
    >
      Download certificate {certificate.number}
    </Button>
  );
}

function Summary({ d }: { d: DispositionDto }) {
  if (d.sanitization) {
    const s = d.sanitization;
    return (
      <p className="text-sm text-ink">
        {sanitizationLevelLabels[s.level]} by {sanitizationTechniqueLabels[s.technique].toLowerCase()} with {s.tool.name}
        {s.techniqueDetails ? ` (${s.techniqueDetails})` : ''}; verified by {verificationMethodLabels[s.verification.method].toLowerCase()}.
        {s.destination ? ` Then: ${s.destination}.` : ''}
      </p>
    );
  }
  return (
    <p className="text-sm text-ink">
      Returned to the {d.returned!.to}
      {d.returned!.trackingCode ? `, tracking ${d.returned!.trackingCode}` : ''}.
    </p>
  );
}

/** What became of the media, each item with who did it and its certificate. */
export function DispositionList({ record }: { record: CaseDispositionDto }) {
  if (record.dispositions.length === 0) {
    return <p className="text-sm text-ink-muted">Nothing recorded yet: the original media is still at the lab.</p>;
  }
  return (
    <ul aria-label="Media disposition" className="flex flex-col gap-3">
      {record.dispositions.map((d) => (
        <li key={d.id} className="rounded-panel border border-ink-hairline px-4 py-3">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <p className="text-sm font-semibold text-ink-strong">
              {dispositionItemLabels[d.item]}: {d.description}
              {d.serialNumber ? <span className="font-normal text-ink-muted"> · serial {d.serialNumber}</span> : null}
            </p>
            <Badge tone={d.outcome === 'sanitized' ? 'success' : 'info'}>{d.outcome === 'sanitized' ? 'Sanitized' : 'Returned'}</Badge>
          </div>
          <p className="text-xs text-ink-muted">
            {mediaTypeLabels[d.mediaType]} · {d.performedBy.name}, {d.lab.name} · <time dateTime={d.performedAt}>{formatDateTime(d.performedAt)}</time> · custody entry {d.custodySequence}
          </p>
          <Summary d={d} />
          {d.certificate ? (
            <div className="mt-2 flex flex-wrap items-center gap-3">
              <CertificateButton certificate={d.certificate} />
              <span className="text-xs text-ink-muted">
                PDF, {formatFileSize(d.certificate.sizeBytes)}, SHA-256 <code title={d.certificate.sha256}>{d.certificate.sha256.slice(0, 12)}…</code>
              </span>
            </div>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
