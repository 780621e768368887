import { useSearchParams } from 'react-router';
import type { LabSummaryDto } from '@shared/schemas/labs';
import { labSkillLabels, labSkills, type LabSkill } from '@shared/vocabulary';
import { PanelError } from '@/components/errors/error-panel';
import { PlaceMap, type MapMarker } from '@/components/map/map';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/card';
import { Select } from '@/components/ui/select';
import { Spinner } from '@/components/ui/spinner';
import { Table, type TableColumn } from '@/components/ui/table';
import { formatDate } from '@/lib/format';
import { useLabs } from '../api/get-labs';
import { SwitchOrganizationButton } from './switch-organization';

export function skillFrom(search: URLSearchParams): LabSkill | undefined {
  const skill = search.get('skill');
  return skill && (labSkills as readonly string[]).includes(skill) ? (skill as LabSkill) : undefined;
}

function cleanAirWords(lab: LabSummaryDto): string {
  const c = lab.cleanAir;
  if (!c) return 'No clean-air certificate';
  if (c.isoClass === null) return `Certificate of ${formatDate(c.testedOn)} shows no ISO class`;
  return `Clean air ISO class ${c.isoClass}${c.validUntil ? `, ${c.current ? 'valid until' : 'expired'} ${formatDate(c.validUntil)}` : ''}`;
}

function queueWords(lab: LabSummaryDto): string {
  return `Queue: ${lab.openCases} of ${lab.queueCapacity} open cases, ${lab.weeklyThroughput} a week`;
}

function statusOf(lab: LabSummaryDto): { words: string; takesWork: boolean } {
  if (!lab.active) return { words: 'Paused by the network', takesWork: false };
  if (!lab.configured) return { words: 'Profile not completed', takesWork: false };
  if (!lab.acceptingNewCases) return { words: 'Not accepting new cases', takesWork: false };
  if (lab.openCases >= lab.queueCapacity) return { words: 'Queue full', takesWork: false };
  return { words: 'Taking cases', takesWork: true };
}

function markersFor(labs: readonly LabSummaryDto[]): MapMarker[] {
  return labs
    .filter((lab) => lab.location)
    .map((lab) => {
      const status = statusOf(lab);
      return {
        id: lab.id,
        position: lab.location!,
        kind: status.takesWork ? 'lab' : 'lab-muted',
        name: lab.name,
        badge: lab.cleanAir?.isoClass && lab.cleanAir.current ? String(lab.cleanAir.isoClass) : undefined,
        details: [[lab.city, lab.region].filter(Boolean).join(', '), status.words, cleanAirWords(lab), queueWords(lab)].filter(Boolean),
      };
    });
}

const columns: TableColumn<LabSummaryDto>[] = [
  {
    header: 'Lab',
    cell: (lab) => (
      <>
        <span className="block font-semibold text-ink-strong">{lab.name}</span>
        <span className="block text-ink-muted">{[lab.city, lab.region].filter(Boolean).join(', ') || 'No address yet'}</span>
      </>
    ),
  },
  {
    header: 'Status',
    cell: (lab) => {
      const status = statusOf(lab);
      return <Badge tone={status.takesWork ? 'success' : 'neutral'}>{status.words}</Badge>;
    },
  },
  {
    header: 'Clean air',
    cell: (lab) =>
      lab.cleanAir?.isoClass ? (
        <>
          <span className="block">ISO class {lab.cleanAir.isoClass}</span>
          <span className="block text-xs text-ink-muted">
            {lab.cleanAir.current ? 'valid until' : 'expired'} {lab.cleanAir.validUntil ? formatDate(lab.cleanAir.validUntil) : ''}
          </span>
        </>
      ) : (
        <span className="text-ink-muted">None</span>
      ),
  },
  {
    header: 'Queue',
    cell: (lab) => (
      <>
        <span className="block whitespace-nowrap tabular-nums">
          {lab.openCases} of {lab.queueCapacity}
        </span>
        <span className="block text-xs whitespace-nowrap text-ink-muted">{lab.weeklyThroughput} a week</span>
      </>
    ),
  },
  {
    header: 'Skills',
    cell: (lab) => <span className="text-sm">{lab.skills.map((s) => labSkillLabels[s.skill]).join(', ') || '—'}</span>,
  },
  {
    header: <span className="sr-only">Switch on or off</span>,
    cell: (lab) => <SwitchOrganizationButton organization={{ id: lab.id, name: lab.name, kind: 'lab', active: lab.active }} />,
  },
];

/** Every lab on a map and in a table, filtered by one skill. */
export function LabsOverview() {
  const [search, setSearch] = useSearchParams();
  const skill = skillFrom(search);
  const labs = useLabs(skill);

  return (
    <div className="flex flex-col gap-5">
      <Select
        label="Skill"
        className="w-80"
        placeholder="All skills"
        value={skill ?? ''}
        onChange={(event) => {
          const next = new URLSearchParams(search);
          if (event.target.value) next.set('skill', event.target.value);
          else next.delete('skill');
          setSearch(next, { replace: true });
        }}
        options={labSkills.map((s) => ({ value: s, label: labSkillLabels[s] }))}
      />
      {labs.isPending ? (
        <Spinner label="Loading labs" />
      ) : labs.isError && !labs.data ? (
        <PanelError title="The labs could not be loaded" onRetry={() => void labs.refetch()} />
      ) : (
        <>
          <Card>
            <PlaceMap
              label={skill ? `Map of labs offering ${labSkillLabels[skill]}` : 'Map of all labs'}
              markers={markersFor(labs.data)}
              height={440}
              unavailableText="The table below lists the same labs."
            />
            <p className="mt-2 text-xs text-ink-muted">
              Green dots take cases now; a number on a dot is its current clean-air class. Grey dots are paused, full or not set up. Point at a lab or move to it
              with the Tab key for its details.
            </p>
          </Card>
          <Table
            caption={skill ? `Labs offering ${labSkillLabels[skill]}` : 'All labs'}
            columns={columns}
            rows={labs.data}
            rowKey={(lab) => lab.id}
            empty={skill ? 'No lab offers this skill yet.' : 'No labs in the network yet.'}
          />
        </>
      )}
    </div>
  );
}
