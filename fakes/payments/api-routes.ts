import { z } from 'zod';
import { normaliseCurrency } from '@shared/domain/money';
import { invalidRequest } from './errors';
import type { PaymentsOperations } from './operations';
import {
  expandParam,
  formBool,
  formEnum,
  formInt,
  formString,
  formUrl,
  listParams,
  metadataParam,
  parseParams,
} from './params';
import type { RequestInfo } from './store';

/*
 * The `/v1` endpoints of the subset Platterpost uses, with the provider's paths, parameter names and
 * object shapes. Unknown parameters are refused, as the provider does, so a typo fails here and not later.
 */

export interface ApiContext {
  params: Record<string, string>;
  body: unknown;
  query: unknown;
  request: RequestInfo;
}

export interface ApiRoute {
  method: 'GET' | 'POST';
  path: string;
  handler: (ctx: ApiContext) => unknown;
}

const emailParam = z.string().regex(/^[^\s@]+@[^\s@]+\.[^\s@]+$/, { message: 'Invalid email address' });

/** ISO 4217 code; the provider answers in lower case. */
const currencyParam = z.string().transform((value, ctx) => {
  try {
    return normaliseCurrency(value).toLowerCase();
  } catch (error) {
    ctx.addIssue({ code: 'custom', message: (error as Error).message });
    return z.NEVER;
  }
});

const accountCreate = z.strictObject({
  type: formEnum('type', ['express', 'standard', 'custom']).optional(),
  email: emailParam.optional(),
  country: z.string().regex(/^[A-Za-z]{2}$/, { message: 'Country must be a two-letter ISO 3166-1 code' }).optional(),
  default_currency: currencyParam.optional(),
  business_type: formEnum('business_type', ['individual', 'company', 'non_profit', 'government_entity']).optional(),
  business_profile: z.strictObject({ name: formString(200).optional(), url: formString(500).optional() }).optional(),
  capabilities: z.record(z.string(), z.strictObject({ requested: formBool })).optional(),
  metadata: metadataParam.optional(),
  expand: expandParam,
});

const accountUpdate = z.strictObject({
  email: emailParam.optional(),
  business_profile: z.strictObject({ name: formString(200).optional(), url: formString(500).optional() }).optional(),
  metadata: z.union([z.literal(''), metadataParam]).optional(),
  expand: expandParam,
});

const accountLinkCreate = z.strictObject({
  account: z.string(),
  type: formEnum('type', ['account_onboarding', 'account_update']),
  refresh_url: formUrl.optional(),
  return_url: formUrl.optional(),
  collect: formEnum('collect', ['currently_due', 'eventually_due']).optional(),
  expand: expandParam,
});

const lineItemParam = z.strictObject({
  price_data: z.strictObject({
    currency: currencyParam,
    unit_amount: formInt({ min: 0 }),
    product_data: z.strictObject({
      name: formString(250),
      description: formString(500).optional(),
      metadata: metadataParam.optional(),
    }),
  }),
  quantity: formInt({ min: 1 }),
});

const checkoutCreate = z.strictObject({
  mode: formEnum('mode', ['payment', 'setup', 'subscription']),
  line_items: z.array(lineItemParam).min(1, { message: 'At least one line item is required' }),
  success_url: formUrl,
  cancel_url: formUrl.optional(),
  metadata: metadataParam.optional(),
  client_reference_id: formString(200).optional(),
  customer_email: emailParam.optional(),
  expires_at: formInt().optional(),
  locale: formString(10).optional(),
  submit_type: formEnum('submit_type', ['auto', 'pay', 'book', 'donate']).optional(),
  payment_method_types: z.array(formEnum('payment_method_types', ['card'])).optional(),
  payment_intent_data: z
    .strictObject({
      metadata: metadataParam.optional(),
      description: formString(1000).optional(),
      capture_method: formEnum('capture_method', ['automatic']).optional(),
      transfer_data: z.strictObject({ destination: z.string(), amount: formInt({ min: 1 }).optional() }).optional(),
      application_fee_amount: formInt({ min: 0 }).optional(),
      transfer_group: formString(500).optional(),
      statement_descriptor: formString(22).optional(),
      receipt_email: emailParam.optional(),
    })
    .optional(),
  expand: expandParam,
});

