import {
  checkSanitization,
  equipmentHazardDeferral,
  hazardsForTechnique,
  sanitizationLevelLabels,
  sanitizationLevels,
  sanitizationTechniqueLabels,
  sanitizationTechniques,
  techniquesMeeting,
  type SanitizationLevel,
  type SanitizationTechnique,
} from '@shared/domain/sanitization';
import { mediaTypeLabels, mediaTypes, type MediaType } from '@shared/vocabulary';
import { Alert } from '@/components/ui/alert';

const isMedia = (v: unknown): v is MediaType => (mediaTypes as readonly unknown[]).includes(v);
const isLevel = (v: unknown): v is SanitizationLevel => (sanitizationLevels as readonly unknown[]).includes(v);
const isTechnique = (v: unknown): v is SanitizationTechnique => (sanitizationTechniques as readonly unknown[]).includes(v);

export interface GuidanceInput {
  mediaType: unknown;
  level: unknown;
  technique: unknown;
  selfEncrypting?: boolean;
  driveCommand?: boolean;
}

/**
 * What the chosen technique does to this media, by the same NIST SP 800-88 Rev. 1 Appendix A rules the
 * server applies, before anything is sent; the server still decides.
 */
export function SanitizationCheck({ mediaType, level, technique, selfEncrypting, driveCommand }: GuidanceInput) {
  if (!isMedia(mediaType) || !isLevel(level)) return null;
  const conditions = { selfEncrypting: selfEncrypting === true, driveCommand: driveCommand === true };
  const meeting = techniquesMeeting(mediaType, level, conditions);
  const options = (
    <p className="text-sm text-ink-muted">
      On a {mediaTypeLabels[mediaType].toLowerCase()}, {sanitizationLevelLabels[level].toLowerCase()} is reached by{' '}
      {meeting.length ? meeting.map((t) => sanitizationTechniqueLabels[t].toLowerCase()).join(', ') : 'no technique under these conditions'}.
    </p>
  );
  if (!isTechnique(technique)) return options;
  const check = checkSanitization({ mediaType, level, technique, ...conditions });
  return (
    <div className="flex flex-col gap-2" aria-live="polite">
      {check.ok ? (
        <Alert tone="success" title={`${sanitizationTechniqueLabels[technique]} reaches ${sanitizationLevelLabels[check.achieves].toLowerCase()} here`}>
          <p>{check.reason}</p>
          {check.caution ? <p className="mt-1 font-semibold">{check.caution}</p> : null}
        </Alert>
      ) : (
        <Alert tone="danger" title="This technique will be refused">
          {check.reason}
        </Alert>
      )}
      {options}
    </div>
  );
}

/** The machine's hazards beside the step that uses it (degausser, crusher, shredder). */
export function EquipmentHazards({ technique }: { technique: unknown }) {
  if (!isTechnique(technique)) return null;
  const hazard = hazardsForTechnique(technique);
  if (!hazard) return null;
  return (
    <section aria-label="Equipment hazards">
      <Alert tone="warning" title={hazard.title}>
        <ul className="list-disc space-y-1 pl-5">
          {hazard.notes.map((note) => (
            <li key={note}>{note}</li>
          ))}
        </ul>
        <p className="mt-2 text-xs">{equipmentHazardDeferral}</p>
      </Alert>
    </section>
  );
}
