import type { DataSource, EntityManager } from 'typeorm';
import type { LatLon } from '@shared/domain/geo';
import { prepareRoutingLabs, type PreparedRoutingLabs } from '@shared/domain/routing';
import type { ExcludedDto } from '@shared/schemas/referrals';
import { namedQuery } from '../db/named-query';
import { sawRecipientVersion } from './notify';
import { LAB_OPEN_STATUSES, loadLabsWithVersion, toRoutingLab, type LoadedLab } from './labs';

// The network's labs as routing reads them, held in memory between requests: loading and packing
// 10 000 labs takes far longer than ranking them. What changes with every case — how many open cases
// each lab holds — is read fresh for each ranking, in the same statement as the directory's version
// (lab_directory_version, set by triggers whenever a lab's organisation, profile or certificate
// changes). A server holding another version reloads, so every instance follows the database.

export interface LabDirectory {
  version: string;
  byId: Map<string, LoadedLab>;
  /** Labs that cannot be ranked at all (no profile, no location), with the reason. */
  unroutable: ExcludedDto[];
  prepared: PreparedRoutingLabs;
}

export interface DirectoryReading {
  directory: LabDirectory;
  openCases: Map<string, number>;
}

const held = new WeakMap<DataSource, LabDirectory>();

// The open statuses go into the text as literals, not as a parameter: with an array parameter
// PostgreSQL cannot tell how many cases it matches, judges the kept (generic) plan dearer and plans
// the statement afresh on every request; with literals the kept plan is used.
const openStatusList = LAB_OPEN_STATUSES.map((s) => {
  if (!/^[a-z_]+$/.test(s)) throw new Error(`not a status: ${s}`);
  return `'${s}'`;
}).join(', ');

/**
 * What every ranking reads fresh, as select-list items (each aliased `directory_*`, no parameters):
 * the two versions and each lab's open cases. The partner API reads them in the statement that looks
 * up the key (see primeLabDirectory).
 */
export const DIRECTORY_READING_COLUMNS = `
  (SELECT version::text FROM lab_directory_version) AS directory_version,
  (SELECT version::text FROM recipient_directory_version) AS directory_recipients_version,
  coalesce((SELECT json_object_agg(lab_organization_id, n) FROM (
    SELECT lab_organization_id, count(*)::int AS n FROM referrals
    WHERE lab_organization_id IS NOT NULL AND status IN (${openStatusList}) GROUP BY lab_organization_id) c), '{}'::json) AS directory_open_cases`;

/** The row those columns make. */
export interface DirectoryReadingRow {
  directory_version: string;
  directory_recipients_version: string;
  directory_open_cases: Record<string, number>;
}

const OPEN_CASES_SQL = `SELECT ${DIRECTORY_READING_COLUMNS}`;

// A reading already made for this piece of work, used by its first ranking instead of reading again.
const primed = new WeakMap<EntityManager, DirectoryReadingRow>();

/**
 * Hands a reading made moments ago, in this same request, to the work running on `manager`: its
 * first ranking uses it rather than reading the versions and counts again. (Intake through the
 * partner API reads them with the key, which saves a round trip to the database per case.)
 */
export function primeLabDirectory(manager: EntityManager, row: DirectoryReadingRow): void {
  primed.set(manager, row);
}

/** The primed reading, once: a second ranking in the same work reads afresh. */
function takePrimed(manager: EntityManager): DirectoryReadingRow | undefined {
  const row = primed.get(manager);
  primed.delete(manager);
  return row;
}

function build(version: string, labs: LoadedLab[]): LabDirectory {
  const byId = new Map(labs.map((l) => [l.id, l]));
  const unroutable: ExcludedDto[] = [];
  const routable: (LoadedLab & { location: LatLon })[] = [];
  for (const lab of labs) {
    if (!lab.configured) {
      unroutable.push({ labId: lab.id, labName: lab.name, location: lab.location, reasons: [{ code: 'not_configured', message: 'Lab has not completed its profile yet.' }] });
    } else if (!lab.location) {
      unroutable.push({ labId: lab.id, labName: lab.name, location: null, reasons: [{ code: 'invalid_profile', message: 'Lab has no location on file.' }] });
    } else {
      routable.push(lab as LoadedLab & { location: LatLon });
    }
  }
  return { version, byId, unroutable, prepared: prepareRoutingLabs(routable.map(toRoutingLab)) };
}

/** The directory's versions and each lab's open cases, read now: for several rankings from one reading (primeLabDirectory before each). */
export async function readDirectoryRow(manager: EntityManager): Promise<DirectoryReadingRow> {
  return (await namedQuery<DirectoryReadingRow>(manager, 'routing.open-cases', OPEN_CASES_SQL, []))[0]!;
}

/** The directory as of this statement, and each lab's open cases now. Reads the labs again only when they changed. */
export async function readLabDirectory(manager: EntityManager): Promise<DirectoryReading> {
  const row = takePrimed(manager) ?? (await readDirectoryRow(manager));
  sawRecipientVersion(manager, row.directory_recipients_version);
  const openCases = new Map(Object.entries(row.directory_open_cases));
  const source = manager.connection;
  let directory = held.get(source);
  if (!directory || directory.version !== row.directory_version) {
    const { labs, version } = await loadLabsWithVersion(manager);
    directory = build(version ?? row.directory_version, labs);
    held.set(source, directory);
  }
  return { directory, openCases };
}
