import { randomBytes } from 'node:crypto';
import { invalidRequest, resourceMissing } from './errors';

/*
 * In-memory state of the payments fake. Objects keep the provider's field names (snake_case, unix-second
 * timestamps, ids with the provider's prefixes) because they go over the wire unchanged.
 */

export type Metadata = Record<string, string>;

export interface Account {
  id: string;
  object: 'account';
  type: 'express' | 'standard' | 'custom';
  email: string | null;
  country: string;
  default_currency: string;
  business_type: string | null;
  business_profile: { name: string | null; url: string | null };
  capabilities: Record<string, 'active' | 'inactive' | 'pending'>;
  charges_enabled: boolean;
  payouts_enabled: boolean;
  details_submitted: boolean;
  requirements: { currently_due: string[]; eventually_due: string[]; past_due: string[]; disabled_reason: string | null };
  metadata: Metadata;
  created: number;
}

export interface AccountLinkRecord {
  token: string;
  account: string;
  type: 'account_onboarding' | 'account_update';
  refresh_url: string | null;
  return_url: string | null;
  expires_at: number;
  used: boolean;
}

export interface LineItem {
  id: string;
  object: 'item';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  description: string;
  quantity: number;
  price: {
    id: string;
    object: 'price';
    currency: string;
    unit_amount: number;
    product: string;
  };
}

export interface CheckoutSession {
  id: string;
  object: 'checkout.session';
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  client_reference_id: string | null;
  customer_email: string | null;
  customer_details: { email: string | null } | null;
  metadata: Metadata;
  payment_intent: string;
  success_url: string;
  cancel_url: string | null;
  url: string | null;
  expires_at: number;
  created: number;
  livemode: false;
}

export interface LastPaymentError {
  type: 'card_error';
  code: string;
  decline_code?: string;
  message: string;
  charge?: string;
}

export interface PaymentIntent {
  id: string;
  object: 'payment_intent';
  amount: number;
  amount_received: number;
  currency: string;
  status: 'requires_payment_method' | 'succeeded' | 'canceled';
  capture_method: 'automatic';
  payment_method_types: string[];
  payment_method: string | null;
  latest_charge: string | null;
  last_payment_error: LastPaymentError | null;
  description: string | null;
  metadata: Metadata;
  application_fee_amount: number | null;
  transfer_data: { destination: string } | null;
  transfer_group: string | null;
  created: number;
  livemode: false;
}

export interface Charge {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  currency: string;
  status: 'succeeded' | 'failed';
  paid: boolean;
  captured: boolean;
  refunded: boolean;
  failure_code: string | null;
  failure_message: string | null;
  outcome: { type: 'authorized' | 'issuer_declined'; network_status: string; reason: string | null };
  balance_transaction: string | null;
  payment_intent: string;
  payment_method_details: { type: 'card'; card: { brand: string; last4: string; exp_month: number; exp_year: number } };
  application_fee_amount: number | null;
  transfer_data: { destination: string } | null;
  transfer: string | null;
  transfer_group: string | null;
  billing_details: { email: string | null };
  metadata: Metadata;
  created: number;
  livemode: false;
}

export interface BalanceTransaction {
  id: string;
  object: 'balance_transaction';
  amount: number;
  currency: string;
  fee: number;
  fee_details: { amount: number; currency: string; type: 'stripe_fee'; description: string; application: null }[];
  net: number;
  type: 'charge' | 'refund' | 'transfer';
  reporting_category: 'charge' | 'refund' | 'transfer';
  source: string;
  status: 'available';
  available_on: number;
  description: string | null;
  created: number;
}

export interface Refund {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  charge: string;
  payment_intent: string;
  reason: string | null;
  status: 'succeeded';
  balance_transaction: string;
  metadata: Metadata;
  created: number;
}

export interface Transfer {
  id: string;
  object: 'transfer';
  amount: number;
  amount_reversed: number;
  currency: string;
  description: string | null;
  destination: string;
  destination_payment: string;
  balance_transaction: string;
  source_transaction: string | null;
  transfer_group: string | null;
  reversed: boolean;
  metadata: Metadata;
  created: number;
  livemode: false;
}

export interface StripeEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  data: { object: unknown; previous_attributes?: Record<string, unknown> };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
  type: string;
}

/** Which request caused an event; hosted-page actions have none, as with the provider. */
export interface RequestInfo {
  id: string | null;
  idempotencyKey: string | null;
}

type Stored =
  | Account
  | CheckoutSession
  | PaymentIntent
  | Charge
  | BalanceTransaction
  | Refund
  | Transfer
  | StripeEvent;

export interface Collections {
  accounts: Map<string, Account>;
  checkoutSessions: Map<string, CheckoutSession>;
  paymentIntents: Map<string, PaymentIntent>;
  charges: Map<string, Charge>;
  balanceTransactions: Map<string, BalanceTransaction>;
  refunds: Map<string, Refund>;
  transfers: Map<string, Transfer>;
  events: Map<string, StripeEvent>;
}

