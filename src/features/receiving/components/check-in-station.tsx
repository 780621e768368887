import { useEffect, useRef, useState } from 'react';
import { fieldErrorsFromZod } from '@shared/schemas/api-error';
import { batteryConditionSeenLabels, batteryConditionsSeen, checkInInput, type CheckInLookupDto, type CheckInResultDto } from '@shared/schemas/shipping';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Checkbox } from '@/components/ui/checkbox';
import { Input } from '@/components/ui/input';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Textarea } from '@/components/ui/textarea';
import { isApiError } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { useCheckInBox } from '../api/check-in-box';
import { useLookupBox } from '../api/lookup-box';
import { checkScannedCode } from '../utils/scan';

/** Shown where the clerk opens boxes (common practice; lithium rules from memory of IATA/49 CFR). */
function OpeningSafety() {
  return (
    <Alert tone="warning" title="Before you open a box">
      <ul className="list-disc pl-5">
        <li>Open it on a clear, non-combustible bench, away from anything that burns.</li>
        <li>
          A swollen, damaged, leaking, hot or smelling lithium battery is a fire risk: do not charge it or switch the device on, put it in a
          non-combustible container away from heat, and tell your lab manager.
        </li>
        <li>Check that the device came in an anti-static bag with at least 5 cm of cushioning on every side; note it below when it did not.</li>
        <li>These are general rules; the carrier’s rules, local regulations and your lab’s procedures decide.</li>
      </ul>
    </Alert>
  );
}

function Radios({ legend, name, value, onChange, options, error }: { legend: string; name: string; value: string; onChange: (v: string) => void; options: [string, string][]; error?: string }) {
  return (
    <fieldset>
      <legend className="text-sm font-semibold text-ink-strong">{legend}</legend>
      <div className="mt-2 flex flex-wrap gap-4">
        {options.map(([v, label]) => (
          <label key={v} className="flex items-center gap-2 text-sm text-ink">
            <input type="radio" name={name} value={v} checked={value === v} onChange={() => onChange(v)} className="focus-ring size-5 accent-spruce-600" />
            {label}
          </label>
        ))}
      </div>
      {error ? <p className="mt-1 text-sm text-brick-text">{error}</p> : null}
    </fieldset>
  );
}

function CheckInForm({ found, onDone }: { found: CheckInLookupDto; onDone: (r: CheckInResultDto) => void }) {
  const [boxCondition, setBoxCondition] = useState('intact');
  const [noSeal, setNoSeal] = useState(false);
  const [sealNumber, setSealNumber] = useState('');
  const [sealIntact, setSealIntact] = useState('yes');
  const [contentsMatch, setContentsMatch] = useState('yes');
  const [contentsNote, setContentsNote] = useState('');
  const [battery, setBattery] = useState('');
  const [note, setNote] = useState('');
  const [photos, setPhotos] = useState<File[]>([]);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const checkIn = useCheckInBox();

  const submit = async () => {
    setProblem(null);
    const input = {
      referralId: found.referral.id,
      ...(found.shipment ? { shipmentId: found.shipment.id } : {}),
      boxCondition,
      seal: noSeal ? { present: false } : { present: true, number: sealNumber.trim() || undefined, intact: sealIntact === 'yes' },
      contentsMatch: contentsMatch === 'yes',
      ...(contentsNote.trim() ? { contentsNote: contentsNote.trim() } : {}),
      ...(battery ? { batteryCondition: battery } : {}),
      ...(note.trim() ? { note: note.trim() } : {}),
    };
    const parsed = checkInInput.safeParse(input);
    const missingBattery = found.referral.askBattery && !battery;
    if (!parsed.success || missingBattery) {
      const fields = parsed.success ? {} : Object.fromEntries(fieldErrorsFromZod(parsed.error).map((f) => [f.path, f.message]));
      setErrors({ ...fields, ...(missingBattery ? { batteryCondition: 'Say what the battery looks like' } : {}) });
      return;
    }
    setErrors({});
    try {
      onDone(await checkIn.mutateAsync({ input: parsed.data as never, photos }));
    } catch (error) {
      if (isApiError(error) && error.fields.length) setErrors(Object.fromEntries(error.fields.map((f) => [f.path, f.message])));
      setProblem(isApiError(error) ? error.message : 'The check-in could not be saved. Try again.');
    }
  };

  return (
    <form
      aria-label="Check-in"
      noValidate
      className="flex flex-col gap-5"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      <Radios legend="Box condition" name="boxCondition" value={boxCondition} onChange={setBoxCondition} options={[['intact', 'Intact'], ['damaged', 'Damaged']]} />
      <div className="grid gap-4 sm:grid-cols-2">
        <Input label="Seal number" value={sealNumber} onChange={(e) => setSealNumber(e.target.value)} disabled={noSeal} error={errors['seal.number']} />
        {noSeal ? null : (
          <Radios legend="Seal intact?" name="sealIntact" value={sealIntact} onChange={setSealIntact} options={[['yes', 'Yes, intact'], ['no', 'No, broken']]} error={errors['seal.intact']} />
        )}
        <Checkbox label="This box has no seal" checked={noSeal} onChange={(e) => setNoSeal(e.target.checked)} />
      </div>
      <Radios legend="Do the contents match the intake?" name="contentsMatch" value={contentsMatch} onChange={setContentsMatch} options={[['yes', 'Yes'], ['no', 'No']]} />
      {contentsMatch === 'no' ? <Textarea label="What differs" value={contentsNote} onChange={(e) => setContentsNote(e.target.value)} error={errors.contentsNote} rows={2} /> : null}
      {found.referral.askBattery ? (
        <Select
          label="Battery as you see it"
          placeholder="Choose"
          value={battery}
          onChange={(e) => setBattery(e.target.value)}
          options={batteryConditionsSeen.map((c) => ({ value: c, label: batteryConditionSeenLabels[c] }))}
          error={errors.batteryCondition}
        />
      ) : null}
      <div className="flex flex-col gap-1">
        <label htmlFor="check-in-photos" className="text-sm font-semibold text-ink-strong">
          Photos <span className="font-normal text-ink-muted">(optional, up to 8)</span>
        </label>
        <input id="check-in-photos" type="file" accept="image/jpeg,image/png,image/webp,image/heic" multiple capture="environment" onChange={(e) => setPhotos([...(e.target.files ?? [])].slice(0, 8))} />
        {errors.photos ? <p className="text-sm text-brick-text">{errors.photos}</p> : null}
      </div>
      <Textarea label="Note" optional value={note} onChange={(e) => setNote(e.target.value)} rows={2} />
      {problem ? (
        <Alert tone="danger" live="assertive">
          {problem}
        </Alert>
      ) : null}
      <div>
        <Button type="submit" isLoading={checkIn.isPending}>
          Check in
        </Button>
      </div>
    </form>
  );
}

