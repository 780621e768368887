import { useFieldArray } from 'react-hook-form';
import type { CleanAirCertificateDto, LabProfileDto } from '@shared/schemas/labs';
import { Form, type FormMethods } from '@/components/form/form';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Input } from '@/components/ui/input';
import { Table, type TableColumn } from '@/components/ui/table';
import { toast } from '@/components/ui/toast';
import { formatDate } from '@/lib/format';
import { useAddCertificate } from '../api/add-certificate';
import { certificateFormSchema, emptyCertificate } from '../utils/profile-form';

const toNumber = (value: unknown) => (value === '' || value === null || value === undefined ? undefined : Number(value));

function classWords(c: CleanAirCertificateDto): string {
  return c.isoClass === null ? 'No ISO class shown' : `ISO class ${c.isoClass}`;
}

function Validity({ certificate }: { certificate: CleanAirCertificateDto }) {
  if (certificate.isoClass === null) return <Badge tone="danger">Does not qualify</Badge>;
  if (!certificate.current) return <Badge tone="warning">Re-test overdue since {certificate.validUntil ? formatDate(certificate.validUntil) : '—'}</Badge>;
  return <Badge tone="success">Valid until {certificate.validUntil ? formatDate(certificate.validUntil) : '—'}</Badge>;
}

const historyColumns: TableColumn<CleanAirCertificateDto>[] = [
  { header: 'Tested', cell: (c) => formatDate(c.testedOn), className: 'whitespace-nowrap' },
  { header: 'Area', cell: (c) => `${c.areaName} · ${c.areaM2} m²` },
  { header: 'Class', cell: (c) => classWords(c) },
  { header: 'Status', cell: (c) => <Validity certificate={c} /> },
];

function AddCertificate() {
  const add = useAddCertificate();
  return (
    <Form
      schema={certificateFormSchema}
      defaultValues={emptyCertificate}
      aria-label="Record a particle-count test"
      onSubmit={async (values, form) => {
        const certificate = await add.mutateAsync(values);
        toast.success('Test recorded', certificate.isoClass === null ? 'The counts demonstrate no ISO class.' : `The counts demonstrate ${classWords(certificate)}.`);
        form.reset(emptyCertificate);
      }}
    >
      {(form) => <CertificateFields form={form} />}
    </Form>
  );
}

function CertificateFields({ form }: { form: FormMethods<typeof certificateFormSchema> }) {
  const { register, control } = form;
  const { errors, isSubmitting } = form.formState;
  const { fields, append, remove } = useFieldArray({ control, name: 'samples' });
  return (
    <>
      <div className="grid gap-4 sm:grid-cols-3">
        <Input label="Tested on" type="date" error={errors.testedOn?.message} {...register('testedOn')} />
        <Input label="Clean area" placeholder="e.g. Laminar-flow bench 1" error={errors.areaName?.message} {...register('areaName')} />
        <Input
          label="Area in m²"
          type="number"
          step="any"
          min={0}
          hint="For a bench, the cross-section of its airflow."
          error={errors.areaM2?.message}
          {...register('areaM2', { setValueAs: toNumber })}
        />
      </div>
      <fieldset className="flex flex-col gap-3">
        <legend className="text-sm font-semibold text-ink-strong">Particle counts</legend>
        <p className="text-sm text-ink-muted">One line per sampling location and particle size, as the counter reports them (particles ≥ the size per m³).</p>
        {errors.samples?.message || errors.samples?.root?.message ? (
          <Alert tone="danger">{errors.samples?.message ?? errors.samples?.root?.message}</Alert>
        ) : null}
        {fields.map((field, index) => (
          <div key={field.id} className="flex flex-wrap items-end gap-3">
            <Input label={`Location, line ${index + 1}`} className="w-36" error={errors.samples?.[index]?.location?.message} {...register(`samples.${index}.location` as const)} />
            <Input
              label={`Size in µm, line ${index + 1}`}
              type="number"
              step="any"
              className="w-36"
              error={errors.samples?.[index]?.sizeUm?.message}
              {...register(`samples.${index}.sizeUm` as const, { setValueAs: toNumber })}
            />
            <Input
              label={`Particles per m³, line ${index + 1}`}
              type="number"
              step="any"
              className="w-48"
              error={errors.samples?.[index]?.perM3?.message}
              {...register(`samples.${index}.perM3` as const, { setValueAs: toNumber })}
            />
            <Input
              label={`Sample litres, line ${index + 1}`}
              type="number"
              step="any"
              optional
              className="w-48"
              error={errors.samples?.[index]?.volumeLitres?.message}
              {...register(`samples.${index}.volumeLitres` as const, { setValueAs: toNumber })}
            />
            <Button size="sm" variant="ghost" onClick={() => remove(index)} disabled={fields.length === 1}>
              Remove line {index + 1}
            </Button>
          </div>
        ))}
        <div>
          <Button variant="secondary" size="sm" onClick={() => append({ location: fields.at(-1)?.location ?? 'L1', sizeUm: undefined, perM3: undefined })}>
            Add a line
          </Button>
        </div>
      </fieldset>
      <div>
        <Button type="submit" isLoading={isSubmitting}>
          Record the test
        </Button>
      </div>
    </>
  );
}

/** The lab's clean-air certificates: the class each demonstrates (ISO 14644-1) and its re-test date (ISO 14644-2). */
export function CleanAirCertificates({ profile }: { profile: LabProfileDto }) {
  const { latest, history } = profile.cleanAir;
  return (
    <Card
      title="Clean-air certificates"
      description="Head swaps and platter work are offered only to labs whose latest particle-count test shows ISO class 5 or cleaner and is within its re-test interval."
    >
      <div className="flex flex-col gap-5">
        {latest ? (
          <div className="flex flex-col gap-2">
            <p className="flex flex-wrap items-center gap-2 text-sm text-ink-strong">
              <span className="font-semibold">Latest: {classWords(latest)}</span>
              <span className="text-ink-muted">
                · {latest.areaName}, tested {formatDate(latest.testedOn)}
              </span>
              <Validity certificate={latest} />
            </p>
            {latest.problems.length > 0 ? (
              <ul className="list-disc pl-5 text-sm text-brick-text">
                {latest.problems.map((p) => (
                  <li key={p}>{p}</li>
                ))}
              </ul>
            ) : null}
          </div>
        ) : (
          <p className="text-sm text-ink-muted">No test recorded. Without one, cases that open a drive are not offered to your lab.</p>
        )}
        {history.length > 1 ? (
          <Table caption="Earlier tests" captionHidden={false} columns={historyColumns} rows={history} rowKey={(c) => c.id} empty="No earlier tests." />
        ) : null}
        <div className="border-t border-ink-hairline pt-4">
          <h3 className="mb-3 text-sm font-semibold text-ink-strong">Record a particle-count test</h3>
          <AddCertificate />
        </div>
      </div>
    </Card>
  );
}

