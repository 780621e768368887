import { shipmentStatusLabels, type ShipmentStatus } from '@shared/schemas/shipping';
import { Badge, type BadgeTone } from '@/components/ui/badge';

const tones: Record<ShipmentStatus, BadgeTone> = {
  awaiting_purchase: 'neutral',
  label_issued: 'info',
  in_transit: 'brand',
  out_for_delivery: 'brand',
  delivered: 'success',
  exception: 'danger',
  returned: 'warning',
  voided: 'neutral',
};

/** A shipment's status in words (the colour only repeats them). */
export function ShipmentStatusBadge({ status, overdue = false }: { status: ShipmentStatus; overdue?: boolean }) {
  return (
    <span className="inline-flex flex-wrap gap-1.5">
      <Badge tone={tones[status]}>{shipmentStatusLabels[status]}</Badge>
      {overdue ? <Badge tone="warning">Overdue</Badge> : null}
    </span>
  );
}
