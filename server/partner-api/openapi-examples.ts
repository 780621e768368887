import type { ReferralDto, ReferralInput, RoutingPreviewInput } from '@shared/schemas/referrals';

// Examples for the OpenAPI document. Every person, shop, lab and device make here is invented;
// the test for the document checks each example against its schema.

const labId = '7a0c2f4e-51d3-4b8e-9a61-2f0e8c3d5b17';
const partnerId = '3f6b1e92-8c4d-4a7f-b2e5-9d1c0a7e6f43';

export const referralInputExample: ReferralInput = {
  externalRef: 'JL-2291',
  customer: { name: 'Dana Whitcombe', email: 'dana.whitcombe@example.com', phone: '+1 303 555 0188' },
  device: { mediaType: 'hdd_2_5', capacityGb: 1000, interface: 'sata', make: 'Korvane', model: 'KV-1000LT' },
  symptoms: ['clicking', 'dropped'],
  description: 'Laptop fell off a desk while running; the drive now clicks and is not detected.',
  priorities: [{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents' }],
  sensitivity: ['none'],
  origin: { postalCode: '80202', country: 'US' },
};

export const routingPreviewExample: RoutingPreviewInput = {
  device: { mediaType: 'hdd_3_5', capacityGb: 4000 },
  symptoms: ['clicking'],
  sensitivity: [],
  origin: { postalCode: '80202', country: 'US' },
};

const triage = {
  requiredSkills: ['hdd_head_swap' as const],
  needsCleanAir: true,
  needsHealthDataAgreement: false,
  cautions: [
    {
      code: 'do_not_power',
      severity: 'danger' as const,
      message: 'Do not power the drive again.',
      reason: 'A clicking drive usually has failing heads; every power-on can scratch the platters.',
    },
  ],
};

const routing = {
  origin: { lat: 39.7525, lon: -104.9995 },
  candidates: [
    {
      labId,
      labName: 'Example Recovery Lab',
      location: { lat: 33.4484, lon: -112.074 },
      distanceKm: 943.2,
      zone: 5,
      transitDays: 3,
      queueDays: 1.5,
      turnaroundDays: 6,
      estimatedDays: 10.5,
      reasons: ['Has hdd_head_swap', 'Clean-air class 5 certificate within its re-test interval'],
    },
  ],
  excluded: [
    {
      labId: 'c2d9e7a1-0b6f-4e38-8d24-5a1f3c9b7e60',
      labName: 'Example Flash Lab',
      location: { lat: 44.9778, lon: -93.265 },
      reasons: [{ code: 'missing_skill', message: 'Does not offer hdd_head_swap' }],
    },
  ],
  offeredTo: { labId, labName: 'Example Recovery Lab' },
};

export const routingPreviewResponseExample = { triage, routing };

export const referralExample: ReferralDto = {
  id: '0d8f3a6c-2b71-4e9d-a5c0-6e1b7f2d9a84',
  reference: 'PP-7K2M-9QXD',
  externalRef: 'JL-2291',
  status: 'offered',
  createdAt: '2026-03-02T16:04:11.000Z',
  updatedAt: '2026-03-02T16:04:11.000Z',
  partner: { id: partnerId, name: 'Example PC Repair' },
  customer: { name: 'Dana Whitcombe', email: 'dana.whitcombe@example.com', phone: '+1 303 555 0188' },
  device: { mediaType: 'hdd_2_5', capacityGb: 1000, interface: 'sata', make: 'Korvane', model: 'KV-1000LT', serial: null, memberCount: null },
  symptoms: ['clicking', 'dropped'],
  description: 'Laptop fell off a desk while running; the drive now clicks and is not detected.',
  priorities: [
    { category: 'photos', note: '2019–2023 family photos' },
    { category: 'documents', note: null },
  ],
  sensitivity: ['none'],
  battery: null,
  origin: { postalCode: '80202', country: 'US', city: 'Denver', region: 'CO', location: { lat: 39.7525, lon: -104.9995 } },
  consent: { recordedAt: '2026-03-02T16:04:11.000Z', recordedBy: 'API key “Ticketing” (k3v9x2m4q8rt), under the partner agreement' },
  triage,
  routing,
  offer: {
    id: '5e2a9c17-d4b8-4f63-8a05-1c7e3b9d6f22',
    labId,
    labName: 'Example Recovery Lab',
    status: 'pending',
    offeredAt: '2026-03-02T16:04:11.000Z',
    deadline: '2026-03-03T17:00:00.000Z',
    respondedAt: null,
    autoAccepted: false,
    declineReason: null,
    declineNote: null,
  },
  lab: null,
  attentionReason: null,
  photos: [],
  timeline: [
    {
      id: '9b4d1e6a-7c3f-4a28-b5e0-2d8f6a1c3e97',
      at: '2026-03-02T16:04:11.000Z',
      kind: 'opened',
      summary: 'Referral opened through the partner API',
      actor: { type: 'api_key', name: 'API key “Ticketing” (k3v9x2m4q8rt)' },
    },
  ],
  shipments: [],
  amounts: null,
};

export const referralListExample = {
  data: [
    {
      id: referralExample.id,
      reference: referralExample.reference,
      externalRef: referralExample.externalRef,
      status: referralExample.status,
      createdAt: referralExample.createdAt,
      updatedAt: referralExample.updatedAt,
      customer: referralExample.customer,
      lab: null,
      mediaType: 'hdd_2_5' as const,
    },
  ],
  nextCursor: 'eyJ1IjoiMjAyNi0wMy0wMlQxNjowNDoxMS4wMDBaIiwiaSI6IjBkOGYzYTZjIn0',
};

export const photosResponseExample = [
  {
    id: 'e7c1a9d3-6b2f-4e85-9a40-3f1d8c6b2e75',
    url: '/api/v1/photos/e7c1a9d3-6b2f-4e85-9a40-3f1d8c6b2e75',
    contentType: 'image/jpeg',
    sizeBytes: 1843211,
    uploadedAt: '2026-03-02T16:06:40.000Z',
  },
];

export const errorExamples = {
  validation: {
    error: {
      code: 'validation_failed',
      message: 'Some fields need attention',
      fields: [
        { path: 'device.mediaType', message: 'Choose one of: hdd_3_5, hdd_2_5, ssd_sata, …' },
        { path: 'customer.email', message: 'Enter a valid e-mail address' },
      ],
    },
  },
  malformed: { error: { code: 'malformed_json', message: 'The request body is not valid JSON', fields: [{ path: '(body)', message: 'Not valid JSON' }] } },
  unauthenticated: { error: { code: 'unauthenticated', message: 'The API key is not valid or has been revoked' } },
  notFound: { error: { code: 'not_found', message: 'That referral was not found' } },
  reused: {
    error: {
      code: 'idempotency_key_reused',
      message: 'This Idempotency-Key was already used with a different request. Use a new key for a new request.',
      fields: [{ path: 'Idempotency-Key', message: 'Already used with a different request' }],
    },
  },
  inProgress: { error: { code: 'idempotency_in_progress', message: 'A request with this Idempotency-Key is still being processed. Retry in a moment.' } },
  rateLimited: { error: { code: 'rate_limited', message: 'This API key has made more than 600 requests this minute. Try again in 17 s.' } },
  cannotCancel: { error: { code: 'conflict', message: 'The case can no longer be cancelled: its box has already shipped' } },
  photoRefused: {
    error: {
      code: 'validation_failed',
      message: 'Some photos were refused',
      fields: [{ path: 'photos.0', message: '“notes.jpg” is not a JPEG, PNG, WebP or HEIC image' }],
    },
  },
};

export const keyInfoExample = {
  apiKey: { id: 'a41f7c2e-9d05-4b6a-8e13-7c2b5f0d9e68', name: 'Ticketing', prefix: 'k3v9x2m4q8rt' },
  organization: { id: partnerId, name: 'Example PC Repair' },
};
