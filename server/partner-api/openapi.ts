import { OpenAPIRegistry, OpenApiGeneratorV31, type RouteConfig } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { apiErrorSchema } from '@shared/schemas/api-error';
import {
  PHOTO_MAX_BYTES,
  PHOTOS_PER_REFERRAL,
  referralPhotoDto,
  idempotencyKeySchema,
} from '@shared/schemas/partner-api';
import { referralDto, referralInput, referralListDto, referralListQuery, routingPreviewDto, routingPreviewInput } from '@shared/schemas/referrals';
import { caseStatuses } from '@shared/vocabulary';
import { buyShipmentInput, createShipmentInput, shipmentDto } from '@shared/schemas/shipping';
import type { Config } from '../config';
import * as ex from './openapi-examples';
import { registerWebhookEvents } from '../webhooks/openapi';

// The partner API's OpenAPI 3.1 document, generated from the same zod schemas the routes parse
// with. Schemas get their component names through zod's own .meta({ id }), which the generator
// reads (schemas made before an extendZodWithOpenApi call would lack .openapi()).

export const API_VERSION = '1.0.0';
const SECURITY = [{ partnerApiKey: [] }];

const ReferralInput = referralInput.meta({
  id: 'ReferralInput',
  description:
    'A new referral. `consent` is optional through the API: the partner records consent under its agreement with the network, ' +
    'and the case notes that it came from the partner’s system.',
  example: ex.referralInputExample,
});
const Referral = referralDto.meta({ id: 'Referral', description: 'A case, as the shop sees it.', example: ex.referralExample });
const ReferralList = referralListDto.meta({
  id: 'ReferralList',
  description: 'One page of cases, newest change first. Pass `nextCursor` back as `cursor` for the next page; null on the last page.',
  example: ex.referralListExample,
});
const RoutingPreviewInput = routingPreviewInput.meta({
  id: 'RoutingPreviewInput',
  description: 'Everything routing reads. Nothing is stored.',
  example: ex.routingPreviewExample,
});
const RoutingPreview = routingPreviewDto.meta({ id: 'RoutingPreview', description: 'Required skills, cautions, and the labs that would be offered the case, with reasons.', example: ex.routingPreviewResponseExample });
const ApiError = apiErrorSchema.meta({
  id: 'Error',
  description: 'Every error has this shape. `fields` lists each field that needs attention, by its path in the body (e.g. `customer.email`, `symptoms.0`).',
  example: ex.errorExamples.validation,
});
const KeyInfo = z
  .object({
    apiKey: z.object({ id: z.string().uuid(), name: z.string(), prefix: z.string() }),
    organization: z.object({ id: z.string().uuid(), name: z.string() }),
  })
  .meta({ id: 'KeyInfo' });
const Photo = referralPhotoDto.meta({ id: 'Photo', description: 'A condition photo of the device.' });

const idParams = z.object({
  id: z.string().uuid().meta({ description: 'The referral’s id', example: ex.referralExample.id }),
});
const idempotencyHeader = z.object({
  'Idempotency-Key': idempotencyKeySchema.optional().meta({
    description:
      'Makes a POST safe to retry. Kept for 24 hours per API key: a retry with the same key and the same body gets the first ' +
      'answer again (with `Idempotent-Replayed: true`) and does the work only once; the same key with another body answers 409 ' +
      '`idempotency_key_reused`; a retry while the first request is still running answers 409 `idempotency_in_progress`. ' +
      'Failed requests (4xx, 5xx) are not kept, so a corrected request may reuse the key.',
    example: 'jl-ticket-2291-open',
  }),
});
const listQuery = referralListQuery.extend({
  status: z.enum(caseStatuses).optional().meta({ description: 'Only cases in this status' }),
  updatedSince: referralListQuery.shape.updatedSince.meta({ description: 'Only cases changed at or after this time (ISO 8601)', example: '2026-03-01T00:00:00Z' }),
  limit: referralListQuery.shape.limit.meta({ description: 'Page size, 1–100' }),
  cursor: referralListQuery.shape.cursor.meta({ description: 'The `nextCursor` of the previous page' }),
  q: referralListQuery.shape.q.meta({ description: 'Search the reference, your external reference, or the customer’s name or e-mail' }),
});

