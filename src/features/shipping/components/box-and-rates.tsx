import { useState } from 'react';
import { boxPresets } from '@shared/domain/box-presets';
import { fieldErrorsFromZod } from '@shared/schemas/api-error';
import { parcelInput, type ParcelInput, type ShipmentDto } from '@shared/schemas/shipping';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Table } from '@/components/ui/table';
import { isApiError } from '@/lib/api-client';
import { formatDays, formatMoney } from '@/lib/format';
import { useBuyShipment } from '../api/buy-shipment';

const CUSTOM = 'custom';

/**
 * Pick a box (a preset, or your own outer size) and its packed weight, see the rates, buy one. `rate` asks
 * the server for rates of this box (a label to the lab, a return or a transfer); buying is the same for all.
 */
export function BoxAndRates({
  suggested,
  rate,
  onBought,
  buyLabel = 'Buy label',
}: {
  suggested: readonly string[];
  rate: (parcel: ParcelInput) => Promise<ShipmentDto>;
  onBought?: (shipment: ShipmentDto) => void;
  buyLabel?: string;
}) {
  const first = boxPresets.find((b) => suggested.includes(b.id)) ?? boxPresets[1];
  const [preset, setPreset] = useState<string>(first.id);
  const [dims, setDims] = useState({ lengthIn: '', widthIn: '', heightIn: '' });
  const [weight, setWeight] = useState(String(first.typicalPackedWeightLb));
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [quote, setQuote] = useState<ShipmentDto | null>(null);
  const [rating, setRating] = useState(false);
  const buy = useBuyShipment();

  const getRates = async () => {
    setProblem(null);
    setQuote(null);
    const parcel = {
      ...(preset === CUSTOM ? { lengthIn: Number(dims.lengthIn) || undefined, widthIn: Number(dims.widthIn) || undefined, heightIn: Number(dims.heightIn) || undefined } : { boxPreset: preset }),
      weightLb: Number(weight) || undefined,
    };
    const parsed = parcelInput.safeParse(parcel);
    if (!parsed.success) {
      setErrors(Object.fromEntries(fieldErrorsFromZod(parsed.error).map((f) => [f.path, f.message])));
      return;
    }
    setErrors({});
    setRating(true);
    try {
      setQuote(await rate(parsed.data as ParcelInput));
    } catch (error) {
      if (isApiError(error) && error.fields.length) {
        setErrors(Object.fromEntries(error.fields.map((f) => [f.path.replace(/^parcel\./, ''), f.message])));
      }
      setProblem(isApiError(error) ? error.message : 'The rates could not be loaded.');
    } finally {
      setRating(false);
    }
  };

  const options = [
    ...boxPresets.map((b) => ({
      value: b.id,
      label: `${b.label}, ${b.inner.lengthIn} × ${b.inner.widthIn} × ${b.inner.heightIn} in inside${suggested.includes(b.id) ? '' : ' (too small for this device with cushioning)'}`,
      disabled: !suggested.includes(b.id),
    })),
    { value: CUSTOM, label: 'My own box (outer size)' },
  ];

  return (
    <div className="flex flex-col gap-4">
      <form
        className="grid gap-4 sm:grid-cols-2"
        aria-label="Box and weight"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          void getRates();
        }}
      >
        <Select label="Box" value={preset} onChange={(e) => setPreset(e.target.value)} options={options} hint={boxPresets.find((b) => b.id === preset)?.description} />
        <Input
          label="Packed weight (lb)"
          inputMode="decimal"
          value={weight}
          onChange={(e) => setWeight(e.target.value)}
          error={errors.weightLb}
          hint="Weigh the packed box."
        />
        {preset === CUSTOM ? (
          <div className="grid gap-4 sm:col-span-2 sm:grid-cols-3">
            {(['lengthIn', 'widthIn', 'heightIn'] as const).map((field) => (
              <Input
                key={field}
                label={`${field === 'lengthIn' ? 'Length' : field === 'widthIn' ? 'Width' : 'Height'} (in)`}
                inputMode="decimal"
                value={dims[field]}
                onChange={(e) => setDims({ ...dims, [field]: e.target.value })}
                error={errors[field]}
              />
            ))}
          </div>
        ) : null}
        <div className="sm:col-span-2">
          <Button type="submit" variant="secondary" isLoading={rating}>
            Get rates
          </Button>
        </div>
      </form>
      {problem ? (
        <Alert tone="danger" live="assertive">
          {problem}
        </Alert>
      ) : null}
      {quote ? (
        <div className="flex flex-col gap-2">
          <p className="text-sm text-ink-muted">
            Billed at {quote.parcel.billableLb} lb (the larger of the weight and the size ÷ 139 in³ per lb). Prepaid by the network.
          </p>
          <Table
            caption="Rates for this box"
            rows={quote.rates}
            rowKey={(r) => r.id}
            empty="No carrier offers a service for this box."
            columns={[
              { header: 'Carrier', cell: (r) => r.carrier },
              { header: 'Service', cell: (r) => r.service },
              { header: 'Ground or air', cell: (r) => (r.mode === 'air' ? 'Air' : 'Ground') },
              { header: 'Transit', cell: (r) => formatDays(r.transitDays) },
              { header: 'Price', cell: (r) => formatMoney(r.amount, r.currency), className: 'text-right tabular-nums' },
              {
                header: <span className="sr-only">Buy</span>,
                cell: (r) => (
                  <Button
                    size="sm"
                    isLoading={buy.isPending && buy.variables?.rateId === r.id}
                    disabled={buy.isPending}
                    aria-label={`${buyLabel}: ${r.carrier} ${r.service}, ${formatMoney(r.amount, r.currency)}`}
                    onClick={async () => {
                      setProblem(null);
                      try {
                        const bought = await buy.mutateAsync({ shipmentId: quote.id, rateId: r.id });
                        setQuote(null);
                        onBought?.(bought);
                      } catch (error) {
                        setProblem(isApiError(error) ? error.message : 'The label could not be bought. Try again; it will not be bought twice.');
                      }
                    }}
                  >
                    {buyLabel}
                  </Button>
                ),
              },
            ]}
          />
        </div>
      ) : null}
    </div>
  );
}
