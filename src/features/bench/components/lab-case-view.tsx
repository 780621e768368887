import { useState, type ReactNode } from 'react';
import { evaluationPartLabels, partConditionLabels, recoverabilityHints, recoverabilityLabels, type LabCaseDto } from '@shared/schemas/lab-work';
import { formatMoney } from '@shared/domain/money';
import { mediaTypeLabels, priorityCategoryLabels, sensitivityLabels, symptomLabels } from '@shared/vocabulary';
import { PageHeader } from '@/components/layouts/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { useCan } from '@/lib/auth';
import { formatDate, formatDateTime } from '@/lib/format';
import { CaseStatusBadge, CautionList, PhotoGallery } from '@/features/referrals';
import { useStartEvaluation } from '../api/start-evaluation';
import { BenchSafety } from './bench-safety';
import { EvaluationForm } from './evaluation-form';
import { ImagingProgress } from './imaging-progress';
import { ImagingReportForm } from './imaging-report-form';
import { ManifestSummary } from './manifest-summary';
import { ManifestUpload } from './manifest-upload';

function deviceName(d: LabCaseDto['device']): string {
  const makeModel = [d.make, d.model].filter(Boolean).join(' ');
  return makeModel ? `${mediaTypeLabels[d.mediaType]} · ${makeModel}` : mediaTypeLabels[d.mediaType];
}

/** What the lab does next, in one sentence per stage. */
const nextStep: Partial<Record<LabCaseDto['status'], string>> = {
  received: 'Start the evaluation when the device is on the bench.',
  evaluating: 'Record the findings, the recoverability and the plan; the lab manager then sends the quote.',
  quote_sent: 'Waiting for the customer to approve the quote.',
  quote_declined: 'The customer declined the quote. The lab manager may send a revised one; otherwise the device goes back.',
  approved: 'Approved; waiting for the customer’s payment before imaging.',
  paid: 'Paid. Start imaging and report the progress here or from the imager with the lab’s key.',
  recovering: 'Report imaging progress, then upload the recovered-file list for the customer to review.',
  ready_for_review: 'Waiting for the customer to confirm the recovered files.',
  no_recovery: 'No recovery possible: nothing is charged. The device goes back to the shop.',
};

