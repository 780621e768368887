import { PACKING_RULES_SOURCE } from '@shared/domain/box-presets';
import { batteryConditionSeenLabels, type BatteryConditionSeen } from '@shared/schemas/shipping';
import { PanelError } from '@/components/errors/error-panel';
import { Alert } from '@/components/ui/alert';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { toast } from '@/components/ui/toast';
import { useCan } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { createShipment } from '../api/create-shipment';
import { useCaseShipping } from '../api/get-case-shipping';
import { BoxAndRates } from './box-and-rates';
import { ShipmentCard } from './shipment-card';

/**
 * The shop's "Ship" section on a case: the lithium battery and packing rules where the shop packs, the
 * lab's receiving address, the box and its rates, the prepaid label and packing slip, and the box's
 * tracking until the lab checks it in.
 */
export function ShipSection({ referralId }: { referralId: string }) {
  const can = useCan();
  const shipping = useCaseShipping(referralId);
  if (shipping.isPending) {
    return (
      <Card title="Ship">
        <Spinner label="Loading shipping" />
      </Card>
    );
  }
  if (shipping.isError) return <PanelError title="Shipping could not be shown" onRetry={() => void shipping.refetch()} />;
  const s = shipping.data;
  const bought = s.shipments.filter((x) => x.status !== 'awaiting_purchase');
  const battery = s.battery;
  const mayBuy = can('labels.buy');
  const packing = s.canCreateLabel || bought.some((x) => x.status === 'label_issued');

  return (
    <section aria-labelledby="ship-heading" className="mt-6">
      <Card
        title={<span id="ship-heading">Ship</span>}
        description={s.destination ? `To ${s.destination.name}, prepaid by the network.` : 'The label is bought once a lab has accepted the case.'}
      >
        <div className="flex flex-col gap-5">
          {s.checkIn ? (
            s.checkIn.outcome === 'on_hold' ? (
              <Alert tone="danger" title={`On hold at ${s.checkIn.labName}`}>
                {s.checkIn.holdReason} Checked in {formatDateTime(s.checkIn.at)} by {s.checkIn.by}.
              </Alert>
            ) : (
              <Alert tone="success" title={`Received at ${s.checkIn.labName}`}>
                Checked in {formatDateTime(s.checkIn.at)} by {s.checkIn.by}: box {s.checkIn.boxCondition}
                {s.checkIn.sealNumber ? `, seal ${s.checkIn.sealNumber} ${s.checkIn.sealIntact ? 'intact' : 'broken'}` : ''}
                {s.checkIn.batteryCondition ? `, battery ${batteryConditionSeenLabels[s.checkIn.batteryCondition as BatteryConditionSeen].toLowerCase()}` : ''}.
              </Alert>
            )
          ) : null}

          {battery && packing ? (
            <div className="flex flex-col gap-2">
              {battery.contactLabFirst ? (
                <Alert tone="danger" title="Fire risk: call the lab before the box ships">
                  {battery.cautions.find((c) => c.code === 'battery_fire_risk')?.message}
                </Alert>
              ) : null}
              {!battery.shippable ? (
                <Alert tone="danger" title="This battery cannot ship through the network">
                  {battery.reasons[0]}
                </Alert>
              ) : null}
              {battery.shippable && !battery.airAllowed ? <Alert tone="warning">Only ground services are offered for this battery.</Alert> : null}
              {battery.markText ? (
                <Alert tone="info" title="Lithium battery mark">
                  Put this mark on the outside of the box: <strong>{battery.markText}</strong>. It is printed on the packing slip too.
                </Alert>
              ) : null}
              <ul className="list-disc pl-5 text-sm text-ink">
                {battery.cautions
                  .filter((c) => c.code !== 'battery_fire_risk')
                  .map((c) => (
                    <li key={c.code}>{c.message}</li>
                  ))}
              </ul>
            </div>
          ) : null}

          {packing ? (
            <div>
              <h3 className="text-sm font-semibold text-ink-strong">Packing rules</h3>
              <ul className="mt-1 list-disc pl-5 text-sm text-ink">
                {s.packingRules.map((rule) => (
                  <li key={rule}>{rule}</li>
                ))}
              </ul>
              <p className="mt-1 text-xs text-ink-muted">{PACKING_RULES_SOURCE}</p>
            </div>
          ) : null}

          {s.destination && packing ? (
            <p className="text-sm text-ink">
              Ships to <strong>{s.destination.name}</strong>, {s.destination.lines.join(', ')}.
            </p>
          ) : null}

          {bought.map((shipment) => (
            <ShipmentCard key={shipment.id} shipment={shipment} canVoid={mayBuy && shipment.kind === 'inbound'} />
          ))}

          {s.canCreateLabel && mayBuy ? (
            <div>
              <h3 className="mb-2 text-sm font-semibold text-ink-strong">Prepaid label</h3>
              <BoxAndRates
                suggested={s.suggestedPresets}
                rate={(parcel) => createShipment({ referralId, input: { parcel } })}
                onBought={(shipment) => toast.success(`Label bought: ${shipment.carrier} ${shipment.service}, tracking ${shipment.trackingCode}`)}
              />
            </div>
          ) : !bought.length && s.blockedReason ? (
            <p className="text-sm text-ink-muted">{s.blockedReason}</p>
          ) : null}
        </div>
      </Card>
    </section>
  );
}
