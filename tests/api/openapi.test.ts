import SwaggerParser from '@apidevtools/swagger-parser';
import type { Router } from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { apiErrorSchema } from '@shared/schemas/api-error';
import { referralDto, referralInput, referralListDto, routingPreviewDto, routingPreviewInput } from '@shared/schemas/referrals';
import { referralPhotoDto } from '@shared/schemas/partner-api';
import { partnerApiRoutes } from '../../server/partner-api';
import { shippingPartnerApiRoutes } from '../../server/shipping';
import * as ex from '../../server/partner-api/openapi-examples';
import { setupApi } from '../support/api';

const { app, config } = await setupApi();
const fetchDoc = async () => (await request(app).get('/api/v1/openapi.json')).body;

type Layer = { route?: { path: string; methods: Record<string, boolean> } };

/** Every method + path the /api/v1 router answers, written the OpenAPI way (`:id` → `{id}`). */
function mountedRoutes(router: Router): string[] {
  return (router.stack as unknown as Layer[])
    .filter((l) => l.route)
    .flatMap((l) =>
      Object.keys(l.route!.methods)
        .filter((m) => m !== '_all')
        .map((m) => `${m} /api/v1${l.route!.path.replace(/:(\w+)/g, '{$1}')}`),
    );
}

function documentedRoutes(doc: { paths: Record<string, Record<string, unknown>> }): string[] {
  const methods = ['get', 'post', 'put', 'patch', 'delete'];
  return Object.entries(doc.paths).flatMap(([p, item]) => Object.keys(item).filter((m) => methods.includes(m)).map((m) => `${m} ${p}`));
}

describe('the partner API’s OpenAPI document', () => {
  it('is served at /api/v1/openapi.json without a key', async () => {
    const res = await request(app).get('/api/v1/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toBe('3.1.0');
    expect(res.body.servers).toEqual([{ url: config.appUrl }]);
  });

  it('is a valid OpenAPI 3.1 document (checked by @apidevtools/swagger-parser)', async () => {
    const doc = await fetchDoc();
    // validate() dereferences in place; give it a copy.
    await expect(SwaggerParser.validate(structuredClone(doc))).resolves.toBeTruthy();
  });

  it('describes every route the /api/v1 router mounts, and no route it does not', async () => {
    const doc = await fetchDoc();
    // Both routers mounted at /api/v1: the partner API's own and the shipping component's.
    const ctx = { config, db: undefined as never };
    const mounted = [...mountedRoutes(partnerApiRoutes(ctx)), ...mountedRoutes(shippingPartnerApiRoutes(ctx))].sort();
    expect(mounted.length).toBeGreaterThan(5);
    expect(documentedRoutes(doc).sort()).toEqual(mounted);
  });

  it('declares the bearer key scheme, applies it to every route but the document itself', async () => {
    const doc = await fetchDoc();
    expect(doc.components.securitySchemes.partnerApiKey).toMatchObject({ type: 'http', scheme: 'bearer' });
    for (const [p, item] of Object.entries(doc.paths as Record<string, Record<string, { security?: unknown[] }>>)) {
      for (const [method, op] of Object.entries(item)) {
        if (p === '/api/v1/openapi.json') expect(op.security).toEqual([]);
        else expect(op.security, `${method} ${p}`).toEqual([{ partnerApiKey: [] }]);
      }
    }
  });

  it('gives every route a summary, a description and the error shape for its failures', async () => {
    const doc = await fetchDoc();
    expect(doc.components.schemas.Error.properties.error.required).toEqual(expect.arrayContaining(['code', 'message']));
    for (const [p, item] of Object.entries(doc.paths as Record<string, Record<string, { summary?: string; description?: string; responses: Record<string, { content?: Record<string, { schema: { $ref?: string } }> }> }>>)) {
      for (const [method, op] of Object.entries(item)) {
        expect(op.summary, `${method} ${p}`).toBeTruthy();
        expect(op.description, `${method} ${p}`).toBeTruthy();
        for (const [status, response] of Object.entries(op.responses)) {
          if (Number(status) >= 400) expect(response.content?.['application/json']?.schema.$ref, `${method} ${p} ${status}`).toBe('#/components/schemas/Error');
        }
      }
    }
  });

  it('documents the Idempotency-Key header on every POST that does work, and the 401 and 429 answers', async () => {
    const doc = await fetchDoc();
    for (const [p, item] of Object.entries(doc.paths as Record<string, Record<string, { parameters?: { in: string; name: string }[]; responses: Record<string, unknown> }>>)) {
      if (item.post) {
        expect(item.post.parameters?.some((x) => x.in === 'header' && x.name === 'Idempotency-Key'), p).toBe(true);
        expect(Object.keys(item.post.responses)).toEqual(expect.arrayContaining(['401', '409', '429']));
      }
    }
    expect(doc.paths['/api/v1/referrals'].post.responses['429'].headers['Retry-After']).toBeDefined();
  });

  it('names the shared schemas as components, so clients get the same names as the code', async () => {
    const doc = await fetchDoc();
    expect(Object.keys(doc.components.schemas)).toEqual(expect.arrayContaining(['ReferralInput', 'Referral', 'ReferralList', 'RoutingPreviewInput', 'RoutingPreview', 'Error']));
    expect(doc.paths['/api/v1/referrals'].post.requestBody.content['application/json'].schema.$ref).toBe('#/components/schemas/ReferralInput');
  });

  it('has examples that the schemas themselves accept', () => {
    expect(() => referralInput.parse(ex.referralInputExample)).not.toThrow();
    expect(() => referralDto.parse(ex.referralExample)).not.toThrow();
    expect(() => referralListDto.parse(ex.referralListExample)).not.toThrow();
    expect(() => routingPreviewInput.parse(ex.routingPreviewExample)).not.toThrow();
    expect(() => routingPreviewDto.parse(ex.routingPreviewResponseExample)).not.toThrow();
    for (const photo of ex.photosResponseExample) expect(() => referralPhotoDto.parse(photo)).not.toThrow();
    for (const body of Object.values(ex.errorExamples)) expect(() => apiErrorSchema.parse(body)).not.toThrow();
  });
});
