import { cardFeeMinor } from '@shared/domain/money';
import { assessCard, type CardInput, type CardInputProblem, type CardDecline } from './cards';
import { invalidRequest } from './errors';
import {
  newId,
  nowSeconds,
  PaymentsStore,
  type Account,
  type BalanceTransaction,
  type Charge,
  type CheckoutSession,
  type LineItem,
  type Metadata,
  type PaymentIntent,
  type Refund,
  type RequestInfo,
  type StripeEvent,
  type Transfer,
} from './store';

/** How long an onboarding link stays usable (the provider's links expire after a few minutes, from memory). */
export const ACCOUNT_LINK_TTL_SECONDS = 300;
/** Checkout sessions expire after 24 hours unless `expires_at` says sooner (from memory of the provider docs). */
export const CHECKOUT_TTL_SECONDS = 24 * 60 * 60;

const NO_REQUEST: RequestInfo = { id: null, idempotencyKey: null };

export interface CreateAccountInput {
  type?: Account['type'];
  email?: string;
  country?: string;
  default_currency?: string;
  business_type?: string;
  business_profile?: { name?: string; url?: string };
  capabilities?: Record<string, { requested: boolean }>;
  metadata?: Metadata;
}

export interface CreateCheckoutInput {
  line_items: { price_data: { currency: string; unit_amount: number; product_data: { name: string } }; quantity: number }[];
  success_url: string;
  cancel_url?: string;
  metadata?: Metadata;
  client_reference_id?: string;
  customer_email?: string;
  expires_at?: number;
  payment_intent_data?: {
    metadata?: Metadata;
    description?: string;
    transfer_data?: { destination: string; amount?: number };
    application_fee_amount?: number;
    transfer_group?: string;
  };
}

export type PayOutcome =
  | { kind: 'succeeded'; session: CheckoutSession; paymentIntent: PaymentIntent; charge: Charge; redirectTo: string }
  | { kind: 'declined'; session: CheckoutSession; paymentIntent: PaymentIntent; charge: Charge; decline: CardDecline }
  | { kind: 'refused'; session: CheckoutSession; problem: CardInputProblem };

/** The provider's minimum charge for USD (from memory: $0.50). */
export const MINIMUM_CHARGE_MINOR = 50;

/** Requirements a fresh connected account shows until onboarding is done (a representative subset). */
const ONBOARDING_REQUIREMENTS = ['business_type', 'external_account', 'tos_acceptance.date', 'tos_acceptance.ip'];

/**
 * What the fake does, independent of HTTP: the API routes, the hosted pages and the test controls all
 * call these, so paying on the page and paying through `/_fake/checkout/:id/pay` cannot drift apart.
 */
export class PaymentsOperations {
  constructor(
    readonly store: PaymentsStore,
    private readonly options: {
      apiVersion: string;
      publicUrl: () => string;
      hasWebhookEndpoint: () => boolean;
      onEvent: (event: StripeEvent) => void;
    },
  ) {}

  emit(
    type: string,
    object: unknown,
    request: RequestInfo = NO_REQUEST,
    extra: { previous_attributes?: Record<string, unknown>; account?: string } = {},
  ): StripeEvent {
    const event: StripeEvent & { account?: string } = {
      id: newId('evt'),
      object: 'event',
      ...(extra.account ? { account: extra.account } : {}),
      api_version: this.options.apiVersion,
      created: nowSeconds(),
      // A snapshot: later changes to the object must not rewrite history.
      data: {
        object: structuredClone(object),
        ...(extra.previous_attributes ? { previous_attributes: extra.previous_attributes } : {}),
      },
      livemode: false,
      pending_webhooks: this.options.hasWebhookEndpoint() ? 1 : 0,
      request: { id: request.id, idempotency_key: request.idempotencyKey },
      type,
    };
    this.store.collections.events.set(event.id, event);
    this.options.onEvent(event);
    return event;
  }

  // ── Connected accounts ──────────────────────────────────────────────────────────────────────────────