const refundCreate = z.strictObject({
  payment_intent: z.string().optional(),
  charge: z.string().optional(),
  amount: formInt({ min: 1 }).optional(),
  reason: formEnum('reason', ['duplicate', 'fraudulent', 'requested_by_customer']).optional(),
  metadata: metadataParam.optional(),
  expand: expandParam,
});

const transferCreate = z.strictObject({
  amount: formInt({ min: 1 }),
  currency: currencyParam,
  destination: z.string(),
  transfer_group: formString(500).optional(),
  description: formString(1000).optional(),
  source_transaction: z.string().optional(),
  metadata: metadataParam.optional(),
  expand: expandParam,
});

const retrieveParams = z.strictObject({ expand: expandParam });

/** A list endpoint's parameters: paging plus the filters it names. */
const listOf = <F extends Record<string, z.ZodType>>(filters: F) => z.strictObject({ ...listParams, ...filters });

const optionalString = z.string().optional();

export function apiRoutes(ops: PaymentsOperations): ApiRoute[] {
  const { store } = ops;
  const c = store.collections;

  const retrieve =
    <K extends keyof typeof c>(collection: K) =>
    ({ params, query }: ApiContext) => {
      const { expand } = parseParams(retrieveParams, query);
      return store.expand(store.get(collection, params.id), expand);
    };

  return [
    // Connected accounts
    {
      method: 'POST',
      path: '/v1/accounts',
      handler: ({ body }) => {
        const { expand, ...input } = parseParams(accountCreate, body);
        return store.expand(ops.createAccount(input), expand);
      },
    },
    {
      method: 'GET',
      path: '/v1/accounts',
      handler: ({ query }) => {
        const { expand, ...page } = parseParams(listOf({}), query);
        return store.expand(store.list(c.accounts.values(), page, '/v1/accounts'), expand);
      },
    },
    { method: 'GET', path: '/v1/accounts/:id', handler: retrieve('accounts') },
    {
      method: 'POST',
      path: '/v1/accounts/:id',
      handler: ({ params, body, request }) => {
        const { expand, ...input } = parseParams(accountUpdate, body);
        return store.expand(ops.updateAccount(params.id, input, request), expand);
      },
    },
    {
      method: 'POST',
      path: '/v1/account_links',
      handler: ({ body }) => {
        const { expand: _expand, collect: _collect, ...input } = parseParams(accountLinkCreate, body);
        return ops.createAccountLink(input);
      },
    },

    // Checkout
    {
      method: 'POST',
      path: '/v1/checkout/sessions',
      handler: ({ body }) => {
        const { expand, mode, ...input } = parseParams(checkoutCreate, body);
        if (mode !== 'payment') {
          throw invalidRequest(`This payments fake supports mode=payment only; got mode=${mode}.`, { param: 'mode' });
        }
        return store.expand(ops.createCheckoutSession(input), expand);
      },
    },
    {
      method: 'GET',
      path: '/v1/checkout/sessions',
      handler: ({ query }) => {
        const { expand, payment_intent, ...page } = parseParams(listOf({ payment_intent: optionalString }), query);
        const list = store.list(
          c.checkoutSessions.values(),
          page,
          '/v1/checkout/sessions',
          (s) => !payment_intent || s.payment_intent === payment_intent,
        );
        return store.expand(list, expand);
      },
    },
    {
      method: 'GET',
      path: '/v1/checkout/sessions/:id',
      handler: ({ params, query }) => {
        const { expand } = parseParams(retrieveParams, query);
        return store.expand(ops.getCheckoutSession(params.id), expand);
      },
    },
    {
      method: 'GET',
      path: '/v1/checkout/sessions/:id/line_items',
      handler: ({ params, query }) => {
        const { expand: _expand, ...page } = parseParams(listOf({}), query);
        ops.getCheckoutSession(params.id);
        // Line items are listed in the order they were given, unlike most lists.
        const items = [...(store.lineItems.get(params.id) ?? [])].reverse();
        return store.list(items, page, `/v1/checkout/sessions/${params.id}/line_items`);
      },
    },
    {
      method: 'POST',
      path: '/v1/checkout/sessions/:id/expire',
      handler: ({ params, body, request }) => {
        const { expand } = parseParams(retrieveParams, body);
        return store.expand(ops.expireCheckoutSession(params.id, request), expand);
      },
    },

    // Payment intents and charges (created by checkout; read here)
    { method: 'GET', path: '/v1/payment_intents/:id', handler: retrieve('paymentIntents') },
    {
      method: 'GET',
      path: '/v1/payment_intents',
      handler: ({ query }) => {
        const { expand, ...page } = parseParams(listOf({}), query);
        return store.expand(store.list(c.paymentIntents.values(), page, '/v1/payment_intents'), expand);
      },
    },
    { method: 'GET', path: '/v1/charges/:id', handler: retrieve('charges') },
    {
      method: 'GET',
      path: '/v1/charges',
      handler: ({ query }) => {
        const { expand, payment_intent, ...page } = parseParams(listOf({ payment_intent: optionalString }), query);
        const list = store.list(c.charges.values(), page, '/v1/charges', (ch) => !payment_intent || ch.payment_intent === payment_intent);
        return store.expand(list, expand);
      },
    },

    // Refunds
    {
      method: 'POST',
      path: '/v1/refunds',
      handler: ({ body, request }) => {
        const { expand, ...input } = parseParams(refundCreate, body);
        return store.expand(ops.createRefund(input, request), expand);
      },
    },
    { method: 'GET', path: '/v1/refunds/:id', handler: retrieve('refunds') },
    {
      method: 'GET',
      path: '/v1/refunds',
      handler: ({ query }) => {
        const { expand, payment_intent, charge, ...page } = parseParams(
          listOf({ payment_intent: optionalString, charge: optionalString }),
          query,
        );
        const list = store.list(
          c.refunds.values(),
          page,
          '/v1/refunds',
          (r) => (!payment_intent || r.payment_intent === payment_intent) && (!charge || r.charge === charge),
        );
        return store.expand(list, expand);
      },
    },

    // Transfers to connected accounts
    {
      method: 'POST',
      path: '/v1/transfers',
      handler: ({ body, request }) => {
        const { expand, ...input } = parseParams(transferCreate, body);
        return store.expand(ops.createTransfer(input, request), expand);
      },
    },
    { method: 'GET', path: '/v1/transfers/:id', handler: retrieve('transfers') },
    {
      method: 'GET',
      path: '/v1/transfers',
      handler: ({ query }) => {
        const { expand, transfer_group, destination, ...page } = parseParams(
          listOf({ transfer_group: optionalString, destination: optionalString }),
          query,
        );
        const list = store.list(
          c.transfers.values(),
          page,
          '/v1/transfers',
          (t) => (!transfer_group || t.transfer_group === transfer_group) && (!destination || t.destination === destination),
        );
        return store.expand(list, expand);
      },
    },

    // Balance transactions
    { method: 'GET', path: '/v1/balance_transactions/:id', handler: retrieve('balanceTransactions') },
    {
      method: 'GET',
      path: '/v1/balance_transactions',
      handler: ({ query }) => {
        const { expand, type, source, ...page } = parseParams(
          listOf({ type: formEnum('type', ['charge', 'refund', 'transfer']).optional(), source: optionalString }),
          query,
        );
        const list = store.list(
          c.balanceTransactions.values(),
          page,
          '/v1/balance_transactions',
          (t) => (!type || t.type === type) && (!source || t.source === source),
        );
        return store.expand(list, expand);
      },
    },

    // Events
    { method: 'GET', path: '/v1/events/:id', handler: retrieve('events') },
    {
      method: 'GET',
      path: '/v1/events',
      handler: ({ query }) => {
        const { expand: _expand, type, types, ...page } = parseParams(
          listOf({ type: optionalString, types: z.array(z.string()).optional() }),
          query,
        );
        if (type && types) {
          throw invalidRequest('You may pass either type or types, but not both.', { code: 'parameters_exclusive', param: 'types' });
        }
        // `type` may end in `*` to match a family, e.g. `charge.*`.
        const matches = (t: string) => {
          const wanted = types ?? (type ? [type] : []);
          return wanted.length === 0 || wanted.some((w) => (w.endsWith('*') ? t.startsWith(w.slice(0, -1)) : t === w));
        };
        return store.list(c.events.values(), page, '/v1/events', (e) => matches(e.type));
      },
    },
  ];
}