const json = (schema: z.ZodType, example?: unknown) => ({ 'application/json': { schema, ...(example !== undefined ? { example } : {}) } });
const rateHeaders = {
  RateLimit: { description: 'IETF draft-7 rate-limit fields for this key: limit, remaining, reset (seconds)', schema: { type: 'string' as const } },
  'RateLimit-Policy': { description: 'The limit and its window in seconds', schema: { type: 'string' as const } },
};
const errors = {
  400: { description: 'A field needs attention, or the body is not valid JSON. Nothing was written.', content: json(ApiError, ex.errorExamples.validation) },
  401: { description: 'No API key, or a key that is malformed, unknown or revoked.', content: json(ApiError, ex.errorExamples.unauthenticated) },
  429: {
    description: 'This key made too many requests this minute. Wait for `Retry-After` seconds.',
    headers: { 'Retry-After': { description: 'Seconds until the window resets', schema: { type: 'integer' as const } } },
    content: json(ApiError, ex.errorExamples.rateLimited),
  },
};
const notFound = { description: 'No such referral for this partner (another partner’s case is not found either).', content: json(ApiError, ex.errorExamples.notFound) };
const conflict = {
  description: 'The Idempotency-Key was used with another body, or its first request is still running.',
  content: json(ApiError, ex.errorExamples.reused),
};

