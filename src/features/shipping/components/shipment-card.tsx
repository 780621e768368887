import { useState } from 'react';
import { shipmentKindLabels, type ShipmentDto } from '@shared/schemas/shipping';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { formatDateTime, formatMoney } from '@/lib/format';
import { downloadDocument } from '../api/download-document';
import { useVoidShipment } from '../api/void-shipment';
import { ShipmentStatusBadge } from './shipment-status-badge';

/** One box: where it stands, its last scan, its documents, and voiding while the carrier has not scanned it. */
export function ShipmentCard({ shipment, canVoid }: { shipment: ShipmentDto; canVoid: boolean }) {
  const voiding = useVoidShipment();
  const [problem, setProblem] = useState<string | null>(null);
  const download = async (url: string, name: string) => {
    setProblem(null);
    try {
      await downloadDocument(url, name);
    } catch (error) {
      setProblem(isApiError(error) ? error.message : 'The document could not be downloaded.');
    }
  };
  return (
    <article aria-label={`Shipment ${shipment.trackingCode ?? ''}`} className="flex flex-col gap-3 rounded-control border border-ink-hairline bg-paper p-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-sm font-semibold text-ink-strong">
          {shipmentKindLabels[shipment.kind]}: {shipment.carrier} {shipment.service}
        </p>
        <ShipmentStatusBadge status={shipment.status} overdue={shipment.overdue} />
      </div>
      <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
        <div>
          <dt className="text-ink-muted">Tracking code</dt>
          <dd className="font-mono font-medium text-ink-strong">{shipment.trackingCode ?? '—'}</dd>
        </div>
        <div>
          <dt className="text-ink-muted">Paid by the network</dt>
          <dd className="font-medium text-ink-strong">{shipment.amount !== null ? formatMoney(shipment.amount, shipment.currency ?? 'USD') : '—'}</dd>
        </div>
        <div>
          <dt className="text-ink-muted">{shipment.deliveredAt ? 'Delivered' : 'Expected by'}</dt>
          <dd className="font-medium text-ink-strong">
            {shipment.deliveredAt ? formatDateTime(shipment.deliveredAt) : shipment.estimatedDeliveryAt ? formatDateTime(shipment.estimatedDeliveryAt) : '—'}
          </dd>
        </div>
        <div>
          <dt className="text-ink-muted">Latest scan</dt>
          <dd className="font-medium text-ink-strong">
            {shipment.lastEvent ? `${shipment.lastEvent.message}${shipment.lastEvent.location ? `, ${shipment.lastEvent.location}` : ''}` : '—'}
          </dd>
        </div>
      </dl>
      {shipment.batteryMarkText ? (
        <p className="text-sm text-ink">
          Battery mark on the box: <strong>{shipment.batteryMarkText}</strong>
        </p>
      ) : null}
      {shipment.signatureRequired || shipment.declaredValue !== null ? (
        <p className="text-sm text-ink-muted">
          {shipment.signatureRequired ? 'Signature on delivery. ' : ''}
          {shipment.declaredValue !== null ? `Declared value ${formatMoney(shipment.declaredValue, shipment.currency ?? 'USD')}.` : ''}
        </p>
      ) : null}
      {problem ? (
        <Alert tone="danger" live="assertive">
          {problem}
        </Alert>
      ) : null}
      <div className="flex flex-wrap gap-2">
        {shipment.labelUrl && shipment.status !== 'voided' ? (
          <Button variant="secondary" size="sm" onClick={() => void download(shipment.labelUrl!, `label-${shipment.trackingCode}.pdf`)}>
            Download label (PDF)
          </Button>
        ) : null}
        {shipment.packingSlipUrl && shipment.status !== 'voided' ? (
          <Button variant="secondary" size="sm" onClick={() => void download(shipment.packingSlipUrl!, `packing-slip-${shipment.reference}.pdf`)}>
            Download packing slip (PDF)
          </Button>
        ) : null}
        {canVoid && shipment.voidable ? (
          <Button
            variant="ghost"
            size="sm"
            isLoading={voiding.isPending}
            onClick={async () => {
              setProblem(null);
              try {
                await voiding.mutateAsync(shipment.id);
                toast.success('Label voided; the network gets the postage back.');
              } catch (error) {
                setProblem(isApiError(error) ? error.message : 'The label could not be voided.');
              }
            }}
          >
            Void label
          </Button>
        ) : null}
      </div>
      {shipment.historical ? <p className="text-xs text-ink-muted">Demo history: the carrier holds no label for this box.</p> : null}
    </article>
  );
}
