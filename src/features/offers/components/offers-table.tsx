import { useState } from 'react';
import type { LabOfferDto } from '@shared/schemas/labs';
import { labSkillLabels, mediaTypeLabels, symptomLabels } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { TextLink } from '@/components/ui/link';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { paths } from '@/config/paths';
import { formatBusinessDays, formatDateTime, formatDistance } from '@/lib/format';
import { useOffers, type OfferStatusFilter } from '../api/get-offers';
import { DeadlineCountdown } from './deadline-countdown';
import { OfferStatusBadge } from './offer-status-badge';

const columns: TableColumn<LabOfferDto>[] = [
  {
    header: 'Case',
    cell: (offer) => (
      <TextLink to={paths.lab.offer.getHref(offer.id)} className="font-mono whitespace-nowrap">
        {offer.case.reference}
      </TextLink>
    ),
  },
  {
    header: 'Device',
    cell: (offer) => (
      <>
        <span className="block font-semibold text-ink-strong">{mediaTypeLabels[offer.case.device.mediaType]}</span>
        <span className="block text-ink-muted">{offer.case.symptoms.map((s) => symptomLabels[s]).join(', ') || 'No symptom given'}</span>
      </>
    ),
  },
  { header: 'Needs', cell: (offer) => offer.case.triage.requiredSkills.map((s) => labSkillLabels[s]).join(', ') },
  {
    header: 'From',
    cell: (offer) => (
      <>
        <span className="block">{offer.case.shop.name}</span>
        <span className="block text-ink-muted">
          {[offer.case.shop.city, offer.case.shop.region].filter(Boolean).join(', ')}
          {offer.distanceKm !== null ? ` · ${formatDistance(offer.distanceKm)}` : ''}
        </span>
      </>
    ),
  },
  {
    header: 'Answer',
    cell: (offer) =>
      offer.status === 'pending' ? (
        <div className="flex flex-col items-start gap-1">
          <DeadlineCountdown deadline={offer.deadline} />
          <span className="text-xs text-ink-muted">by {formatDateTime(offer.deadline)}</span>
        </div>
      ) : (
        <OfferStatusBadge status={offer.status} />
      ),
  },
  {
    header: 'Estimate',
    cell: (offer) => (offer.estimatedDays !== null ? `${formatBusinessDays(offer.estimatedDays)} to data` : '—'),
    className: 'whitespace-nowrap',
  },
];

const filters: { value: string; label: string; status: OfferStatusFilter }[] = [
  { value: 'pending', label: 'Waiting for your answer', status: 'pending' },
  { value: 'all', label: 'All offers', status: undefined },
  { value: 'accepted', label: 'Accepted', status: 'accepted' },
  { value: 'declined', label: 'Declined', status: 'declined' },
  { value: 'expired', label: 'Deadline passed', status: 'expired' },
];

/** The lab's offers, the ones waiting for an answer first, each with its deadline counting down. */
export function OffersTable() {
  const [filter, setFilter] = useState('pending');
  const status = filters.find((f) => f.value === filter)?.status;
  const offers = useOffers(status);

  return (
    <div className="flex flex-col gap-4">
      <Select label="Show" className="w-64" value={filter} onChange={(event) => setFilter(event.target.value)} options={filters} />
      {offers.isPending ? (
        <Spinner label="Loading offers" />
      ) : offers.isError && !offers.data ? (
        <PanelError title="Your offers could not be loaded" onRetry={() => void offers.refetch()} />
      ) : (
        <Table
          caption="Offers to your lab"
          columns={columns}
          rows={offers.data}
          rowKey={(offer) => offer.id}
          empty={
            filter === 'pending'
              ? 'No offer is waiting for an answer. New cases appear here as the network ranks your lab for them.'
              : 'No offers to show.'
          }
        />
      )}
    </div>
  );
}