/** Every route of /api/v1, in the order the router mounts them. */
export const partnerApiPaths: RouteConfig[] = [
  {
    method: 'get',
    path: '/api/v1/openapi.json',
    tags: ['Meta'],
    summary: 'This document',
    description: 'The OpenAPI 3.1 description of the partner API. Needs no key.',
    security: [],
    responses: { 200: { description: 'The OpenAPI document', content: { 'application/json': { schema: z.object({ openapi: z.string() }).passthrough() } } } },
  },
  {
    method: 'get',
    path: '/api/v1/me',
    tags: ['Meta'],
    summary: 'Check a key',
    description: 'The key this request authenticated with and the partner organisation it acts for.',
    security: SECURITY,
    responses: { 200: { description: 'The key and its organisation', headers: rateHeaders, content: json(KeyInfo, ex.keyInfoExample) }, 401: errors[401], 429: errors[429] },
  },
  {
    method: 'post',
    path: '/api/v1/referrals',
    tags: ['Referrals'],
    summary: 'Open a referral',
    description:
      'Opens a case for a customer’s device: triage works out the skills it needs and the best lab is offered it at once. ' +
      'Send an `Idempotency-Key` so that a retry after a timeout cannot open the case twice.',
    security: SECURITY,
    request: { headers: idempotencyHeader, body: { required: true, content: json(ReferralInput, ex.referralInputExample) } },
    responses: {
      201: { description: 'The new case', headers: { 'Idempotent-Replayed': { description: '`true` when this is the stored answer of an earlier request', schema: { type: 'string' } } }, content: json(Referral) },
      ...errors,
      409: conflict,
    },
  },
  {
    method: 'get',
    path: '/api/v1/referrals',
    tags: ['Referrals'],
    summary: 'List referrals',
    description: 'The partner’s cases, newest change first, one page at a time (keyset paging: stable while cases change).',
    security: SECURITY,
    request: { query: listQuery },
    responses: { 200: { description: 'One page of cases', headers: rateHeaders, content: json(ReferralList) }, 400: errors[400], 401: errors[401], 429: errors[429] },
  },
  {
    method: 'get',
    path: '/api/v1/referrals/{id}',
    tags: ['Referrals'],
    summary: 'Get a referral',
    description: 'The case with its triage, routing, current offer, photos, timeline and shipments.',
    security: SECURITY,
    request: { params: idParams },
    responses: { 200: { description: 'The case', headers: rateHeaders, content: json(Referral, ex.referralExample) }, 400: errors[400], 401: errors[401], 404: notFound, 429: errors[429] },
  },
  {
    method: 'delete',
    path: '/api/v1/referrals/{id}',
    tags: ['Referrals'],
    summary: 'Cancel a referral',
    description: 'Cancels the case while nothing has shipped; the lab’s pending offer is withdrawn.',
    security: SECURITY,
    request: { params: idParams },
    responses: {
      200: { description: 'The cancelled case', content: json(Referral) },
      400: errors[400],
      401: errors[401],
      404: notFound,
      409: { description: 'The case can no longer be cancelled (its box has shipped, or it is closed).', content: json(ApiError, ex.errorExamples.cannotCancel) },
      429: errors[429],
    },
  },
  {
    method: 'post',
    path: '/api/v1/referrals/{id}/photos',
    tags: ['Referrals'],
    summary: 'Add condition photos',
    description:
      `Uploads photos of the device’s condition as multipart/form-data in the field \`photos\`. JPEG, PNG, WebP and HEIC only, ` +
      `recognised from the file’s content (not its name or declared type); at most ${PHOTOS_PER_REFERRAL} photos per case and ` +
      `${PHOTO_MAX_BYTES / 1024 / 1024} MB per photo. If any photo is refused, none is stored.`,
    security: SECURITY,
    request: {
      params: idParams,
      headers: idempotencyHeader,
      body: {
        required: true,
        content: {
          'multipart/form-data': {
            schema: z.object({ photos: z.array(z.string().meta({ format: 'binary' })).min(1).max(PHOTOS_PER_REFERRAL) }),
            encoding: { photos: { contentType: 'image/jpeg, image/png, image/webp, image/heic, image/heif' } },
          },
        },
      },
    },
    responses: {
      201: { description: 'Every photo of the case, the new ones included', content: json(z.array(Photo), ex.photosResponseExample) },
      400: { description: 'A photo was refused (its type, its size, or too many for the case). Nothing was stored.', content: json(ApiError, ex.errorExamples.photoRefused) },
      401: errors[401],
      404: notFound,
      409: conflict,
      429: errors[429],
    },
  },
  {
    method: 'get',
    path: '/api/v1/photos/{id}',
    tags: ['Referrals'],
    summary: 'Download a condition photo',
    description: 'The image bytes, with the type recognised at upload. Only photos of the partner’s own cases.',
    security: SECURITY,
    request: { params: z.object({ id: z.string().uuid().meta({ description: 'The photo’s id (from the referral’s `photos`)' }) }) },
    responses: {
      200: {
        description: 'The image',
        content: Object.fromEntries(
          ['image/jpeg', 'image/png', 'image/webp', 'image/heic', 'image/heif'].map((t) => [t, { schema: z.string().meta({ format: 'binary' }) }]),
        ),
      },
      304: { description: 'Not modified (the ETag matched)' },
      400: errors[400],
      401: errors[401],
      404: { description: 'No such photo among the partner’s cases.', content: json(ApiError, ex.errorExamples.notFound) },
      429: errors[429],
    },
  },
  {
    method: 'post',
    path: '/api/v1/routing/preview',
    tags: ['Routing'],
    summary: 'Preview triage and routing',
    description: 'What triage and routing would decide for a device, without opening a case.',
    security: SECURITY,
    request: { headers: idempotencyHeader, body: { required: true, content: json(RoutingPreviewInput, ex.routingPreviewExample) } },
    responses: { 200: { description: 'Triage and ranked labs', content: json(RoutingPreview, ex.routingPreviewResponseExample) }, ...errors, 409: conflict },
  },
];

const Shipment = shipmentDto.meta({ id: 'Shipment', description: 'A box on its way: rates before purchase, then tracking code, label and scans.' });
const shipmentIdParams = z.object({ id: z.string().uuid().meta({ description: 'The shipment’s id' }) });
const pdf = { 'application/pdf': { schema: z.string().meta({ format: 'binary' }) } };
const shipmentNotFound = { description: 'No such shipment for this partner.', content: json(ApiError, ex.errorExamples.notFound) };

