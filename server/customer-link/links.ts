import { createHash, randomBytes } from 'node:crypto';
import { IsNull, MoreThan, type EntityManager } from 'typeorm';
import { customerTokenPattern } from '@shared/schemas/customer';
import type { CustomerLinkDto } from '@shared/schemas/lab-work';
import { CustomerLink, type LinkIssuerType } from './entities';

// The customer's private link: 32 random bytes (256 bits) in base64url, far beyond guessing. Only the
// SHA-256 of the token is stored, so a copy of the database opens no case; a lost link is revoked and
// a new one issued. Each e-mail to the customer carries a link of its own, all valid until revoked.

/** How long a link works; long enough to outlast a slow recovery and the review of the files. */
export const CUSTOMER_LINK_TTL_DAYS = 180;
/** `last_used_at` is written at most this often per link. */
const TOUCH_RESOLUTION_MS = 60_000;

export interface LinkIssuer {
  type: LinkIssuerType;
  id?: string | null;
  name: string;
}

export const systemIssuer: LinkIssuer = { type: 'system', id: null, name: 'Platterpost' };

export function hashCustomerToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function customerCaseUrl(appUrl: string, token: string): string {
  return `${appUrl}/c/${token}`;
}

export function toCustomerLinkDto(link: CustomerLink): CustomerLinkDto {
  return {
    id: link.id,
    issuedAt: link.issuedAt.toISOString(),
    issuedBy: link.issuedByName,
    reason: link.reason,
    expiresAt: link.expiresAt.toISOString(),
    lastUsedAt: link.lastUsedAt?.toISOString() ?? null,
    revokedAt: link.revokedAt?.toISOString() ?? null,
  };
}

/** A new link to the case, in the caller's transaction. The token is returned once and never stored. */
export async function issueCustomerLink(
  manager: EntityManager,
  input: { referralId: string; reason: string; issuer: LinkIssuer; appUrl: string; now?: Date },
): Promise<{ link: CustomerLink; token: string; url: string }> {
  const now = input.now ?? new Date();
  const token = randomBytes(32).toString('base64url');
  const link = await manager.save(
    manager.create(CustomerLink, {
      referralId: input.referralId,
      tokenHash: hashCustomerToken(token),
      reason: input.reason,
      issuedAt: now,
      issuedByType: input.issuer.type,
      issuedById: input.issuer.id ?? null,
      issuedByName: input.issuer.name,
      expiresAt: new Date(now.getTime() + CUSTOMER_LINK_TTL_DAYS * 86_400_000),
      lastUsedAt: null,
      revokedAt: null,
      revokedByName: null,
    }),
  );
  return { link, token, url: customerCaseUrl(input.appUrl, token) };
}

/** The live link behind a token, or null when it is malformed, unknown, revoked or expired. */
export async function findActiveLink(manager: EntityManager, token: string, now = new Date()): Promise<CustomerLink | null> {
  if (!customerTokenPattern.test(token)) return null;
  return manager.findOneBy(CustomerLink, { tokenHash: hashCustomerToken(token), revokedAt: IsNull(), expiresAt: MoreThan(now) });
}

export async function touchLink(manager: EntityManager, link: CustomerLink, now = new Date()): Promise<void> {
  if (link.lastUsedAt && now.getTime() - link.lastUsedAt.getTime() < TOUCH_RESOLUTION_MS) return;
  await manager.update(CustomerLink, link.id, { lastUsedAt: now });
}

/** Switches off every live link of the case; answers how many there were. */
export async function revokeCaseLinks(manager: EntityManager, referralId: string, byName: string, now = new Date()): Promise<number> {
  const result = await manager.update(CustomerLink, { referralId, revokedAt: IsNull() }, { revokedAt: now, revokedByName: byName });
  return result.affected ?? 0;
}

export async function listCaseLinks(manager: EntityManager, referralId: string): Promise<CustomerLink[]> {
  return manager.find(CustomerLink, { where: { referralId }, order: { issuedAt: 'DESC', id: 'DESC' } });
}

/** Request lines in logs show the customer's page without its token: "/c/[token]". */
export function redactCustomerToken(url: string): string {
  return url.replace(/^\/c\/[A-Za-z0-9_-]{20,}/, '/c/[token]');
}