  createAccount(input: CreateAccountInput): Account {
    const requested = Object.entries(input.capabilities ?? {})
      .filter(([, v]) => v.requested)
      .map(([name]) => name);
    const account: Account = {
      id: newId('acct'),
      object: 'account',
      // Platterpost creates Express accounts; the provider needs `type` or `controller`, we default to ours.
      type: input.type ?? 'express',
      email: input.email ?? null,
      country: (input.country ?? 'US').toUpperCase(),
      default_currency: (input.default_currency ?? 'usd').toLowerCase(),
      business_type: input.business_type ?? null,
      business_profile: { name: input.business_profile?.name ?? null, url: input.business_profile?.url ?? null },
      capabilities: Object.fromEntries(requested.map((name) => [name, 'inactive' as const])),
      charges_enabled: false,
      payouts_enabled: false,
      details_submitted: false,
      requirements: {
        currently_due: [...ONBOARDING_REQUIREMENTS],
        eventually_due: [...ONBOARDING_REQUIREMENTS],
        past_due: [],
        disabled_reason: 'requirements.past_due',
      },
      metadata: dropEmpty(input.metadata),
      created: nowSeconds(),
    };
    this.store.collections.accounts.set(account.id, account);
    return account;
  }

  updateAccount(
    id: string,
    input: { email?: string; business_profile?: { name?: string; url?: string }; metadata?: Metadata | '' },
    request: RequestInfo,
  ): Account {
    const account = this.store.get('accounts', id);
    const previous: Record<string, unknown> = {};
    if (input.email !== undefined) {
      previous.email = account.email;
      account.email = input.email;
    }
    if (input.business_profile) {
      previous.business_profile = { ...account.business_profile };
      account.business_profile = { ...account.business_profile, ...input.business_profile };
    }
    if (input.metadata !== undefined) {
      previous.metadata = { ...account.metadata };
      account.metadata = mergeMetadata(account.metadata, input.metadata);
    }
    this.emit('account.updated', account, request, { previous_attributes: previous, account: account.id });
    return account;
  }

  createAccountLink(input: {
    account: string;
    type: 'account_onboarding' | 'account_update';
    refresh_url?: string;
    return_url?: string;
  }): { object: 'account_link'; created: number; expires_at: number; url: string } {
    this.store.get('accounts', input.account, 'account');
    const created = nowSeconds();
    const token = newId('onb').slice(4);
    const record = {
      token,
      account: input.account,
      type: input.type,
      refresh_url: input.refresh_url ?? null,
      return_url: input.return_url ?? null,
      expires_at: created + ACCOUNT_LINK_TTL_SECONDS,
      used: false,
    };
    this.store.accountLinks.set(token, record);
    return { object: 'account_link', created, expires_at: record.expires_at, url: `${this.options.publicUrl()}/onboard/${token}` };
  }

  /** What finishing the hosted onboarding does: the account may now take charges and receive transfers. */
  completeOnboarding(accountId: string, businessName?: string, request: RequestInfo = NO_REQUEST): Account {
    const account = this.store.get('accounts', accountId);
    const previous = {
      charges_enabled: account.charges_enabled,
      payouts_enabled: account.payouts_enabled,
      details_submitted: account.details_submitted,
      capabilities: { ...account.capabilities },
      requirements: structuredClone(account.requirements),
    };
    account.charges_enabled = true;
    account.payouts_enabled = true;
    account.details_submitted = true;
    account.capabilities = { ...account.capabilities, transfers: 'active', card_payments: 'active' };
    for (const name of Object.keys(account.capabilities)) account.capabilities[name] = 'active';
    account.requirements = { currently_due: [], eventually_due: [], past_due: [], disabled_reason: null };
    if (account.business_type === null) account.business_type = 'company';
    if (businessName?.trim()) account.business_profile.name = businessName.trim();
    this.emit('account.updated', account, request, { previous_attributes: previous, account: account.id });
    return account;
  }