/** The shipment routes, mounted at /api/v1 by the shipping component with the same key, limit and idempotency. */
export const shipmentApiPaths: RouteConfig[] = [
  {
    method: 'post',
    path: '/api/v1/referrals/{id}/shipments',
    tags: ['Shipping'],
    summary: 'Get rates for the box to the lab',
    description:
      'Once a lab has accepted the case: the box’s inner size (or a preset) and packed weight give prepaid rates, ground and air. ' +
      'Air is left out when the declared battery may not fly; a battery over 100 Wh is refused with the reason.',
    security: SECURITY,
    request: { params: idParams, headers: idempotencyHeader, body: { required: true, content: json(createShipmentInput) } },
    responses: { 201: { description: 'The shipment with its rates', content: json(Shipment) }, 400: errors[400], 401: errors[401], 404: notFound, 409: conflict, 429: errors[429] },
  },
  {
    method: 'get',
    path: '/api/v1/shipments/{id}',
    tags: ['Shipping'],
    summary: 'Read a shipment',
    description: 'Status, tracking code, label link and scans.',
    security: SECURITY,
    request: { params: shipmentIdParams },
    responses: { 200: { description: 'The shipment', content: json(Shipment) }, 401: errors[401], 404: shipmentNotFound, 429: errors[429] },
  },
  {
    method: 'post',
    path: '/api/v1/shipments/{id}/buy',
    tags: ['Shipping'],
    summary: 'Buy a rate (the network pays)',
    description: 'Buys the chosen rate once; a retry after an error or a timeout reads the purchase back instead of buying twice.',
    security: SECURITY,
    request: { params: shipmentIdParams, headers: idempotencyHeader, body: { required: true, content: json(buyShipmentInput) } },
    responses: { 200: { description: 'The bought shipment with its tracking code and label URL', content: json(Shipment) }, 400: errors[400], 401: errors[401], 404: shipmentNotFound, 409: conflict, 429: errors[429] },
  },
  {
    method: 'post',
    path: '/api/v1/shipments/{id}/void',
    tags: ['Shipping'],
    summary: 'Void a label before its first scan',
    description: 'Cancels an unused label; once the carrier has scanned the box it can no longer be voided (409).',
    security: SECURITY,
    request: { params: shipmentIdParams, headers: idempotencyHeader },
    responses: { 200: { description: 'The voided shipment', content: json(Shipment) }, 401: errors[401], 404: shipmentNotFound, 409: conflict, 429: errors[429] },
  },
  {
    method: 'get',
    path: '/api/v1/shipments/{id}/label',
    tags: ['Shipping'],
    summary: 'The label (4 × 6 in PDF)',
    description: 'The carrier’s prepaid label for the bought rate, answered to the same API key.',
    security: SECURITY,
    request: { params: shipmentIdParams },
    responses: { 200: { description: 'The carrier’s label', content: pdf }, 401: errors[401], 404: shipmentNotFound, 429: errors[429] },
  },
  {
    method: 'get',
    path: '/api/v1/shipments/{id}/packing-slip',
    tags: ['Shipping'],
    summary: 'The packing slip (4 × 6 in PDF)',
    description: 'Case reference as barcode and QR code, the lab’s receiving address, the packing rules and the battery mark where one applies.',
    security: SECURITY,
    request: { params: shipmentIdParams },
    responses: { 200: { description: 'The packing slip', content: pdf }, 401: errors[401], 404: shipmentNotFound, 429: errors[429] },
  },
];

let cached: { url: string; doc: ReturnType<OpenApiGeneratorV31['generateDocument']> } | undefined;

export function openApiDocument(config: Pick<Config, 'appUrl'>) {
  if (cached?.url === config.appUrl) return cached.doc;
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'partnerApiKey', {
    type: 'http',
    scheme: 'bearer',
    bearerFormat: 'ppk_live_<prefix>_<secret>',
    description: 'A partner API key, created by a shop admin under Settings → API keys. It is shown once; keep it secret.',
  });
  for (const route of [...partnerApiPaths, ...shipmentApiPaths]) registry.registerPath(route);
  registerWebhookEvents(registry);
  const doc = new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Platterpost partner API',
      version: API_VERSION,
      description:
        'Open and follow data-recovery referrals from your shop’s own system. Authenticate with `Authorization: Bearer <API key>`. ' +
        'Each key may make a limited number of requests per minute (429 with `Retry-After` beyond it). ' +
        'Errors always have the shape `{ error: { code, message, fields? } }`.',
    },
    servers: [{ url: config.appUrl }],
    security: SECURITY,
    tags: [
      { name: 'Referrals', description: 'Cases opened by your shop' },
      { name: 'Routing', description: 'Triage and lab ranking without a case' },
      { name: 'Shipping', description: 'Prepaid labels and tracking for the box to the lab' },
      { name: 'Meta', description: 'About the API itself' },
      { name: 'Webhooks', description: 'Signed events sent to your endpoints as your cases change' },
    ],
  });
  cached = { url: config.appUrl, doc };
  return doc;
}