function Facts({ items }: { items: [label: string, value: ReactNode][] }) {
  return (
    <dl className="grid gap-x-6 gap-y-3 text-sm sm:grid-cols-2">
      {items.map(([label, value]) => (
        <div key={label}>
          <dt className="text-ink-muted">{label}</dt>
          <dd className="font-medium text-ink-strong">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

function StartEvaluation({ labCase }: { labCase: LabCaseDto }) {
  const start = useStartEvaluation();
  return (
    <Button
      isLoading={start.isPending}
      onClick={async () => {
        try {
          await start.mutateAsync(labCase.id);
          toast.success('Evaluation started');
        } catch (error) {
          if (isApiError(error) && !error.isUnexpected) toast.error('The evaluation could not be started', error.message);
        }
      }}
    >
      Start the evaluation
    </Button>
  );
}

function EvaluationSummary({ evaluation }: { evaluation: NonNullable<LabCaseDto['evaluation']> }) {
  return (
    <div className="flex flex-col gap-3 text-sm">
      <p>
        <span className="font-semibold text-ink-strong">Recoverability: {recoverabilityLabels[evaluation.recoverability]}</span> — {recoverabilityHints[evaluation.recoverability]}
      </p>
      <ul className="flex flex-col gap-1">
        {evaluation.findings
          .filter((f) => f.condition !== 'not_applicable' && f.condition !== 'not_checked')
          .map((f) => (
            <li key={f.part}>
              {evaluationPartLabels[f.part]}: <span className="font-medium">{partConditionLabels[f.condition]}</span>
              {f.note ? <span className="text-ink-muted"> — {f.note}</span> : null}
            </li>
          ))}
      </ul>
      <p className="whitespace-pre-line text-ink">{evaluation.plan}</p>
    </div>
  );
}

function EvaluationSection({ labCase }: { labCase: LabCaseDto }) {
  const can = useCan();
  const editable = can('bench.work') && (labCase.status === 'received' || labCase.status === 'evaluating');
  const evaluation = labCase.evaluation;
  // A recorded evaluation is shown as it stands; while the case is still being evaluated it can be changed.
  const [changing, setChanging] = useState(false);
  const showForm = editable && (!evaluation || changing);
  return (
    <Card title="Evaluation" description={evaluation ? `Recorded ${formatDateTime(evaluation.recordedAt)} by ${evaluation.recordedBy}` : undefined}>
      {labCase.status === 'received' && editable ? (
        <div className="mb-4 flex flex-wrap items-center gap-3">
          <StartEvaluation labCase={labCase} />
          <span className="text-sm text-ink-muted">or record the findings straight away below.</span>
        </div>
      ) : null}
      {showForm ? (
        <EvaluationForm labCase={labCase} onRecorded={() => setChanging(false)} />
      ) : evaluation ? (
        <div className="flex flex-col gap-4">
          <EvaluationSummary evaluation={evaluation} />
          {editable ? (
            <div>
              <Button variant="secondary" size="sm" onClick={() => setChanging(true)}>
                Change the evaluation
              </Button>
            </div>
          ) : null}
        </div>
      ) : (
        <p className="text-sm text-ink-muted">Not evaluated yet.</p>
      )}
    </Card>
  );
}

function ImagingSection({ labCase }: { labCase: LabCaseDto }) {
  const can = useCan();
  const reporting = can('bench.work') && (labCase.status === 'paid' || labCase.status === 'recovering');
  if (!labCase.imaging && !reporting) return null;
  return (
    <Card title="Imaging" description="Bytes passed over, unreadable sectors and the current rate; Platterpost works out the time left.">
      <div className="flex flex-col gap-5">
        {labCase.imaging ? <ImagingProgress imaging={labCase.imaging} /> : <p className="text-sm text-ink-muted">No progress reported yet.</p>}
        {reporting ? <ImagingReportForm labCase={labCase} /> : null}
      </div>
    </Card>
  );
}

function FilesSection({ labCase }: { labCase: LabCaseDto }) {
  const can = useCan();
  const { manifest } = labCase;
  const uploading = can('bench.work') && (labCase.status === 'recovering' || labCase.status === 'ready_for_review') && manifest?.review.status !== 'confirmed';
  if (!manifest && !uploading) return null;
  return (
    <Card title="Recovered files" description="Grouped by the customer’s priorities, from each file’s type.">
      <div className="flex flex-col gap-5">
        {manifest?.review.status === 'disputed' ? (
          <Alert tone="warning" title={`The customer disputes the list (${formatDateTime(manifest.review.at!)})`}>
            “{manifest.review.note}” Upload a new version once you have looked again.
          </Alert>
        ) : null}
        {manifest?.review.status === 'confirmed' ? (
          <Alert tone="success" title="The customer confirmed the files">
            Confirmed {formatDateTime(manifest.review.at!)}. The data can ship back on the new media.
          </Alert>
        ) : null}
        {manifest ? <ManifestSummary manifest={manifest} withExamples /> : null}
        {uploading ? <ManifestUpload labCase={labCase} /> : null}
      </div>
    </Card>
  );
}

function Timeline({ entries }: { entries: LabCaseDto['timeline'] }) {
  return (
    <ol aria-label="Timeline" className="flex flex-col gap-3 border-l-2 border-spruce-100 pl-4">
      {entries.map((e) => (
        <li key={e.id}>
          <p className="text-sm font-medium text-ink-strong">{e.summary}</p>
          <p className="text-xs text-ink-muted">
            <time dateTime={e.at}>{formatDateTime(e.at)}</time> · {e.actor.type === 'customer' ? 'the customer' : e.actor.name}
          </p>
        </li>
      ))}
    </ol>
  );
}

/** One case on the lab's bench; the quote section comes from the quotes feature. */
export function LabCaseView({ labCase, quoteSection }: { labCase: LabCaseDto; quoteSection?: ReactNode }) {
  const { device, battery } = labCase;
  const step = nextStep[labCase.status];
  return (
    <>
      <PageHeader eyebrow={`Case from ${labCase.shop.name}`} title={labCase.reference} description={`${deviceName(device)} for ${labCase.customerName}`} />
      <div className="flex flex-col gap-6">
        <section aria-label="Where the case stands" className="flex flex-col gap-3">
          <p className="flex flex-wrap items-center gap-2 text-sm text-ink-muted">
            Status: <CaseStatusBadge status={labCase.status} />
            {labCase.promisedBy ? <span>· promised by {formatDate(labCase.promisedBy)}</span> : null}
            {labCase.payment.state === 'paid' ? <span>· paid {formatMoney(labCase.payment.amountMinor!, labCase.payment.currency!)}</span> : null}
          </p>
          {step ? <Alert tone="info">{step}</Alert> : null}
          <BenchSafety mediaType={device.mediaType} hasBattery={Boolean(battery?.installed)} />
        </section>

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem] lg:items-start">
          <div className="flex min-w-0 flex-col gap-6">
            <EvaluationSection labCase={labCase} />
            {quoteSection}
            <ImagingSection labCase={labCase} />
            <FilesSection labCase={labCase} />
          </div>
          <div className="flex flex-col gap-6">
            <Card title="Device">
              <Facts
                items={[
                  ['Device', deviceName(device)],
                  ['Capacity', device.capacityGb ? `${device.capacityGb.toLocaleString('en-US')} GB` : 'Not given'],
                  ['Serial number', device.serial ?? 'Not given'],
                  ['What happened', labCase.symptoms.map((s) => symptomLabels[s]).join(', ') || 'Not said'],
                  ['Battery', battery ? (battery.installed ? `Installed, ${battery.condition ?? 'condition not given'}` : 'None installed') : 'Not asked'],
                  ['Sensitive data', labCase.sensitivity.filter((f) => f !== 'none').map((f) => sensitivityLabels[f]).join(', ') || 'None'],
                ]}
              />
              {labCase.description ? <p className="mt-3 border-t border-ink-hairline pt-3 text-sm whitespace-pre-line">{labCase.description}</p> : null}
            </Card>
            <Card title="What matters to the customer">
              {labCase.priorities.length === 0 ? (
                <p className="text-sm text-ink-muted">No priorities given; recover everything possible.</p>
              ) : (
                <ol className="list-decimal pl-5 text-sm">
                  {labCase.priorities.map((p) => (
                    <li key={p.category}>
                      <span className="font-semibold">{priorityCategoryLabels[p.category]}</span>
                      {p.note ? <span className="text-ink-muted"> — {p.note}</span> : null}
                    </li>
                  ))}
                </ol>
              )}
            </Card>
            <Card title="Triage">
              <CautionList cautions={labCase.cautions} empty="No cautions from triage." />
            </Card>
            <Card title="Intake photos">
              <PhotoGallery photos={labCase.photos} />
            </Card>
            {labCase.returnAddress ? (
              <Card title="Return address">
                <address className="text-sm not-italic">
                  {labCase.returnAddress.name}
                  <br />
                  {labCase.returnAddress.line1}
                  {labCase.returnAddress.line2 ? (
                    <>
                      <br />
                      {labCase.returnAddress.line2}
                    </>
                  ) : null}
                  <br />
                  {labCase.returnAddress.city}, {labCase.returnAddress.region} {labCase.returnAddress.postalCode}
                </address>
              </Card>
            ) : null}
            <Card title="Timeline">
              <Timeline entries={labCase.timeline} />
            </Card>
          </div>
        </div>
      </div>
    </>
  );
}
