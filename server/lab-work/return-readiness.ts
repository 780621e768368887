import type { EntityManager } from 'typeorm';
import { caseStatusLabels } from '@shared/vocabulary';
import type { Referral } from '../referrals/entities';
import { CustomerCheckout, RecoveredFileManifest } from './entities';
import { readTogether } from '../db/reads';

/**
 * For the return shipment: what the case still waits for before its box leaves the lab, or null when it
 * may go. The device alone goes back after a declined quote or no recovery (nothing is owed); the data on
 * new media goes back once the customer has paid and confirmed the recovered files.
 */
export async function returnWaitingFor(manager: EntityManager, referral: Pick<Referral, 'id' | 'status'>): Promise<string | null> {
  if (['quote_declined', 'no_recovery', 'returned', 'closed', 'cancelled'].includes(referral.status)) return null;
  if (referral.status !== 'ready_for_review') {
    return `The lab’s work is not finished: the case is ${caseStatusLabels[referral.status].toLowerCase()}.`;
  }
  const [paid, manifest] = await readTogether(manager, [
    () => manager.existsBy(CustomerCheckout, { referralId: referral.id, status: 'paid' }),
    () => manager.findOne(RecoveredFileManifest, { where: { referralId: referral.id }, order: { version: 'DESC' } }),
  ]);
  if (!paid) return 'Waiting for the customer’s payment.';
  if (manifest?.reviewStatus !== 'confirmed') return 'Waiting for the customer to confirm the recovered files.';
  return null;
}