/**
 * One input for a scanner (it types like a keyboard and ends with Enter) or a person: a tracking code, a
 * case reference or the box's SSCC. A reference with a wrong check symbol is caught here, before any look-up.
 */
export function CheckInStation({ initialCode }: { initialCode?: string }) {
  const [text, setText] = useState(initialCode ?? '');
  const [code, setCode] = useState<string | null>(null);
  const [localError, setLocalError] = useState<string | null>(null);
  const [result, setResult] = useState<CheckInResultDto | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const lookup = useLookupBox(code);

  const go = (value: string) => {
    setResult(null);
    const checked = checkScannedCode(value);
    if (!checked.ok) {
      setCode(null);
      setLocalError(checked.message);
      return;
    }
    setLocalError(null);
    setCode(checked.code);
  };
  useEffect(() => {
    if (initialCode) go(initialCode);
    input.current?.focus();
    // Only the code the page was opened with.
  }, [initialCode]);

  const next = () => {
    setText('');
    setCode(null);
    setResult(null);
    input.current?.focus();
  };
  const found = lookup.data;
  const lookupError = lookup.isError ? (isApiError(lookup.error) ? (lookup.error.fields[0]?.message ?? lookup.error.message) : 'The look-up failed. Try again.') : null;

  return (
    <div className="flex flex-col gap-6">
      <form
        role="search"
        aria-label="Find the box"
        className="flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          go(text);
        }}
      >
        <Input
          ref={input}
          label="Tracking code or case reference"
          hint="Scan the label or the packing slip, or type the code and press Enter."
          value={text}
          onChange={(e) => setText(e.target.value)}
          autoComplete="off"
          spellCheck={false}
          error={localError ?? lookupError ?? undefined}
          className="min-w-72 flex-1"
        />
        <Button type="submit" variant="secondary">
          Find
        </Button>
      </form>
      <OpeningSafety />
      {lookup.isFetching && !found ? <Spinner label="Looking the box up" /> : null}
      {result ? (
        <Alert tone={result.checkIn.outcome === 'received' ? 'success' : 'danger'} live="polite" title={result.checkIn.outcome === 'received' ? 'Checked in: the case is received' : 'Checked in and put on hold'}>
          {result.checkIn.holdReason ?? 'The shop has been told the box arrived in order.'}{' '}
          <Button variant="ghost" size="sm" onClick={next}>
            Next box
          </Button>
        </Alert>
      ) : null}
      {found && !result ? (
        <Card title={`Case ${found.referral.reference}`} description={`${found.referral.device} from ${found.referral.shopName}`}>
          <div className="flex flex-col gap-4">
            <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
              <div>
                <dt className="text-ink-muted">Tracking code</dt>
                <dd className="font-mono font-medium">{found.shipment?.trackingCode ?? 'No label (brought in by hand)'}</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Carrier status</dt>
                <dd className="font-medium">{found.shipment?.lastEvent?.message ?? '—'}</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Symptoms at intake</dt>
                <dd className="font-medium">{found.referral.symptoms.join(', ') || '—'}</dd>
              </div>
              <div>
                <dt className="text-ink-muted">Battery at intake</dt>
                <dd className="font-medium">
                  {found.referral.battery
                    ? found.referral.battery.installed
                      ? `Installed, ${found.referral.battery.condition ?? 'condition not given'}${found.referral.battery.wattHours ? `, ${found.referral.battery.wattHours} Wh` : ''}`
                      : 'None installed'
                    : 'Not declared'}
                </dd>
              </div>
            </dl>
            {found.referral.battery?.condition && found.referral.battery.condition !== 'intact' ? (
              <Alert tone="danger" title="The shop declared a damaged battery">
                Open this box with care and keep the device isolated in a non-combustible container.
              </Alert>
            ) : null}
            {found.canCheckIn ? (
              <CheckInForm found={found} onDone={setResult} />
            ) : (
              <Alert tone="info" title="Nothing to check in">
                {found.blockedReason}
                {found.checkIn ? ` Checked in ${formatDateTime(found.checkIn.at)} by ${found.checkIn.by}.` : ''}
              </Alert>
            )}
          </div>
        </Card>
      ) : null}
    </div>
  );
}
