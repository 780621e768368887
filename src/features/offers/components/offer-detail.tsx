import { useState, type ReactNode } from 'react';
import type { LabOfferDto } from '@shared/schemas/labs';
import { declineReasonLabels, type declineReasons } from '@shared/schemas/referrals';
import { labSkillLabels, mediaTypeLabels, priorityCategoryLabels, sensitivityLabels, symptomLabels } from '@shared/vocabulary';
import { PageHeader } from '@/components/layouts/page-header';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { formatBusinessDays, formatDateTime, formatDistance } from '@/lib/format';
import { CautionList, PhotoGallery, interfaceLabels } from '@/features/referrals';
import { useAcceptOffer } from '../api/accept-offer';
import { DeadlineCountdown } from './deadline-countdown';
import { DeclineOfferDialog } from './decline-offer-dialog';
import { OfferStatusBadge } from './offer-status-badge';

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

function reasonWords(reason: string | null): string {
  return reason && reason in declineReasonLabels ? declineReasonLabels[reason as (typeof declineReasons)[number]] : (reason ?? 'No reason given');
}

function Answer({ offer }: { offer: LabOfferDto }) {
  const accept = useAcceptOffer();
  const [problem, setProblem] = useState<string | null>(null);

  if (offer.status !== 'pending') {
    const when = offer.respondedAt ? formatDateTime(offer.respondedAt) : null;
    const by = offer.respondedBy ? ` by ${offer.respondedBy}` : '';
    if (offer.status === 'accepted') {
      return (
        <Alert tone="success" title="Your lab accepted this case">
          {offer.autoAccepted ? 'Accepted by one of your auto-accept rules' : `Accepted${by}`}
          {when ? ` on ${when}` : ''}. The shop prints the label and ships the device to you next.
        </Alert>
      );
    }
    if (offer.status === 'declined') {
      return (
        <Alert title="Your lab declined this case">
          {`Declined${by}${when ? ` on ${when}` : ''}: ${reasonWords(offer.declineReason)}${offer.declineNote ? ` (${offer.declineNote})` : ''}.`}
        </Alert>
      );
    }
    return (
      <Alert title={offer.status === 'expired' ? 'The deadline passed' : 'The offer was withdrawn'}>
        {offer.status === 'expired' ? 'Nobody answered in time, so the case went to the next lab.' : 'The shop cancelled the case or the network routed it elsewhere.'}
      </Alert>
    );
  }

  return (
    <Card title="Your answer" description={`Answer by ${formatDateTime(offer.deadline)}. If nobody answers, the case goes to the next lab by itself.`}>
      <div className="flex flex-col gap-4">
        <p className="flex flex-wrap items-center gap-2 text-sm text-ink">
          Time left: <DeadlineCountdown deadline={offer.deadline} />
        </p>
        {problem ? (
          <Alert tone="danger" live="assertive">
            {problem}
          </Alert>
        ) : null}
        <div className="flex flex-wrap gap-3">
          <Button
            size="lg"
            isLoading={accept.isPending}
            onClick={async () => {
              setProblem(null);
              try {
                await accept.mutateAsync(offer.id);
                toast.success(`${offer.case.reference} accepted`, 'The shop is told to print the label and ship the device to you.');
              } catch (error) {
                if (isApiError(error) && !error.isUnexpected) setProblem(error.message);
              }
            }}
          >
            Accept case
          </Button>
          <DeclineOfferDialog offer={offer} />
        </div>
      </div>
    </Card>
  );
}

/** One offer, with everything the lab manager needs to decide and the buttons to answer it. */
export function OfferDetail({ offer }: { offer: LabOfferDto }) {
  const { case: c } = offer;
  const device = c.device;
  const makeModel = [device.make, device.model].filter(Boolean).join(' ');
  const shopPlace = [c.shop.city, c.shop.region].filter(Boolean).join(', ');

  return (
    <>
      <PageHeader
        eyebrow="Offer"
        title={c.reference}
        description={`${mediaTypeLabels[device.mediaType]}${makeModel ? ` · ${makeModel}` : ''} from ${c.shop.name}${shopPlace ? `, ${shopPlace}` : ''}`}
        actions={<OfferStatusBadge status={offer.status} />}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_23rem] lg:items-start">
        <div className="flex min-w-0 flex-col gap-6">
          <Answer offer={offer} />
          <Card title="The device">
            <Facts
              items={[
                ['Device', `${mediaTypeLabels[device.mediaType]}${makeModel ? ` · ${makeModel}` : ''}`],
                ['Capacity', device.capacityGb ? `${device.capacityGb.toLocaleString('en-US')} GB` : 'Not given'],
                ['Connection', device.interface ? (interfaceLabels[device.interface as keyof typeof interfaceLabels] ?? device.interface) : 'Not given'],
                ...(device.memberCount ? ([['Drives in the array', String(device.memberCount)]] as [string, string][]) : []),
                ['What is wrong', c.symptoms.length ? c.symptoms.map((s) => symptomLabels[s]).join(', ') : 'Not said'],
                [
                  'Battery',
                  c.battery
                    ? c.battery.installed
                      ? `Installed, ${c.battery.condition ?? 'condition not given'}${c.battery.wattHours ? `, ${c.battery.wattHours} Wh` : ''}`
                      : 'None installed'
                    : 'No battery question for this device',
                ],
                ['Sensitive data', c.sensitivity.filter((f) => f !== 'none').map((f) => sensitivityLabels[f]).join(', ') || 'None'],
              ]}
            />
            {c.description ? <p className="mt-4 border-t border-ink-hairline pt-3 text-sm whitespace-pre-line text-ink">{c.description}</p> : null}
          </Card>
          <Card title="Files that matter most to the customer">
            {c.priorities.length === 0 ? (
              <p className="text-sm text-ink-muted">None given.</p>
            ) : (
              <ol className="list-decimal pl-5 text-sm text-ink">
                {c.priorities.map((p) => (
                  <li key={p.category}>
                    <span className="font-semibold">{priorityCategoryLabels[p.category]}</span>
                    {p.note ? <span className="text-ink-muted"> — {p.note}</span> : null}
                  </li>
                ))}
              </ol>
            )}
          </Card>
          <Card title="Photos from the shop">
            <PhotoGallery photos={c.photos} />
          </Card>
        </div>
        <div className="flex flex-col gap-6">
          <Card title="Why your lab">
            <Facts
              items={[
                ['Rank', offer.rank !== null ? `${offer.rank}` : '—'],
                ['Distance from the shop', offer.distanceKm !== null ? formatDistance(offer.distanceKm) : '—'],
                ['Estimate', offer.estimatedDays !== null ? `${formatBusinessDays(offer.estimatedDays)} until data` : '—'],
                ['Offered', formatDateTime(offer.offeredAt)],
              ]}
            />
            <div className="mt-4 border-t border-ink-hairline pt-3 text-sm">
              <p className="font-semibold text-ink-strong">The case needs</p>
              <ul className="mt-1 list-disc pl-5">
                {c.triage.requiredSkills.map((skill) => (
                  <li key={skill}>{labSkillLabels[skill]}</li>
                ))}
                {c.triage.needsCleanAir ? <li>A current clean-air certificate (ISO class 5 or cleaner)</li> : null}
                {c.triage.needsHealthDataAgreement ? <li>The network’s health-data agreement</li> : null}
              </ul>
            </div>
          </Card>
          <Card title="Cautions the shop was given">
            <CautionList cautions={c.triage.cautions} empty="None for this device." />
          </Card>
        </div>
      </div>
    </>
  );
}
