import { useState, type ReactNode } from 'react';
import type { ReferralDto } from '@shared/schemas/referrals';
import {
  labSkillLabels,
  mediaTypeLabels,
  priorityCategoryLabels,
  sensitivityLabels,
  symptomLabels,
} from '@shared/vocabulary';
import { PageHeader } from '@/components/layouts/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { useCan } from '@/lib/auth';
import { formatDateTime } from '@/lib/format';
import { cancellableStatuses, useCancelReferral } from '../api/cancel-referral';
import { interfaceLabels } from '../utils/labels';
import { CasePhotos } from './case-photos';
import { CaseStatusBadge } from './case-status-badge';
import { CaseTimeline } from './case-timeline';
import { CautionList, cautionFootnote } from './caution-list';
import { RoutingOverview } from './routing-overview';

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

function deviceName(device: ReferralDto['device']): string {
  const makeModel = [device.make, device.model].filter(Boolean).join(' ');
  return makeModel ? `${mediaTypeLabels[device.mediaType]} · ${makeModel}` : mediaTypeLabels[device.mediaType];
}

// What the shop does next (or that nothing is needed) once a lab holds the case, by where it stands.
const labStageText: Partial<Record<ReferralDto['status'], string>> = {
  accepted: 'The lab has taken the case. Next: buy the shipping label and pack the device by the packing rules.',
  label_issued: 'The label is ready. Next: pack the device by the packing rules and hand the box to the carrier.',
  in_transit: 'The box is on its way to the lab; the shipment below shows where it is. Nothing is needed from you now.',
  received: 'The lab has the device and will evaluate it, then send the customer a quote.',
  evaluating: 'The lab is evaluating the device; the customer receives the quote by e-mail.',
  quote_sent: 'The customer has the quote and decides on it through their own link.',
  quote_declined: 'The customer declined the quote; the lab sends the device back.',
  approved: 'The customer approved the quote; the lab is recovering the data.',
  paid: 'The customer has paid; the lab is recovering the data.',
  recovering: 'The lab is recovering the data.',
  ready_for_review: 'The recovered files are ready for the customer to check.',
  returned: 'The device and the data are on their way back.',
  on_hold: 'The lab has put the case on hold; the timeline says why.',
};

function WhereItStands({ referral }: { referral: ReferralDto }) {
  const { offer, lab, status } = referral;
  if (status === 'cancelled') return <Alert title="This case was cancelled">No lab will work on it. The timeline says when and by whom.</Alert>;
  if (status === 'needs_attention' || referral.attentionReason) {
    return (
      <Alert tone="warning" title="Waiting for the network team">
        {referral.attentionReason ?? 'No lab could be offered this case.'} They will find a lab and the case will show it here; nothing is needed from you now.
      </Alert>
    );
  }
  if (lab) {
    const next = labStageText[status];
    if (!next) return null;
    return (
      <Alert tone={status === 'accepted' ? 'success' : 'info'} title={status === 'accepted' ? `Accepted by ${lab.name}` : `With ${lab.name}`}>
        {next}
      </Alert>
    );
  }
  if (offer && offer.status === 'pending') {
    return (
      <Alert tone="info" title={`Offered to ${offer.labName}`}>
        The lab has until {formatDateTime(offer.deadline)} to answer. If it declines or does not answer, the next lab is offered the case by itself.
      </Alert>
    );
  }
  return null;
}

function CancelCase({ referral }: { referral: ReferralDto }) {
  const [open, setOpen] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const cancel = useCancelReferral();
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)}>
        Cancel case
      </Button>
      <Dialog
        open={open}
        onClose={() => setOpen(false)}
        title={`Cancel ${referral.reference}?`}
        description="The lab’s offer is withdrawn and no lab will work on the case. This cannot be undone; open a new referral if the customer changes their mind."
        footer={
          <>
            <Button variant="secondary" onClick={() => setOpen(false)}>
              Keep the case
            </Button>
            <Button
              variant="danger"
              isLoading={cancel.isPending}
              onClick={async () => {
                setProblem(null);
                try {
                  await cancel.mutateAsync(referral.id);
                  setOpen(false);
                  toast.success(`${referral.reference} cancelled`);
                } catch (error) {
                  if (isApiError(error) && !error.isUnexpected) setProblem(error.message);
                }
              }}
            >
              Cancel case
            </Button>
          </>
        }
      >
        {problem ? (
          <Alert tone="danger" live="assertive">
            {problem}
          </Alert>
        ) : (
          <p className="text-sm text-ink">The customer, {referral.customer.name}, is not told automatically; let them know yourself.</p>
        )}
      </Dialog>
    </>
  );
}