  private assertCanReceiveTransfers(destination: string, param: string): Account {
    const account = this.store.collections.accounts.get(destination);
    if (!account) {
      throw invalidRequest(`No such destination: '${destination}'`, { code: 'resource_missing', param });
    }
    if (account.capabilities.transfers !== 'active') {
      throw invalidRequest(
        `The destination account ${destination} has not finished onboarding, so its transfers capability is inactive and it cannot receive transfers.`,
        { code: 'insufficient_capabilities_for_transfer', param },
      );
    }
    return account;
  }

  // ── Checkout ────────────────────────────────────────────────────────────────────────────────────────

  createCheckoutSession(input: CreateCheckoutInput): CheckoutSession {
    const currencies = new Set(input.line_items.map((li) => li.price_data.currency));
    if (currencies.size > 1) {
      throw invalidRequest('All line items of a checkout session must use the same currency.', {
        param: 'line_items',
      });
    }
    const currency = input.line_items[0].price_data.currency;
    if (currency !== 'usd') {
      // The fee is computed with the US card rate, which is only meaningful in US dollars.
      throw invalidRequest(`This payments fake settles in usd only; got ${currency}.`, {
        param: 'line_items[0][price_data][currency]',
      });
    }
    const now = nowSeconds();
    const sessionId = newId('cs_test');
    const lineItems: LineItem[] = input.line_items.map((li) => {
      const total = li.price_data.unit_amount * li.quantity;
      return {
        id: newId('li'),
        object: 'item',
        amount_subtotal: total,
        amount_total: total,
        currency,
        description: li.price_data.product_data.name,
        quantity: li.quantity,
        price: {
          id: newId('price'),
          object: 'price',
          currency,
          unit_amount: li.price_data.unit_amount,
          product: newId('prod'),
        },
      };
    });
    const amount = lineItems.reduce((sum, li) => sum + li.amount_total, 0);
    if (!Number.isSafeInteger(amount)) throw invalidRequest('The total amount is too large.', { param: 'line_items' });
    if (amount < MINIMUM_CHARGE_MINOR) {
      throw invalidRequest(`The checkout total must be at least $0.50 usd; got ${amount} cents.`, {
        code: 'amount_too_small',
        param: 'line_items',
      });
    }

    const pid = input.payment_intent_data ?? {};
    if (pid.application_fee_amount !== undefined && pid.transfer_data?.amount !== undefined) {
      throw invalidRequest(
        'You may not specify both payment_intent_data[application_fee_amount] and payment_intent_data[transfer_data][amount].',
        { code: 'parameters_exclusive', param: 'payment_intent_data[application_fee_amount]' },
      );
    }
    if (pid.application_fee_amount !== undefined && pid.application_fee_amount > amount) {
      throw invalidRequest('The application fee cannot be greater than the amount of the charge.', {
        param: 'payment_intent_data[application_fee_amount]',
      });
    }
    if (pid.transfer_data?.amount !== undefined && pid.transfer_data.amount > amount) {
      throw invalidRequest('The transfer amount cannot be greater than the amount of the charge.', {
        param: 'payment_intent_data[transfer_data][amount]',
      });
    }
    if (pid.transfer_data) {
      this.assertCanReceiveTransfers(pid.transfer_data.destination, 'payment_intent_data[transfer_data][destination]');
    }
    if (input.expires_at !== undefined && (input.expires_at < now + 30 * 60 || input.expires_at > now + CHECKOUT_TTL_SECONDS)) {
      throw invalidRequest('expires_at must be between 30 minutes and 24 hours from now.', { param: 'expires_at' });
    }

    // The payment intent exists from the start, so our server can record its id when it creates the session.
    const paymentIntent: PaymentIntent = {
      id: newId('pi'),
      object: 'payment_intent',
      amount,
      amount_received: 0,
      currency,
      status: 'requires_payment_method',
      capture_method: 'automatic',
      payment_method_types: ['card'],
      payment_method: null,
      latest_charge: null,
      last_payment_error: null,
      description: pid.description ?? null,
      metadata: dropEmpty(pid.metadata),
      application_fee_amount: pid.application_fee_amount ?? null,
      transfer_data: pid.transfer_data ? { destination: pid.transfer_data.destination } : null,
      transfer_group: pid.transfer_group ?? null,
      created: now,
      livemode: false,
    };
    this.transferAmounts.set(paymentIntent.id, pid.transfer_data?.amount);
    const session: CheckoutSession = {
      id: sessionId,
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_subtotal: amount,
      amount_total: amount,
      currency,
      client_reference_id: input.client_reference_id ?? null,
      customer_email: input.customer_email ?? null,
      customer_details: null,
      metadata: dropEmpty(input.metadata),
      payment_intent: paymentIntent.id,
      success_url: input.success_url,
      cancel_url: input.cancel_url ?? null,
      url: `${this.options.publicUrl()}/pay/${sessionId}`,
      expires_at: input.expires_at ?? now + CHECKOUT_TTL_SECONDS,
      created: now,
      livemode: false,
    };
    this.store.collections.paymentIntents.set(paymentIntent.id, paymentIntent);
    this.store.collections.checkoutSessions.set(session.id, session);
    this.store.lineItems.set(session.id, lineItems);
    return session;
  }

