import { DateTime } from 'luxon';
import type { EntityManager } from 'typeorm';
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

export async function labManagers(manager: EntityManager, labId: string): Promise<Recipient[]> {
  return namedQuery(manager, 'notify.lab-managers', `SELECT ${RECIPIENT} FROM users u WHERE u.organization_id = $1 AND u.role = 'lab_manager' AND u.status = 'active' ORDER BY u.email`, [labId]);
}

export async function shopUsers(manager: EntityManager, partnerId: string): Promise<Recipient[]> {
  return namedQuery(
    manager,
    'notify.shop-users',
    `SELECT ${RECIPIENT} FROM users u WHERE u.organization_id = $1 AND u.role IN ('partner_admin', 'partner_staff') AND u.status = 'active' ORDER BY u.email`,
    [partnerId],
  );
}

export async function networkAdmins(manager: EntityManager): Promise<Recipient[]> {
  return namedQuery(
    manager,
    'notify.network-admins',
    `SELECT ${RECIPIENT} FROM users u JOIN organizations o ON o.id = u.organization_id
     WHERE u.role = 'network_admin' AND u.status = 'active' AND o.active ORDER BY u.email`,
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