/** Id prefix → collection and the name used in "No such …" messages. */
const prefixes: Record<string, { collection: keyof Collections; name: string }> = {
  acct: { collection: 'accounts', name: 'account' },
  cs: { collection: 'checkoutSessions', name: 'checkout session' },
  pi: { collection: 'paymentIntents', name: 'payment_intent' },
  ch: { collection: 'charges', name: 'charge' },
  txn: { collection: 'balanceTransactions', name: 'balance transaction' },
  re: { collection: 'refunds', name: 'refund' },
  tr: { collection: 'transfers', name: 'transfer' },
  evt: { collection: 'events', name: 'event' },
};

const base62 = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

/** Random ids in the provider's style: `pi_3Qx…` (prefix, underscore, 24 base-62 characters). */
export function newId(prefix: string): string {
  const bytes = randomBytes(24);
  let out = '';
  for (const b of bytes) out += base62[b % 62];
  return `${prefix}_${out}`;
}

export function nowSeconds(): number {
  return Math.floor(Date.now() / 1000);
}

export interface ListPage<T> {
  object: 'list';
  data: T[];
  has_more: boolean;
  url: string;
}

export function createCollections(): Collections {
  return {
    accounts: new Map(),
    checkoutSessions: new Map(),
    paymentIntents: new Map(),
    charges: new Map(),
    balanceTransactions: new Map(),
    refunds: new Map(),
    transfers: new Map(),
    events: new Map(),
  };
}

export class PaymentsStore {
  readonly collections: Collections = createCollections();
  readonly accountLinks = new Map<string, AccountLinkRecord>();
  readonly lineItems = new Map<string, LineItem[]>();

  reset(): void {
    for (const map of Object.values(this.collections)) map.clear();
    this.accountLinks.clear();
    this.lineItems.clear();
  }

  /** The object with this id from `collection`, or the provider's 404. */
  get<K extends keyof Collections>(collection: K, id: string, param = 'id'): NonNullable<ReturnType<Collections[K]['get']>> {
    const found = this.collections[collection].get(id) as ReturnType<Collections[K]['get']>;
    if (!found) {
      const name = Object.values(prefixes).find((p) => p.collection === collection)?.name ?? collection;
      throw resourceMissing(name, id, param);
    }
    return found as NonNullable<ReturnType<Collections[K]['get']>>;
  }

  findById(id: string): Stored | undefined {
    const prefix = id.split('_')[0];
    const entry = prefixes[prefix];
    return entry ? (this.collections[entry.collection].get(id) as Stored | undefined) : undefined;
  }

  /**
   * Newest first, as the provider lists; `starting_after`/`ending_before` are ids from a previous page.
   * `keep` filters before paging so `has_more` is about the filtered list.
   */
  list<T extends { id: string }>(
    items: Iterable<T>,
    params: { limit?: number; starting_after?: string; ending_before?: string },
    url: string,
    keep: (item: T) => boolean = () => true,
  ): ListPage<T> {
    const all = [...items].filter(keep).reverse();
    const limit = params.limit ?? 10;
    let start = 0;
    let end = all.length;
    if (params.starting_after) {
      const at = all.findIndex((i) => i.id === params.starting_after);
      if (at < 0) throw resourceMissing('object', params.starting_after, 'starting_after');
      start = at + 1;
    }
    if (params.ending_before) {
      const at = all.findIndex((i) => i.id === params.ending_before);
      if (at < 0) throw resourceMissing('object', params.ending_before, 'ending_before');
      end = at;
      start = Math.max(start, end - limit);
    }
    const data = all.slice(start, Math.min(end, start + limit));
    const has_more = params.ending_before ? start > 0 : start + limit < end;
    return { object: 'list', data, has_more, url };
  }

  /**
   * Replaces id strings with the objects they name, as `expand[]=payment_intent` or
   * `expand[]=latest_charge.balance_transaction` do; list responses expand through `data.`.
   */
  expand<T>(value: T, paths: readonly string[] | undefined): T {
    if (!paths?.length) return value;
    const copy = structuredClone(value) as unknown;
    for (const path of paths) {
      const parts = path.split('.');
      if (parts.length > 4) throw invalidRequest(`You cannot expand more than 4 levels of a property (${path}).`, { param: 'expand' });
      this.expandAt(copy, parts, path);
    }
    return copy as T;
  }

  private expandAt(target: unknown, parts: string[], fullPath: string): void {
    if (target === null || typeof target !== 'object' || parts.length === 0) return;
    const [head, ...rest] = parts;
    const record = target as Record<string, unknown>;
    if (head === 'data' && (record as { object?: unknown }).object === 'list' && Array.isArray(record.data)) {
      for (const item of record.data) this.expandAt(item, rest, fullPath);
      return;
    }
    if (!(head in record)) {
      throw invalidRequest(`This property cannot be expanded (${fullPath}).`, { param: 'expand' });
    }
    const current = record[head];
    if (typeof current === 'string') {
      const found = this.findById(current);
      if (!found) throw invalidRequest(`This property cannot be expanded (${fullPath}).`, { param: 'expand' });
      record[head] = structuredClone(found);
    }
    this.expandAt(record[head], rest, fullPath);
  }
}