  /** `transfer_data[amount]` is not shown on the payment intent by the provider, so it is kept aside. */
  private readonly transferAmounts = new Map<string, number | undefined>();

  /** The session, expired first if its time has passed (the provider expires sessions on its own). */
  getCheckoutSession(id: string): CheckoutSession {
    const session = this.store.get('checkoutSessions', id);
    if (session.status === 'open' && nowSeconds() >= session.expires_at) this.expire(session, NO_REQUEST);
    return session;
  }

  expireCheckoutSession(id: string, request: RequestInfo): CheckoutSession {
    const session = this.getCheckoutSession(id);
    if (session.status !== 'open') {
      throw invalidRequest(`Only open checkout sessions can be expired; ${id} is ${session.status}.`, { param: 'session' });
    }
    return this.expire(session, request);
  }

  private expire(session: CheckoutSession, request: RequestInfo): CheckoutSession {
    session.status = 'expired';
    session.url = null;
    const pi = this.store.collections.paymentIntents.get(session.payment_intent);
    if (pi && pi.status === 'requires_payment_method') pi.status = 'canceled';
    this.emit('checkout.session.expired', session, request);
    return session;
  }

  /** What submitting the hosted payment page does. */
  payCheckoutSession(sessionId: string, card: CardInput, request: RequestInfo = NO_REQUEST): PayOutcome {
    const session = this.getCheckoutSession(sessionId);
    if (session.status !== 'open') {
      throw invalidRequest(
        session.status === 'complete'
          ? `Checkout session ${sessionId} has already been paid.`
          : `Checkout session ${sessionId} has expired; start a new payment.`,
        { code: session.status === 'complete' ? 'checkout_session_complete' : 'checkout_session_expired', param: 'session' },
      );
    }
    const outcome = assessCard(card);
    if (outcome.kind === 'refused') return { kind: 'refused', session, problem: outcome.problem };

    const pi = this.store.get('paymentIntents', session.payment_intent);
    const now = nowSeconds();
    const charge: Charge = {
      id: newId('ch'),
      object: 'charge',
      amount: pi.amount,
      amount_captured: 0,
      amount_refunded: 0,
      currency: pi.currency,
      status: 'failed',
      paid: false,
      captured: false,
      refunded: false,
      failure_code: null,
      failure_message: null,
      outcome: { type: 'authorized', network_status: 'approved_by_network', reason: null },
      balance_transaction: null,
      payment_intent: pi.id,
      payment_method_details: {
        type: 'card',
        card: { brand: outcome.brand, last4: outcome.last4, exp_month: card.expMonth, exp_year: card.expYear },
      },
      application_fee_amount: pi.application_fee_amount,
      transfer_data: pi.transfer_data,
      transfer: null,
      transfer_group: pi.transfer_group,
      billing_details: { email: session.customer_email },
      metadata: { ...pi.metadata },
      created: now,
      livemode: false,
    };
    pi.payment_method = newId('pm');
    pi.latest_charge = charge.id;

    if (outcome.kind === 'declined') {
      const { decline } = outcome;
      charge.failure_code = decline.code;
      charge.failure_message = decline.message;
      charge.outcome = { type: 'issuer_declined', network_status: 'declined_by_network', reason: decline.declineCode ?? null };
      pi.last_payment_error = {
        type: 'card_error',
        code: decline.code,
        ...(decline.declineCode ? { decline_code: decline.declineCode } : {}),
        message: decline.message,
        charge: charge.id,
      };
      this.store.collections.charges.set(charge.id, charge);
      this.emit('charge.failed', charge, request);
      this.emit('payment_intent.payment_failed', pi, request);
      return { kind: 'declined', session, paymentIntent: pi, charge, decline };
    }

    const fee = cardFeeMinor(pi.amount);
    const txn = this.addBalanceTransaction({
      amount: pi.amount,
      currency: pi.currency,
      fee,
      type: 'charge',
      source: charge.id,
      description: pi.description,
    });
    Object.assign(charge, {
      status: 'succeeded',
      paid: true,
      captured: true,
      amount_captured: pi.amount,
      balance_transaction: txn.id,
    } satisfies Partial<Charge>);
    this.store.collections.charges.set(charge.id, charge);

    const previousPi = { status: pi.status, amount_received: pi.amount_received, last_payment_error: pi.last_payment_error };
    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    pi.last_payment_error = null;

    const previousSession = { status: session.status, payment_status: session.payment_status };
    session.status = 'complete';
    session.payment_status = 'paid';
    session.customer_details = { email: session.customer_email };
    session.url = null;

    this.emit('charge.succeeded', charge, request);
    if (pi.transfer_data) {
      // A destination charge: the connected account receives the charge less the application fee.
      const amount = this.transferAmounts.get(pi.id) ?? pi.amount - (pi.application_fee_amount ?? 0);
      const transfer = this.createTransfer(
        {
          amount,
          currency: pi.currency,
          destination: pi.transfer_data.destination,
          transfer_group: pi.transfer_group ?? undefined,
          source_transaction: charge.id,
        },
        request,
      );
      charge.transfer = transfer.id;
    }
    this.emit('payment_intent.succeeded', pi, request, { previous_attributes: previousPi });
    this.emit('checkout.session.completed', session, request, { previous_attributes: previousSession });
    return { kind: 'succeeded', session, paymentIntent: pi, charge, redirectTo: successRedirect(session) };
  }

