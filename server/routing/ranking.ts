import type { EntityManager } from 'typeorm';
import type { LatLon } from '@shared/domain/geo';
import { routeCase, type RankedLab } from '@shared/domain/routing';
import type { TriageResult } from '@shared/domain/triage';
import type { CandidateDto, ExcludedDto } from '@shared/schemas/referrals';
import type { MediaType } from '@shared/vocabulary';
import { readLabDirectory } from './directory';
import type { LoadedLab } from './labs';

// Ranks the network's labs for one case with the pure routing module, adding the labs it cannot read
// (no profile yet, no location) as exclusions with their own reasons.

export interface CaseForRouting {
  mediaType: MediaType;
  origin: LatLon;
  triage: Pick<TriageResult, 'requiredSkills' | 'needsCleanAir' | 'needsHealthDataAgreement' | 'batteryHazard'>;
}

/**
 * How many candidates a ranking keeps by default: what the shop sees on the map and the case page, and
 * what a case's routing snapshot records. Ranking only the best is what keeps routing fast on a large network.
 */
export const RANKED_SHOWN = 25;

export interface Ranking {
  /** The best candidates, best first (all of them when the caller asked for no limit). */
  candidates: CandidateDto[];
  /** How many labs qualified in all. */
  candidateCount: number;
  excluded: ExcludedDto[];
  ranked: RankedLab[];
  labs: Map<string, LoadedLab>;
}

export async function rankLabs(
  manager: EntityManager,
  kase: CaseForRouting,
  options: { asOf: Date; previouslyOfferedLabIds?: readonly string[]; /** Defaults to RANKED_SHOWN; null ranks every candidate. */ limit?: number | null },
): Promise<Ranking> {
  const { directory, openCases } = await readLabDirectory(manager);
  const byId = directory.byId;
  const result = routeCase(
    {
      mediaType: kase.mediaType,
      shopLocation: kase.origin,
      requirements: {
        requiredSkills: kase.triage.requiredSkills,
        needsCleanAir: kase.triage.needsCleanAir,
        needsHealthDataAgreement: kase.triage.needsHealthDataAgreement,
        batteryHazard: kase.triage.batteryHazard,
      },
    },
    directory.prepared,
    {
      asOf: options.asOf,
      previouslyOfferedLabIds: options.previouslyOfferedLabIds,
      openCases,
      ...(options.limit === null ? {} : { limit: options.limit ?? RANKED_SHOWN }),
    },
  );

  const candidates: CandidateDto[] = result.ranked.map((r) => ({
    labId: r.labId,
    labName: r.labName,
    location: byId.get(r.labId)!.location!,
    distanceKm: Math.round(r.distanceKm * 10) / 10,
    zone: r.zone,
    transitDays: r.transitDays,
    queueDays: r.queueDays,
    turnaroundDays: r.turnaroundDays,
    estimatedDays: r.estimatedDays,
    reasons: r.reasons,
  }));
  const excluded: ExcludedDto[] = [
    ...result.excluded.map((e) => {
      const lab = byId.get(e.labId)!;
      // The routing module reads "not accepting new cases" as inactive; say which it is.
      const reasons = e.reasons.map((reason) =>
        reason.code === 'inactive' && lab.active && !lab.acceptingNewCases
          ? { code: 'not_accepting', message: 'Lab is not accepting new cases right now.' }
          : { code: reason.code, message: reason.message },
      );
      return { labId: e.labId, labName: e.labName, location: lab.location, reasons };
    }),
    ...directory.unroutable,
  ].sort((a, b) => a.labName.localeCompare(b.labName) || a.labId.localeCompare(b.labId));
  return { candidates, candidateCount: result.candidateCount, excluded, ranked: result.ranked, labs: byId };
}

// [one lab, several labs]
const reasonWords: Record<string, [string, string]> = {
  missing_skills: ['lacks a required skill', 'lack a required skill'],
  media_type: ['does not take this media type', 'do not take this media type'],
  clean_air_missing: ['has no clean-air certificate', 'have no clean-air certificate'],
  clean_air_unusable: ['has an unreadable clean-air certificate', 'have an unreadable clean-air certificate'],
  clean_air_class: ['is not clean enough (ISO class 5 needed)', 'are not clean enough (ISO class 5 needed)'],
  clean_air_expired: ['has a clean-air certificate past its re-test date', 'have a clean-air certificate past its re-test date'],
  queue_full: ['has a full queue', 'have a full queue'],
  health_data_agreement: ['has not signed the health-data agreement', 'have not signed the health-data agreement'],
  previously_offered: ['was already offered this case', 'were already offered this case'],
  inactive: ['is not active on the network', 'are not active on the network'],
  not_accepting: ['is not accepting new cases', 'are not accepting new cases'],
  not_configured: ['has no profile yet', 'have no profile yet'],
  invalid_profile: ['has an incomplete profile', 'have an incomplete profile'],
  no_throughput: ['reports no weekly throughput', 'report no weekly throughput'],
};

/** Why no lab qualifies, in one sentence for the network admin and the shop. */
export function noCandidateReason(excluded: readonly ExcludedDto[]): string {
  if (excluded.length === 0) return 'No lab can take this case: there are no labs on the network.';
  const counts = new Map<string, number>();
  for (const lab of excluded) for (const code of new Set(lab.reasons.map((r) => r.code))) counts.set(code, (counts.get(code) ?? 0) + 1);
  const parts = [...counts.entries()]
    .sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
    .map(([code, n]) => {
      const words = reasonWords[code] ?? [`excluded (${code})`, `excluded (${code})`];
      return n === 1 ? `1 lab ${words[0]}` : `${n} labs ${words[1]}`;
    });
  return `No lab can take this case now: ${parts.join('; ')}.`;
}