/** One case as the shop sees it: where it stands, how to handle the device, where it goes, and what happened. */
export function CaseDetail({ referral }: { referral: ReferralDto }) {
  const can = useCan();
  const mayCancel = can('referrals.cancel') && cancellableStatuses.includes(referral.status);
  const open = !['cancelled', 'closed', 'no_recovery', 'returned'].includes(referral.status);
  const { device, battery } = referral;

  return (
    <>
      <PageHeader
        eyebrow="Case"
        title={referral.reference}
        description={`${deviceName(device)} for ${referral.customer.name}`}
        actions={mayCancel ? <CancelCase referral={referral} /> : null}
      />
      <div className="flex flex-col gap-6">
        <section aria-label="Where the case stands" className="flex flex-col gap-3">
          <p className="flex flex-wrap items-center gap-2 text-sm text-ink-muted">
            Status: <CaseStatusBadge status={referral.status} />
            <span>· opened {formatDateTime(referral.createdAt)}</span>
            {referral.externalRef ? <span>· your ticket {referral.externalRef}</span> : null}
          </p>
          <WhereItStands referral={referral} />
        </section>

        <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_23rem] lg:items-start">
          <div className="flex min-w-0 flex-col gap-6">
            <Card title="Device and customer">
              <Facts
                items={[
                  ['Device', deviceName(device)],
                  ['Capacity', device.capacityGb ? `${device.capacityGb.toLocaleString('en-US')} GB` : 'Not given'],
                  ['Connection', device.interface ? (interfaceLabels[device.interface as keyof typeof interfaceLabels] ?? device.interface) : 'Not given'],
                  ['Serial number', device.serial ?? 'Not given'],
                  ...(device.memberCount ? ([['Drives in the array', String(device.memberCount)]] as [string, string][]) : []),
                  ['What is wrong', referral.symptoms.length ? referral.symptoms.map((s) => symptomLabels[s]).join(', ') : 'Not said'],
                  [
                    'Battery',
                    battery
                      ? battery.installed
                        ? `Installed, ${battery.condition ?? 'condition not given'}${battery.wattHours ? `, ${battery.wattHours} Wh` : ''}`
                        : 'None installed'
                      : 'No battery question for this device',
                  ],
                  ['Sensitive data', referral.sensitivity.filter((f) => f !== 'none').map((f) => sensitivityLabels[f]).join(', ') || 'None'],
                  ['Customer', `${referral.customer.name} · ${referral.customer.email}${referral.customer.phone ? ` · ${referral.customer.phone}` : ''}`],
                  ['Ships from', [referral.origin.city, referral.origin.region, referral.origin.postalCode].filter(Boolean).join(', ')],
                ]}
              />
              {referral.description ? <p className="mt-4 border-t border-ink-hairline pt-3 text-sm whitespace-pre-line text-ink">{referral.description}</p> : null}
            </Card>

            <Card title="Files that matter most">
              {referral.priorities.length === 0 ? (
                <p className="text-sm text-ink-muted">None given; the lab recovers everything it can.</p>
              ) : (
                <ol className="list-decimal pl-5 text-sm text-ink">
                  {referral.priorities.map((p) => (
                    <li key={p.category}>
                      <span className="font-semibold">{priorityCategoryLabels[p.category]}</span>
                      {p.note ? <span className="text-ink-muted"> — {p.note}</span> : null}
                    </li>
                  ))}
                </ol>
              )}
            </Card>

            <Card>
              <RoutingOverview
                routing={referral.routing}
                originName={referral.partner.name}
                title="Labs for this case"
                emptyText="No lab had every skill and room for this case when it was opened."
              />
            </Card>

            <Card title="Photos">
              <CasePhotos referral={referral} canAdd={open} />
            </Card>
          </div>

          <div className="flex flex-col gap-6">
            <Card title="Handle with care" description="Until the box is with the carrier.">
              <CautionList cautions={referral.triage.cautions} empty="No special cautions for this device." footer={cautionFootnote} />
              <div className="mt-4 border-t border-ink-hairline pt-3 text-sm">
                <p className="font-semibold text-ink-strong">The lab needs</p>
                <ul className="mt-1 list-disc pl-5">
                  {referral.triage.requiredSkills.map((skill) => (
                    <li key={skill}>{labSkillLabels[skill]}</li>
                  ))}
                </ul>
              </div>
            </Card>
            <Card title="Timeline">
              <CaseTimeline entries={referral.timeline} />
            </Card>
          </div>
        </div>
      </div>
    </>
  );
}
