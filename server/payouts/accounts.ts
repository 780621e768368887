import type Stripe from 'stripe';
import type { EntityManager } from 'typeorm';
import type { PayoutAccountDto } from '@shared/schemas/money';
import { recordAudit } from '../audit';
import { enqueueJob, queues } from '../jobs';
import type { Actor, ServiceContext } from '../lib/context';
import { AppError } from '../lib/errors';
import { logger } from '../lib/logger';
import { Organization } from '../organizations/entities';
import { paymentsClient } from './client';
import { PayoutAccount } from './entities';
import { updateReturning } from './sql';
import { onPaymentEvent } from './webhook';

/*
 * Payout accounts: each shop and lab is paid through a connected account at the payment provider. The
 * admin (shop admin, lab manager) starts onboarding here; the provider's hosted page collects the details
 * and sends them back; `account.updated` events keep our copy of the account's state current.
 */

export function toPayoutAccountDto(account: PayoutAccount | null): PayoutAccountDto {
  if (!account) {
    return { status: 'none', accountId: null, chargesEnabled: false, payoutsEnabled: false, detailsSubmitted: false, requirementsDue: [], updatedAt: null };
  }
  const status = account.payoutsEnabled ? 'enabled' : account.detailsSubmitted ? 'restricted' : 'onboarding';
  return {
    status,
    accountId: account.providerAccountId,
    chargesEnabled: account.chargesEnabled,
    payoutsEnabled: account.payoutsEnabled,
    detailsSubmitted: account.detailsSubmitted,
    requirementsDue: account.requirementsDue,
    updatedAt: account.updatedAt.toISOString(),
  };
}

function stateOf(account: Stripe.Account) {
  return {
    chargesEnabled: Boolean(account.charges_enabled),
    payoutsEnabled: Boolean(account.payouts_enabled),
    detailsSubmitted: Boolean(account.details_submitted),
    requirementsDue: account.requirements?.currently_due ?? [],
  };
}

function isMissing(err: unknown): boolean {
  const e = err as { statusCode?: number; code?: string };
  return e?.statusCode === 404 || e?.code === 'resource_missing';
}

const returnPath = (actor: Actor) => (actor.organizationKind === 'lab' ? '/lab/earnings' : '/partner/earnings');

/**
 * The organisation's payout account. While onboarding is not finished, asks the provider for the latest
 * state too, so a person coming back from the hosted page sees it even before the webhook arrives.
 */
export async function getPayoutAccount(ctx: ServiceContext, actor: Actor): Promise<PayoutAccountDto> {
  const account = await ctx.db.manager.findOneBy(PayoutAccount, { organizationId: actor.organizationId });
  if (!account || account.payoutsEnabled) return toPayoutAccountDto(account);
  try {
    const remote = await paymentsClient(ctx.config).accounts.retrieve(account.providerAccountId);
    await applyAccountState(ctx, ctx.db.manager, remote, new Date());
  } catch (err) {
    // The stored state is still worth showing; the provider being away is not the person's problem.
    logger.warn({ err: (err as Error).message, organizationId: actor.organizationId }, 'could not refresh the payout account');
  }
  return toPayoutAccountDto(await ctx.db.manager.findOneBy(PayoutAccount, { organizationId: actor.organizationId }));
}

/** Creates the connected account on first use and returns a fresh link to the provider's onboarding page. */
export async function startOnboarding(ctx: ServiceContext, actor: Actor): Promise<{ url: string; account: PayoutAccountDto }> {
  if (actor.organizationKind !== 'partner' && actor.organizationKind !== 'lab') throw AppError.forbidden('Only shops and labs have payout accounts');
  const stripe = paymentsClient(ctx.config);
  const accountId = await ctx.db.transaction(async (manager) => {
    // One account per organisation, even when two admins click at the same moment.
    await manager.query(`SELECT pg_advisory_xact_lock(hashtext('payout-account'), hashtext($1))`, [actor.organizationId]);
    const existing = await manager.findOneBy(PayoutAccount, { organizationId: actor.organizationId });
    if (existing) {
      try {
        await stripe.accounts.retrieve(existing.providerAccountId);
        return existing.providerAccountId;
      } catch (err) {
        // The provider no longer knows the account (the local fake forgets everything on restart): open a new one.
        if (!isMissing(err)) throw err;
        logger.warn({ organizationId: actor.organizationId, account: existing.providerAccountId }, 'payout account unknown to the provider; opening a new one');
      }
    }
    const org = await manager.findOneByOrFail(Organization, { id: actor.organizationId });
    const created = await stripe.accounts.create(
      {
        type: 'express',
        country: org.country || 'US',
        ...(org.email ? { email: org.email } : {}),
        business_profile: { name: org.name },
        capabilities: { transfers: { requested: true } },
        metadata: { organizationId: org.id, organizationKind: org.kind },
      },
      // Replaying the same click opens no second account; a replacement gets a key of its own.
      { idempotencyKey: `payout-account:${org.id}:${existing?.providerAccountId ?? 'first'}` },
    );
    const state = stateOf(created);
    await manager.upsert(
      PayoutAccount,
      { organizationId: org.id, providerAccountId: created.id, ...state, statusAsOf: created.created ? new Date(created.created * 1000) : new Date() },
      ['organizationId'],
    );
    await recordAudit(manager, {
      action: 'payout_account.created',
      actorUserId: actor.userId,
      organizationId: org.id,
      targetType: 'payout_account',
      targetId: created.id,
      details: { replaced: existing?.providerAccountId ?? null },
    });
    return created.id;
  });
  const base = `${ctx.config.appUrl}${returnPath(actor)}`;
  const link = await stripe.accountLinks.create({
    account: accountId,
    type: 'account_onboarding',
    return_url: `${base}?payouts=returned`,
    refresh_url: `${base}?payouts=refresh`,
  });
  const account = await ctx.db.manager.findOneBy(PayoutAccount, { organizationId: actor.organizationId });
  return { url: link.url, account: toPayoutAccountDto(account) };
}

/**
 * Stores what the provider says about an account, unless what we hold is newer. When payouts have just
 * become possible, the payee's statements that were waiting for an account are queued for payment.
 */
export async function applyAccountState(ctx: ServiceContext, manager: EntityManager, remote: Stripe.Account, asOf: Date): Promise<void> {
  const state = stateOf(remote);
  const rows = await updateReturning<{ organization_id: string; was_enabled: boolean }>(
    manager,
    `UPDATE payout_accounts p SET charges_enabled = $2, payouts_enabled = $3, details_submitted = $4, requirements_due = $5,
            status_as_of = $6, updated_at = now()
     FROM (SELECT organization_id, payouts_enabled AS was_enabled FROM payout_accounts WHERE provider_account_id = $1 FOR UPDATE) old
     WHERE p.organization_id = old.organization_id AND p.status_as_of <= $6
     RETURNING p.organization_id, old.was_enabled`,
    [remote.id, state.chargesEnabled, state.payoutsEnabled, state.detailsSubmitted, state.requirementsDue, asOf],
  );
  const row = rows[0];
  if (!row || row.was_enabled || !state.payoutsEnabled) return;
  const waiting: { id: string }[] = await manager.query(`SELECT id FROM statements WHERE organization_id = $1 AND status = 'no_account'`, [
    row.organization_id,
  ]);
  for (const s of waiting) await enqueueJob(manager, queues.payoutRetry, { statementId: s.id }, { singletonKey: s.id });
}

onPaymentEvent('account.updated', async (event, { manager, ctx }) => {
  await applyAccountState(ctx, manager, event.data.object as Stripe.Account, new Date(event.created * 1000));
});
