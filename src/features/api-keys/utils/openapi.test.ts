import { describe, expect, it } from 'vitest';
import { curlFor, fieldRows, KEY_PLACEHOLDER, operationsOf, typeWords, type OpenApiDocument } from './openapi';

const doc: OpenApiDocument = {
  openapi: '3.1.0',
  info: { title: 'Test API', version: '1.0.0' },
  servers: [{ url: 'https://pp.example' }],
  security: [{ partnerApiKey: [] }],
  components: {
    schemas: {
      Input: {
        type: 'object',
        required: ['customer'],
        properties: {
          customer: { type: 'object', required: ['name'], properties: { name: { type: 'string', minLength: 1, maxLength: 120 }, phone: { type: 'string' } } },
          priorities: { type: 'array', items: { type: 'object', properties: { category: { type: 'string', enum: ['photos', 'videos'] } } } },
        },
        example: { customer: { name: 'Dana' } },
      },
    },
  },
  paths: {
    '/api/v1/openapi.json': { get: { security: [], responses: { 200: { description: 'This' } } } },
    '/api/v1/referrals': {
      post: {
        parameters: [{ name: 'Idempotency-Key', in: 'header', schema: { type: 'string', example: 'ticket-1' } }],
        requestBody: { content: { 'application/json': { schema: { $ref: '#/components/schemas/Input' } } } },
        responses: { 201: { description: 'Made' } },
      },
    },
    '/api/v1/referrals/{id}': { get: { parameters: [{ name: 'id', in: 'path', required: true, schema: { type: 'string', example: 'abc' } }], responses: {} } },
  },
};

describe('OpenAPI helpers', () => {
  it('lists the operations in document order with in-page ids', () => {
    expect(operationsOf(doc).map((o) => `${o.method} ${o.path} ${o.id}`)).toEqual([
      'get /api/v1/openapi.json get-api-v1-openapi-json',
      'post /api/v1/referrals post-api-v1-referrals',
      'get /api/v1/referrals/{id} get-api-v1-referrals-id',
    ]);
  });

  it('flattens a body into rows with nested and array fields, required marks and limits', () => {
    const rows = fieldRows(doc, { $ref: '#/components/schemas/Input' });

    expect(rows.map((r) => [r.name, r.type, r.required])).toEqual([
      ['customer', 'object', true],
      ['customer.name', 'string', true],
      ['customer.phone', 'string', false],
      ['priorities', 'array of object', false],
      ['priorities[].category', 'one of: photos, videos', false],
    ]);
    expect(rows[1].notes).toBe('not empty; at most 120 characters');
  });

  it('says nullable unions in words', () => {
    expect(typeWords(doc, { anyOf: [{ type: 'string' }, { type: 'null' }] })).toBe('string or null');
  });

  it('writes curl with the key placeholder, the idempotency header and the example body, and no key for a public route', () => {
    const [documentRoute, create, read] = operationsOf(doc);

    const curl = curlFor(doc, create);
    expect(curl).toContain(`curl -X POST 'https://pp.example/api/v1/referrals'`);
    expect(curl).toContain(`-H "Authorization: Bearer ${KEY_PLACEHOLDER}"`);
    expect(curl).toContain(`-H 'Idempotency-Key: ticket-1'`);
    expect(curl).toContain('"name": "Dana"');
    expect(curlFor(doc, read)).toContain(`'https://pp.example/api/v1/referrals/abc'`);
    expect(curlFor(doc, documentRoute)).not.toContain('Authorization');
  });
});
