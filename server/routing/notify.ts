import { DateTime } from 'luxon';
import type { DataSource, EntityManager } from 'typeorm';
import { labSkillLabels, mediaTypeLabels, type LabSkill } from '@shared/vocabulary';
import { namedQuery } from '../db/named-query';
import type { Referral } from '../referrals/entities';

// Who hears about offers and acceptances, and how a case reads in a subject line.

/** A person to e-mail, read with what enqueueEmailToUser needs so that it need not read them again. */
export interface Recipient {
  id: string;
  email: string;
  name: string;
  status: 'active' | 'invited' | 'disabled';
  notification_preferences: Record<string, boolean> | null;
}

const RECIPIENT = `u.id, u.email, u.name, u.status, u.notification_preferences`;

// Offers, acceptances and cases left for the network e-mail the same few people again and again, so a
// server keeps each list it read, under the version of recipient_directory_version it was read with
// (triggers give that row a new value whenever users or organisations change what the lists read). A
// list is used again only by work whose own statement saw that same version (`sawRecipientVersion`,
// from the ranking's directory reading); anything else reads the people afresh.
interface HeldLists {
  version: string;
  lists: Map<string, readonly Recipient[]>;
}
const held = new WeakMap<DataSource, HeldLists>();
const seen = new WeakMap<EntityManager, string>();

/**
 * Records the recipient-directory version that a statement of this request or transaction read.
 * Ignored for the data source's shared manager, which outlives any one piece of work.
 */
export function sawRecipientVersion(manager: EntityManager, version: string): void {
  if (manager !== manager.connection.manager) seen.set(manager, version);
}

async function recipients(manager: EntityManager, list: string, name: string, where: string, values: unknown[]): Promise<readonly Recipient[]> {
  const source = manager.connection;
  const version = seen.get(manager);
  const hold = held.get(source);
  if (version !== undefined && hold?.version === version) {
    const kept = hold.lists.get(list);
    if (kept) return kept;
  }
  // The version comes in the same statement as the people, so a list is never filed under a newer one.
  const rows = await namedQuery<Recipient & { list_version: string }>(
    manager,
    name,
    `SELECT v.version::text AS list_version, p.* FROM recipient_directory_version v
     LEFT JOIN LATERAL (SELECT ${RECIPIENT} FROM users u ${where}) p ON true ORDER BY p.email`,
    values,
  );
  const people = Object.freeze(
    rows.filter((r) => r.id !== null).map((r) => Object.freeze({ id: r.id, email: r.email, name: r.name, status: r.status, notification_preferences: r.notification_preferences })),
  );
  const readAs = rows[0]!.list_version;
  const current = hold?.version === readAs ? hold : { version: readAs, lists: new Map<string, readonly Recipient[]>() };
  current.lists.set(list, people);
  held.set(source, current);
  return people;
}

export async function labManagers(manager: EntityManager, labId: string): Promise<readonly Recipient[]> {
  return recipients(manager, `lab:${labId}`, 'notify.lab-managers', `WHERE u.organization_id = $1 AND u.role = 'lab_manager' AND u.status = 'active'`, [labId]);
}

export async function shopUsers(manager: EntityManager, partnerId: string): Promise<readonly Recipient[]> {
  return recipients(
    manager,
    `shop:${partnerId}`,
    'notify.shop-users',
    `WHERE u.organization_id = $1 AND u.role IN ('partner_admin', 'partner_staff') AND u.status = 'active'`,
    [partnerId],
  );
}

export async function networkAdmins(manager: EntityManager): Promise<readonly Recipient[]> {
  return recipients(
    manager,
    'network-admins',
    'notify.network-admins',
    `JOIN organizations o ON o.id = u.organization_id WHERE u.role = 'network_admin' AND u.status = 'active' AND o.active`,
    [],
  );
}

/** "Tue 3 Dec, 11:00 MST" in the lab's own time zone. */
export function formatLocal(at: Date, timeZone: string): string {
  return DateTime.fromJSDate(at).setZone(timeZone).toFormat('ccc d LLL, HH:mm ZZZZ');
}

export function deviceLabel(r: Pick<Referral, 'mediaType' | 'deviceMake' | 'deviceModel' | 'capacityGb'>): string {
  const name = [r.deviceMake, r.deviceModel].filter(Boolean).join(' ');
  const size = r.capacityGb ? (r.capacityGb >= 1000 ? `${Number((r.capacityGb / 1000).toFixed(1))} TB` : `${r.capacityGb} GB`) : null;
  const extra = [name, size].filter(Boolean).join(', ');
  return `${mediaTypeLabels[r.mediaType]}${extra ? ` (${extra})` : ''}`;
}

export function skillList(skills: readonly LabSkill[]): string {
  return skills.map((s) => labSkillLabels[s]).join(', ');
}