  // ── Money movements ─────────────────────────────────────────────────────────────────────────────────

  private addBalanceTransaction(input: {
    amount: number;
    currency: string;
    fee: number;
    type: BalanceTransaction['type'];
    source: string;
    description: string | null;
  }): BalanceTransaction {
    const now = nowSeconds();
    const txn: BalanceTransaction = {
      id: newId('txn'),
      object: 'balance_transaction',
      amount: input.amount,
      currency: input.currency,
      fee: input.fee,
      fee_details: input.fee
        ? [{ amount: input.fee, currency: input.currency, type: 'stripe_fee', description: 'Processing fees', application: null }]
        : [],
      net: input.amount - input.fee,
      type: input.type,
      reporting_category: input.type,
      source: input.source,
      // Funds are shown as available at once; the fake has no settlement delay to simulate.
      status: 'available',
      available_on: now,
      description: input.description,
      created: now,
    };
    this.store.collections.balanceTransactions.set(txn.id, txn);
    return txn;
  }

  createRefund(
    input: { payment_intent?: string; charge?: string; amount?: number; reason?: string; metadata?: Metadata },
    request: RequestInfo,
  ): Refund {
    if (!input.payment_intent && !input.charge) {
      throw invalidRequest('Missing required param: payment_intent or charge.', { code: 'parameter_missing', param: 'payment_intent' });
    }
    let charge: Charge | undefined;
    if (input.charge) charge = this.store.get('charges', input.charge, 'charge');
    if (input.payment_intent) {
      const pi = this.store.get('paymentIntents', input.payment_intent, 'payment_intent');
      if (charge && charge.payment_intent !== pi.id) {
        throw invalidRequest(`Charge ${charge.id} does not belong to payment intent ${pi.id}.`, { param: 'charge' });
      }
      charge ??= pi.latest_charge ? this.store.collections.charges.get(pi.latest_charge) : undefined;
    }
    if (!charge || charge.status !== 'succeeded') {
      throw invalidRequest(`This payment has no successful charge to refund.`, { param: input.payment_intent ? 'payment_intent' : 'charge' });
    }
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining === 0) {
      throw invalidRequest(`Charge ${charge.id} has already been refunded.`, { code: 'charge_already_refunded', param: 'amount' });
    }
    const amount = input.amount ?? remaining;
    if (amount < 1) throw invalidRequest('Refund amount must be at least 1.', { param: 'amount' });
    if (amount > remaining) {
      throw invalidRequest(
        `Refund amount (${amount}) is greater than the unrefunded amount on charge ${charge.id} (${remaining}).`,
        { code: 'amount_too_large', param: 'amount' },
      );
    }
    const refundId = newId('re');
    // The provider keeps its processing fee when a charge is refunded (from memory), so the refund's fee is 0.
    const txn = this.addBalanceTransaction({
      amount: -amount,
      currency: charge.currency,
      fee: 0,
      type: 'refund',
      source: refundId,
      description: 'REFUND FOR CHARGE',
    });
    const refund: Refund = {
      id: refundId,
      object: 'refund',
      amount,
      currency: charge.currency,
      charge: charge.id,
      payment_intent: charge.payment_intent,
      reason: input.reason ?? null,
      status: 'succeeded',
      balance_transaction: txn.id,
      metadata: dropEmpty(input.metadata),
      created: nowSeconds(),
    };
    this.store.collections.refunds.set(refund.id, refund);
    const previous = { amount_refunded: charge.amount_refunded, refunded: charge.refunded };
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded === charge.amount;
    this.emit('refund.created', refund, request);
    this.emit('charge.refunded', charge, request, { previous_attributes: previous });
    return refund;
  }

  createTransfer(
    input: {
      amount: number;
      currency: string;
      destination: string;
      transfer_group?: string;
      metadata?: Metadata;
      description?: string;
      source_transaction?: string;
    },
    request: RequestInfo,
  ): Transfer {
    this.assertCanReceiveTransfers(input.destination, 'destination');
    if (input.source_transaction) this.store.get('charges', input.source_transaction, 'source_transaction');
    const transferId = newId('tr');
    const txn = this.addBalanceTransaction({
      amount: -input.amount,
      currency: input.currency,
      fee: 0,
      type: 'transfer',
      source: transferId,
      description: input.description ?? null,
    });
    const transfer: Transfer = {
      id: transferId,
      object: 'transfer',
      amount: input.amount,
      amount_reversed: 0,
      currency: input.currency,
      description: input.description ?? null,
      destination: input.destination,
      destination_payment: newId('py'),
      balance_transaction: txn.id,
      source_transaction: input.source_transaction ?? null,
      transfer_group: input.transfer_group ?? null,
      reversed: false,
      metadata: dropEmpty(input.metadata),
      created: nowSeconds(),
      livemode: false,
    };
    this.store.collections.transfers.set(transfer.id, transfer);
    this.emit('transfer.created', transfer, request);
    return transfer;
  }
}

/** `{CHECKOUT_SESSION_ID}` in the success URL is replaced with the session id, as the provider does. */
export function successRedirect(session: CheckoutSession): string {
  return session.success_url.replaceAll('{CHECKOUT_SESSION_ID}', session.id);
}

function dropEmpty(metadata: Metadata | undefined): Metadata {
  return Object.fromEntries(Object.entries(metadata ?? {}).filter(([, v]) => v !== ''));
}

/** The provider's update rule: a key set to "" is removed, and `metadata=""` clears everything. */
function mergeMetadata(current: Metadata, update: Metadata | ''): Metadata {
  if (update === '') return {};
  return dropEmpty({ ...current, ...update });
}
