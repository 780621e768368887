import { useState } from 'react';
import { declineReasonLabels } from '@shared/schemas/referrals';
import { declineAfterArrivalInput, shippingAddressInput, type OutboundItemDto } from '@shared/schemas/shipping';
import { mediaTypeLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Textarea } from '@/components/ui/textarea';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { useCan } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { BoxAndRates } from '@/features/shipping/components/box-and-rates';
import { ShipmentCard } from '@/features/shipping/components/shipment-card';
import { createReturn, createTransfer } from '../api/create-outbound-shipment';
import { useDeclineAfterArrival } from '../api/decline-after-arrival';
import { releaseHoldInput, useReleaseHold } from '../api/release-hold';
import { useOutbound } from '../api/get-outbound';

const afterArrivalReasons = declineAfterArrivalInput.shape.reason.options;

function DeclineAfterArrival({ item }: { item: OutboundItemDto }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState<string>('');
  const [note, setNote] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const decline = useDeclineAfterArrival();
  if (!open) {
    return (
      <Button variant="ghost" size="sm" onClick={() => setOpen(true)}>
        Decline and transfer
      </Button>
    );
  }
  return (
    <form
      className="flex flex-col gap-3 rounded-control border border-ink-hairline p-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const parsed = declineAfterArrivalInput.safeParse({ reason, ...(note.trim() ? { note: note.trim() } : {}) });
        if (!parsed.success) return setProblem('Choose a reason.');
        try {
          await decline.mutateAsync({ referralId: item.referralId, input: parsed.data });
          toast.success(`${item.reference} goes to the next lab; ship the transfer once a lab accepts.`);
          setOpen(false);
        } catch (error) {
          setProblem(isApiError(error) ? error.message : 'The case could not be declined.');
        }
      }}
    >
      <Select label="Why your lab cannot do it" placeholder="Choose" value={reason} onChange={(e) => setReason(e.target.value)} options={afterArrivalReasons.map((r) => ({ value: r, label: declineReasonLabels[r] }))} />
      <Textarea label="Note for the network" optional rows={2} value={note} onChange={(e) => setNote(e.target.value)} />
      {problem ? <Alert tone="danger">{problem}</Alert> : null}
      <div className="flex gap-2">
        <Button type="submit" variant="danger" isLoading={decline.isPending}>
          Decline after arrival
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Keep the case
        </Button>
      </div>
    </form>
  );
}

/** A case held at check-in goes on to the bench once the manager says what settled it. */
function ReleaseHold({ item }: { item: OutboundItemDto }) {
  const [note, setNote] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const release = useReleaseHold();
  return (
    <form
      className="flex flex-col gap-3 rounded-control border border-ink-hairline p-3"
      onSubmit={async (e) => {
        e.preventDefault();
        const parsed = releaseHoldInput.safeParse({ note });
        if (!parsed.success) return setProblem(parsed.error.issues[0]?.message ?? 'Say what settled the hold.');
        try {
          await release.mutateAsync({ referralId: item.referralId, input: parsed.data });
          toast.success(`${item.reference} is received and can go to the bench.`);
          setNote('');
          setProblem(null);
        } catch (error) {
          setProblem(isApiError(error) ? error.message : 'The hold could not be released.');
        }
      }}
    >
      <p className="text-sm text-ink-muted">
        Release the hold once it is settled. Keep a swollen or leaking battery isolated in its non-combustible container until it is removed by
        someone trained for it; local rules for damaged lithium cells apply.
      </p>
      <Textarea label="What settled it (the shop sees this)" rows={2} value={note} onChange={(e) => setNote(e.target.value)} />
      {problem ? <Alert tone="danger">{problem}</Alert> : null}
      <div>
        <Button type="submit" isLoading={release.isPending}>
          Release the hold
        </Button>
      </div>
    </form>
  );
}

