import { useId } from 'react';
import type { CandidateDto, ExcludedDto, RoutingDto } from '@shared/schemas/referrals';
import { PlaceMap, type MapLine, type MapMarker } from '@/components/map/map';
import { Badge } from '@/components/ui/badge';
import { formatBusinessDays, formatDays, formatDistance, formatMiles } from '@/lib/format';

export interface RoutingOverviewProps {
  routing: Pick<RoutingDto, 'origin' | 'candidates' | 'excluded'> & { offeredTo?: RoutingDto['offeredTo'] };
  /** What the origin marker is called: "Your shop", or the shop's name for a lab or the network. */
  originName: string;
  /** Names the map and the lists: "Labs for this case", "Labs that would be offered this case". */
  title: string;
  /** When routing found no lab. */
  emptyText: string;
  headingLevel?: 2 | 3;
  /** The preview is marked while a newer ranking is on its way. */
  updating?: boolean;
}

function estimateLine(candidate: CandidateDto): string {
  return `About ${formatBusinessDays(candidate.estimatedDays)} until data`;
}

/** Transit, queue and work, which add up to the estimate. */
function breakdown(candidate: CandidateDto): string {
  return `${formatDays(candidate.transitDays)} in transit + ${formatDays(candidate.queueDays)} in the queue + ${formatDays(candidate.turnaroundDays)} of work`;
}

function mapMarkers(props: RoutingOverviewProps): MapMarker[] {
  const { routing, originName } = props;
  const offeredId = routing.offeredTo?.labId;
  const markers: MapMarker[] = [{ id: 'origin', position: routing.origin, kind: 'shop', name: originName, details: ['Where the device ships from'] }];
  routing.candidates.forEach((candidate, index) => {
    markers.push({
      id: `lab-${candidate.labId}`,
      position: candidate.location,
      kind: 'candidate',
      badge: String(index + 1),
      name: candidate.labName,
      details: [
        `Ranked ${index + 1} of ${routing.candidates.length}${candidate.labId === offeredId ? ', offered the case now' : ''}`,
        estimateLine(candidate),
        formatDistance(candidate.distanceKm),
      ],
    });
  });
  for (const excluded of routing.excluded) {
    if (!excluded.location) continue;
    markers.push({
      id: `excluded-${excluded.labId}`,
      position: excluded.location,
      kind: 'excluded',
      name: excluded.labName,
      details: ['Left out:', ...excluded.reasons.map((r) => r.message)],
    });
  }
  return markers;
}

function mapLines(props: RoutingOverviewProps): MapLine[] {
  const { routing } = props;
  const emphasised = routing.offeredTo?.labId ?? routing.candidates[0]?.labId;
  return routing.candidates.map((candidate) => ({
    id: `line-${candidate.labId}`,
    from: routing.origin,
    to: candidate.location,
    label: `${formatMiles(candidate.distanceKm)} · ${formatDays(candidate.estimatedDays)}`,
    emphasis: candidate.labId === emphasised,
  }));
}

function CandidateItem({ candidate, rank, offered }: { candidate: CandidateDto; rank: number; offered: boolean }) {
  return (
    <li className="flex items-start gap-3 border-t border-ink-hairline py-3 first:border-t-0 first:pt-0">
      <span aria-hidden="true" className="flex size-7 shrink-0 items-center justify-center rounded-full bg-spruce-700 text-xs font-bold text-white">
        {rank}
      </span>
      <div className="min-w-0 text-sm">
        <p className="flex flex-wrap items-center gap-2">
          <span className="font-semibold text-ink-strong">
            <span className="sr-only">Rank {rank}: </span>
            {candidate.labName}
          </span>
          {offered ? <Badge tone="brand">Offered the case now</Badge> : null}
        </p>
        <p className="text-ink">
          {estimateLine(candidate)} · {formatDistance(candidate.distanceKm)}
        </p>
        <p className="text-ink-muted">{breakdown(candidate)}</p>
        {candidate.reasons.length > 0 ? (
          <ul aria-label={`Why ${candidate.labName} is ranked here`} className="mt-1 list-disc pl-5 text-xs text-ink-muted">
            {candidate.reasons.map((reason) => (
              <li key={reason}>{reason}</li>
            ))}
          </ul>
        ) : null}
      </div>
    </li>
  );
}

function ExcludedItem({ excluded }: { excluded: ExcludedDto }) {
  return (
    <li className="border-t border-ink-hairline py-2 text-sm first:border-t-0 first:pt-0">
      <p className="font-semibold text-ink-muted">{excluded.labName}</p>
      <ul className="list-disc pl-5 text-ink-muted">
        {excluded.reasons.map((reason) => (
          <li key={reason.code + reason.message}>{reason.message}</li>
        ))}
      </ul>
    </li>
  );
}

/** The ranked labs on a map and as a list, with the labs left out and why. */
export function RoutingOverview(props: RoutingOverviewProps) {
  const { routing, title, emptyText, headingLevel = 2, updating = false } = props;
  const Heading = headingLevel === 2 ? 'h2' : 'h3';
  const SubHeading = headingLevel === 2 ? 'h3' : 'h4';
  const offeredId = routing.offeredTo?.labId;
  const titleId = useId();

  return (
    <section aria-labelledby={titleId} aria-busy={updating || undefined}>
      <div className="mb-3 flex flex-wrap items-baseline justify-between gap-2">
        <Heading id={titleId} className="text-base font-semibold text-ink-strong">
          {title}
        </Heading>
        {updating ? <span className="text-sm text-ink-muted">Updating…</span> : null}
      </div>
      <PlaceMap label={`Map: ${title}`} markers={mapMarkers(props)} lines={mapLines(props)} height={380} />
      <p className="mt-2 text-xs text-ink-muted">
        Lines run from {props.originName} to each ranked lab, with the distance and the business days until data. Grey dots are labs left out; point at
        one or move to it with the Tab key to see why.
      </p>
      <div className="mt-5 grid gap-5 md:grid-cols-2 md:items-start">
        <div>
          <SubHeading className="mb-2 text-sm font-semibold tracking-wide text-ink-muted uppercase">Ranked by days until data</SubHeading>
          {routing.candidates.length === 0 ? (
            <p className="text-sm text-ink-muted">{emptyText}</p>
          ) : (
            <ol aria-label="Ranked labs">
              {routing.candidates.map((candidate, index) => (
                <CandidateItem key={candidate.labId} candidate={candidate} rank={index + 1} offered={candidate.labId === offeredId} />
              ))}
            </ol>
          )}
        </div>
        {routing.excluded.length > 0 ? (
          <div>
            <SubHeading className="mb-2 text-sm font-semibold tracking-wide text-ink-muted uppercase">Labs left out</SubHeading>
            <ul aria-label="Labs left out">
              {routing.excluded.map((excluded) => (
                <ExcludedItem key={excluded.labId} excluded={excluded} />
              ))}
            </ul>
          </div>
        ) : null}
      </div>
    </section>
  );
}
