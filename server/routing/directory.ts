import type { DataSource, EntityManager } from 'typeorm';
import type { LatLon } from '@shared/domain/geo';
import { prepareRoutingLabs, type PreparedRoutingLabs } from '@shared/domain/routing';
import type { ExcludedDto } from '@shared/schemas/referrals';
import { namedQuery } from '../db/named-query';
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

const OPEN_CASES_SQL = `
  SELECT (SELECT version::text FROM lab_directory_version) AS version,
         coalesce((SELECT json_object_agg(lab_organization_id, n) FROM (
           SELECT lab_organization_id, count(*)::int AS n FROM referrals
           WHERE lab_organization_id IS NOT NULL AND status = ANY($1::text[]) GROUP BY lab_organization_id) c), '{}'::json) AS open_cases`;

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

/** The directory as of this statement, and each lab's open cases now. Reads the labs again only when they changed. */
export async function readLabDirectory(manager: EntityManager): Promise<DirectoryReading> {
  const [row] = await namedQuery<{ version: string; open_cases: Record<string, number> }>(manager, 'routing.open-cases', OPEN_CASES_SQL, [LAB_OPEN_STATUSES]);
  const openCases = new Map(Object.entries(row.open_cases));
  const source = manager.connection;
  let directory = held.get(source);
  if (!directory || directory.version !== row.version) {
    const { labs, version } = await loadLabsWithVersion(manager);
    directory = build(version ?? row.version, labs);
    held.set(source, directory);
  }
  return { directory, openCases };
}