function ReturnForm({ item }: { item: OutboundItemDto }) {
  const [toCustomer, setToCustomer] = useState(false);
  const [signature, setSignature] = useState(true);
  const [declared, setDeclared] = useState('');
  const [address, setAddress] = useState({ name: '', street1: '', city: '', state: '', zip: '' });
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <div className="flex flex-col gap-3">
      <Checkbox label="Ship it to the customer’s address (not the shop)" checked={toCustomer} onChange={(e) => setToCustomer(e.target.checked)} />
      {toCustomer ? (
        <div className="grid gap-3 sm:grid-cols-2">
          {(['name', 'street1', 'city', 'state', 'zip'] as const).map((f) => (
            <Input key={f} label={{ name: 'Name', street1: 'Street', city: 'City', state: 'State', zip: 'ZIP code' }[f]} value={address[f]} onChange={(e) => setAddress({ ...address, [f]: e.target.value })} />
          ))}
        </div>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-2">
        <Checkbox label="Signature on delivery" checked={signature} onChange={(e) => setSignature(e.target.checked)} />
        <Input label="Declared value (USD)" optional inputMode="decimal" value={declared} onChange={(e) => setDeclared(e.target.value)} />
      </div>
      {problem ? <Alert tone="danger">{problem}</Alert> : null}
      <BoxAndRates
        suggested={['small', 'drive', 'handheld', 'large']}
        buyLabel="Buy return label"
        rate={async (parcel) => {
          setProblem(null);
          const addr = toCustomer ? shippingAddressInput.safeParse(address) : null;
          if (addr && !addr.success) {
            setProblem('Fill in the customer’s full address.');
            throw new Error('address');
          }
          return createReturn(item.referralId, {
            destination: toCustomer ? 'customer' : 'shop',
            ...(addr?.success ? { address: addr.data } : {}),
            parcel,
            signatureRequired: signature,
            ...(declared ? { declaredValue: Math.round(Number(declared) * 100) } : {}),
          });
        }}
        onBought={(s) => toast.success(`Return label bought, tracking ${s.trackingCode}`)}
      />
    </div>
  );
}

function Item({ item }: { item: OutboundItemDto }) {
  const can = useCan();
  const [shipping, setShipping] = useState(false);
  const sent = item.shipment && item.shipment.status !== 'awaiting_purchase';
  return (
    <Card
      headingLevel={2}
      title={`${item.reference} · ${mediaTypeLabels[item.mediaType]}`}
      description={`${item.purpose === 'transfer' ? `Transfer${item.toLabName ? ` to ${item.toLabName}` : ''}` : `Return to ${item.shopName}`} · checked in ${formatDateTime(item.checkedInAt)}`}
    >
      <div className="flex flex-col gap-3">
        {item.waitingFor ? <Alert tone="info">{item.waitingFor}</Alert> : null}
        {item.caseStatus === 'on_hold' && can('offers.respond') ? <ReleaseHold item={item} /> : null}
        {sent ? <ShipmentCard shipment={item.shipment!} canVoid={can('outbound.ship')} /> : null}
        {!sent && item.ready && can('outbound.ship') ? (
          shipping ? (
            item.purpose === 'transfer' ? (
              <BoxAndRates
                suggested={['small', 'drive', 'handheld', 'large']}
                buyLabel="Buy transfer label"
                rate={(parcel) => createTransfer(item.referralId, { parcel })}
                onBought={(s) => toast.success(`Transfer label bought, tracking ${s.trackingCode}`)}
              />
            ) : (
              <ReturnForm item={item} />
            )
          ) : (
            <div className="flex flex-wrap gap-2">
              <Button size="sm" onClick={() => setShipping(true)}>
                {item.purpose === 'transfer' ? 'Ship the transfer' : 'Ship it back'}
              </Button>
              {item.purpose === 'return' && can('offers.respond') ? <DeclineAfterArrival item={item} /> : null}
            </div>
          )
        ) : null}
      </div>
    </Card>
  );
}

/** Devices the lab holds and the boxes it sent lately. */
export function OutboundList() {
  const outbound = useOutbound();
  if (outbound.isPending) return <Spinner label="Loading" />;
  if (outbound.isError) return <PanelError title="The outbound list could not be loaded" onRetry={() => void outbound.refetch()} />;
  if (outbound.data.data.length === 0) return <p className="text-sm text-ink-muted">Your lab holds no devices to send on right now.</p>;
  return (
    <div className="flex flex-col gap-4">
      {outbound.data.data.map((item) => (
        <Item key={item.referralId} item={item} />
      ))}
    </div>
  );
}
