import { createServer, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createRequire } from 'node:module';
import EasyPostClient, { type IRate } from '@easypost/api';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createShippingFake, trackingHasException, type ShippingFake } from './shipping-fake';

// pdf-parse v1's index file reads a sample PDF when loaded as a main module; its library file does not.
const pdfParse = createRequire(import.meta.url)('pdf-parse/lib/pdf-parse.js') as (
  data: Buffer,
  options?: { pagerender?: (page: { view: number[]; getTextContent(): Promise<{ items: { str: string }[] }> }) => Promise<string> },
) => Promise<{ numpages: number; text: string }>;

const API_KEY = 'test_key_platterpost';
const SECRET = 'wh-secret-ünïcode';

interface Received {
  headers: IncomingHttpHeaders;
  raw: Buffer;
  event: { id: string; description: string; result: { id: string; status: string; status_detail: string; tracking_details: TrackingDetail[] } };
}
interface TrackingDetail {
  status: string;
  status_detail: string;
  datetime: string;
  message: string;
  tracking_location: { city: string; state: string } | null;
}

let fake: ShippingFake;
let client: InstanceType<typeof EasyPostClient>;
let receiver: Server;
let receiverUrl: string;
const received: Received[] = [];
let failNextDeliveries = 0;

const shop = { name: 'Tinplate Repairs', street1: '2 Market St', city: 'San Francisco', state: 'CA', zip: '94105', country: 'US' };
const farLab = { name: 'Intake desk', company: 'Heronmoor Recovery Lab', street1: '100 W 33rd St', city: 'New York', state: 'NY', zip: '10001', country: 'US' };
const nearLab = { name: 'Intake desk', company: 'Saltmarsh Data Lab', street1: '1 King St', city: 'San Francisco', state: 'CA', zip: '94107', country: 'US' };
// 12 × 10 × 8 in at 3 lb: billed at its dimensional weight, 960 ÷ 139 → 7 lb.
const box = { length: 12, width: 10, height: 8, weight: 48 };

interface RateLike {
  id: string;
  carrier: string;
  service: string;
  rate: string;
  currency: string;
  delivery_days: number;
  est_delivery_days: number;
  shipping_mode: 'ground' | 'air';
}

async function createShipment(to: object, parcel: object = box) {
  return client.Shipment.create({ from_address: shop, to_address: to, parcel });
}

function rateOf(shipment: { rates: RateLike[] }, carrier: string, service: string): RateLike {
  const rate = shipment.rates.find((r) => r.carrier === carrier && r.service === service);
  if (!rate) throw new Error(`no ${carrier} ${service} rate`);
  return rate;
}

async function buyGround(to: object = farLab) {
  const shipment = await createShipment(to);
  return client.Shipment.buy(shipment.id, rateOf(shipment as never, 'Brambleway', 'Ground').id);
}

function eventsFor(trackerId: string): Received[] {
  return received.filter((r) => r.event.result.id === trackerId);
}

beforeAll(async () => {
  receiver = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      if (failNextDeliveries > 0) {
        failNextDeliveries -= 1;
        res.writeHead(503).end();
        return;
      }
      const raw = Buffer.concat(chunks);
      received.push({ headers: req.headers, raw, event: JSON.parse(raw.toString('utf8')) });
      res.writeHead(200).end('ok');
    });
  });
  await new Promise<void>((resolve) => receiver.listen(0, '127.0.0.1', resolve));
  receiverUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hooks/shipping`;

  // clockSpeed 0: the simulated clock moves only when a test moves it.
  fake = createShippingFake({ port: 0, apiKey: API_KEY, clockSpeed: 0, seed: 20250303, webhookRetryDelaysMs: [5, 10, 20] });
  await fake.start();
  client = new EasyPostClient(API_KEY, { baseUrl: fake.baseUrl });
  await client.Webhook.create({ url: receiverUrl, webhook_secret: SECRET });
});

afterAll(async () => {
  await fake?.stop();
  await new Promise<void>((resolve) => receiver.close(() => resolve()));
});

describe('shipping fake through the official @easypost/api client', () => {
  it('creates addresses and parcels and echoes them with ids', async () => {
    const address = await client.Address.create({ ...shop, verify: ['delivery'] } as never);
    expect(address.id).toMatch(/^adr_/);
    expect(address.zip).toBe('94105');
    expect((address.verifications as unknown as { delivery: { success: boolean } }).delivery.success).toBe(true);
    const parcel = await client.Parcel.create(box);
    expect(parcel.id).toMatch(/^prcl_/);
    expect(parcel.weight).toBe(48);

    const byIds = await client.Shipment.create({ from_address: { id: address.id }, to_address: farLab, parcel: { id: parcel.id } });
    expect(byIds.from_address.id).toBe(address.id);
    expect(byIds.parcel.id).toBe(parcel.id);
  });

  it('quotes ground and air rates from invented carriers, in the wire format (string dollars, delivery days)', async () => {
    const shipment = await createShipment(farLab);
    expect(shipment.id).toMatch(/^shp_/);
    expect(shipment.rates.length).toBeGreaterThanOrEqual(4);
    const rates = shipment.rates as unknown as RateLike[];
    expect(new Set(rates.map((r) => r.carrier))).toEqual(new Set(['Brambleway', 'Otterline', 'Quillback']));
    expect(rates.some((r) => r.shipping_mode === 'ground')).toBe(true);
    expect(rates.some((r) => r.shipping_mode === 'air')).toBe(true);
    for (const rate of rates) {
      expect(rate.id).toMatch(/^rate_/);
      expect(rate.rate).toMatch(/^\d+\.\d{2}$/);
      expect(rate.currency).toBe('USD');
      expect(rate.delivery_days).toBe(rate.est_delivery_days);
      expect(Number.isInteger(rate.delivery_days)).toBe(true);
    }
    // The SDK's own helper works on these rates.
    const lowest = shipment.lowestRate();
    expect(Math.min(...rates.map((r) => Number(r.rate)))).toBe(Number(lowest.rate));
    // Air is never slower than ground from the same carrier.
    expect(rateOf(shipment as never, 'Brambleway', 'Air').delivery_days).toBeLessThan(rateOf(shipment as never, 'Brambleway', 'Ground').delivery_days);
  });

  it('prices grow with distance zone: San Francisco → New York (zone 8) costs more than across town (zone 1)', async () => {
    const far = await createShipment(farLab);
    const near = await createShipment(nearLab);
    for (const rate of near.rates as unknown as RateLike[]) {
      const farRate = rateOf(far as never, rate.carrier, rate.service);
      expect(Number(farRate.rate)).toBeGreaterThan(Number(rate.rate));
      expect(farRate.delivery_days).toBeGreaterThanOrEqual(rate.delivery_days);
    }
    expect((far.rates[0] as unknown as { zone: number }).zone).toBe(8);
    expect((near.rates[0] as unknown as { zone: number }).zone).toBe(1);
  });

  it('prices by billable weight: a light 12 × 10 × 8 in box costs what a 7 lb small box costs (960 in³ ÷ 139, from memory)', async () => {
    const bulky = await createShipment(farLab, box);
    const dense = await createShipment(farLab, { length: 4, width: 4, height: 4, weight: 7 * 16 });
    const heavier = await createShipment(farLab, { length: 4, width: 4, height: 4, weight: 8 * 16 });
    for (const rate of bulky.rates as unknown as RateLike[]) {
      expect(rateOf(dense as never, rate.carrier, rate.service).rate).toBe(rate.rate);
      expect(Number(rateOf(heavier as never, rate.carrier, rate.service).rate)).toBeGreaterThan(Number(rate.rate));
    }
  });

  it('buys a rate: tracking code, selected rate and label URLs served by the fake', async () => {
    const shipment = await createShipment(farLab);
    const chosen = rateOf(shipment as never, 'Otterline', 'PriorityAir');
    // The client accepts the rate object itself and sends only its id.
    const bought = await client.Shipment.buy(shipment.id, chosen as unknown as IRate);
    expect(bought.tracking_code).toMatch(/^OL\d{16}$/);
    expect(bought.selected_rate.id).toBe(chosen.id);
    expect(bought.tracker.status).toBe('pre_transit');
    expect(bought.postage_label.label_url).toMatch(new RegExp(`^${fake.url}/labels/pl_[0-9a-f]+\\.png$`));
    expect(bought.postage_label.label_pdf_url).toMatch(/\.pdf$/);

    const again = await client.Shipment.retrieve(shipment.id);
    expect(again.tracking_code).toBe(bought.tracking_code);
    await expect(client.Shipment.buy(shipment.id, chosen.id)).rejects.toMatchObject({ statusCode: 422, code: 'SHIPMENT.POSTAGE.EXISTS' });
  });

  it('serves a 4 × 6 in PDF label (288 × 432 pt) carrying the tracking code, and a PNG barcode', async () => {
    const bought = await buyGround();
    const pdfResponse = await fetch(bought.postage_label.label_pdf_url);
    expect(pdfResponse.status).toBe(200);
    expect(pdfResponse.headers.get('content-type')).toBe('application/pdf');
    const pdf = Buffer.from(await pdfResponse.arrayBuffer());

    const views: number[][] = [];
    const parsed = await pdfParse(pdf, {
      async pagerender(page) {
        views.push(page.view);
        return (await page.getTextContent()).items.map((i) => i.str).join('\n');
      },
    });
    expect(parsed.numpages).toBe(1);
    expect(views).toEqual([[0, 0, 288, 432]]);
    expect(pdf.toString('latin1')).toMatch(/\/MediaBox \[0 0 288 432\]/);
    expect(parsed.text).toContain(bought.tracking_code);
    expect(parsed.text).toContain('Heronmoor Recovery Lab');
    expect(parsed.text).toContain('BRAMBLEWAY');

    const pngResponse = await fetch(bought.postage_label.label_url);
    expect(pngResponse.headers.get('content-type')).toBe('image/png');
    const png = Buffer.from(await pngResponse.arrayBuffer());
    expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    // IHDR: a barcode is wider than it is tall.
    expect(png.readUInt32BE(16)).toBeGreaterThan(png.readUInt32BE(20));
  });

  it('advances tracking on the simulated clock to delivered and posts webhooks that validateWebhook accepts', async () => {
    const bought = await buyGround();
    const trackerId = bought.tracker.id;

    fake.advanceHours(1);
    expect((await client.Tracker.retrieve(trackerId)).status).toBe('pre_transit');

    fake.advanceHours(24 * 10);
    await fake.webhooksIdle();
    const tracker = await client.Tracker.retrieve(trackerId);
    expect(tracker.status).toBe('delivered');

    const events = eventsFor(trackerId);
    expect(events[0].event.description).toBe('tracker.created');
    expect(events.slice(1).every((e) => e.event.description === 'tracker.updated')).toBe(true);
    const statuses = events.map((e) => e.event.result.status);
    expect(statuses[0]).toBe('pre_transit');
    expect(statuses.filter((s) => s === 'in_transit').length).toBeGreaterThanOrEqual(3);
    expect(statuses.slice(-2)).toEqual(['out_for_delivery', 'delivered']);
    // Statuses only move forward.
    const order = ['pre_transit', 'in_transit', 'out_for_delivery', 'delivered'];
    expect(statuses.map((s) => order.indexOf(s))).toEqual([...statuses.map((s) => order.indexOf(s))].sort((a, b) => a - b));

    for (const { raw, headers, event } of events) {
      expect(String(headers['x-hmac-signature'])).toMatch(/^hmac-sha256-hex=[0-9a-f]{64}$/);
      const validated = client.Utils.validateWebhook(raw, headers, SECRET) as { id: string };
      expect(validated.id).toBe(event.id);
      expect(event.id).toMatch(/^evt_/);
    }

    // Each scan names a city on the way; the parcel starts in San Francisco and ends in New York.
    const details = tracker.tracking_details as unknown as TrackingDetail[];
    expect(details.every((d) => d.tracking_location?.city)).toBe(true);
    expect(details[0].tracking_location?.city).toBe('San Francisco');
    expect(details.at(-1)?.tracking_location?.city).toBe('New York');
    const times = details.map((d) => Date.parse(d.datetime));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    // Timed from the zone's transit days (zone 8 ground: 5 days), one extra day on an exception.
    const days = (times.at(-1)! - times[0]) / 86_400_000;
    expect(days).toBeLessThanOrEqual(bought.selected_rate.delivery_days + (trackingHasException(bought.tracking_code) ? 1 : 0));
  });

  it('signs so that an altered body or a wrong secret is rejected by validateWebhook', async () => {
    const bought = await buyGround(nearLab);
    await fake.webhooksIdle();
    const [{ raw, headers }] = eventsFor(bought.tracker.id);
    const altered = Buffer.from(raw.toString('utf8').replace('"pre_transit"', '"delivered"'));
    expect(altered.equals(raw)).toBe(false);
    expect(() => client.Utils.validateWebhook(altered, headers, SECRET)).toThrow(/Webhook received did not originate from EasyPost or had a webhook secret mismatch/);
    expect(() => client.Utils.validateWebhook(raw, headers, 'another-secret')).toThrow();
    expect(() => client.Utils.validateWebhook(raw, {}, SECRET)).toThrow();
  });

  it('retries a failed webhook delivery with back-off until the receiver takes it', async () => {
    failNextDeliveries = 2;
    const bought = await buyGround(nearLab);
    await fake.webhooksIdle();
    expect(eventsFor(bought.tracker.id).map((e) => e.event.description)).toEqual(['tracker.created']);
    const eventId = eventsFor(bought.tracker.id)[0].event.id;
    const attempts = fake.state.deliveries.filter((d) => d.eventId === eventId && d.url === receiverUrl);
    expect(attempts.map((a) => [a.attempt, a.ok, a.status])).toEqual([
      [1, false, 503],
      [2, false, 503],
      [3, true, 200],
    ]);
  });

  it('gives 1 tracking code in 20 an exception on the way (transit_exception), after which it is still delivered', async () => {
    let bought: Awaited<ReturnType<typeof buyGround>> | undefined;
    // Tracking codes are seeded, so this finds the same shipment every run.
    for (let i = 0; i < 200 && !bought; i++) {
      const candidate = await buyGround(nearLab);
      if (trackingHasException(candidate.tracking_code)) bought = candidate;
    }
    expect(bought).toBeDefined();
    fake.advanceHours(24 * 4);
    const tracker = await client.Tracker.retrieve(bought!.tracker.id);
    const details = tracker.tracking_details as unknown as TrackingDetail[];
    expect(details.map((d) => d.status_detail)).toContain('transit_exception');
    expect(tracker.status).toBe('delivered');

    const sample = Array.from({ length: 4000 }, (_, i) => `BW${String(i).padStart(16, '0')}`);
    const share = sample.filter(trackingHasException).length / sample.length;
    expect(share).toBeGreaterThan(0.03);
    expect(share).toBeLessThan(0.07);
  });

  it('voids a label before the first scan and refuses after it', async () => {
    const early = await buyGround();
    const refunded = await client.Shipment.refund(early.id);
    expect(refunded.refund_status).toBe('submitted');
    expect((await client.Shipment.retrieve(early.id)).refund_status).toBe('refunded');
    expect((await client.Tracker.retrieve(early.tracker.id)).status).toBe('cancelled');
    fake.advanceHours(24 * 7);
    expect((await client.Tracker.retrieve(early.tracker.id)).status).toBe('cancelled');

    const late = await buyGround();
    fake.advanceHours(6);
    expect((await client.Tracker.retrieve(late.tracker.id)).status).toBe('in_transit');
    await expect(client.Shipment.refund(late.id)).rejects.toMatchObject({
      statusCode: 422,
      code: 'SHIPMENT.REFUND.UNAVAILABLE',
      message: expect.stringContaining('can no longer be voided'),
    });
  });

  it('answers a wrong API key with 401 in the service error shape', async () => {
    const wrong = new EasyPostClient('not-the-key', { baseUrl: fake.baseUrl });
    await expect(wrong.Shipment.create({ from_address: shop, to_address: farLab, parcel: box })).rejects.toMatchObject({
      statusCode: 401,
      code: 'APIKEY.INACTIVE',
    });
    const response = await fetch(`${fake.baseUrl}shipments`);
    expect(response.status).toBe(401);
    expect(await response.json()).toEqual({ error: { code: 'APIKEY.REQUIRED', message: expect.any(String), errors: [] } });
  });

  it('answers an unknown id with 404', async () => {
    await expect(client.Shipment.retrieve('shp_doesnotexist')).rejects.toMatchObject({ statusCode: 404, code: 'NOT_FOUND' });
    await expect(client.Tracker.retrieve('trk_doesnotexist')).rejects.toMatchObject({ statusCode: 404 });
  });

  it('rejects a shipment without a parcel weight or with an unknown ZIP with 422 and the field', async () => {
    await expect(client.Shipment.create({ from_address: shop, to_address: farLab, parcel: { length: 1, width: 1, height: 1 } })).rejects.toMatchObject({
      statusCode: 422,
      errors: [{ field: 'weight', message: 'is required' }],
    });
    await expect(client.Shipment.create({ from_address: shop, to_address: { ...farLab, zip: '00000' }, parcel: box })).rejects.toMatchObject({
      statusCode: 422,
      message: expect.stringContaining('to_address'),
    });
  });

  it('fails the next calls to a path with 500 when told to by /_fake/fail, then recovers', async () => {
    const arm = await fetch(`${fake.url}/_fake/fail`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ path: '/v2/shipments', times: 2 }),
    });
    expect(arm.status).toBe(201);
    await expect(createShipment(farLab)).rejects.toMatchObject({ statusCode: 500, code: 'INTERNAL_SERVER_ERROR' });
    await expect(createShipment(farLab)).rejects.toMatchObject({ statusCode: 500 });
    expect((await createShipment(farLab)).id).toMatch(/^shp_/);

    const shipment = await createShipment(farLab);
    await fetch(`${fake.url}/_fake/fail`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ path: '/v2/shipments/:id/buy', times: 1 }),
    });
    await expect(client.Shipment.buy(shipment.id, shipment.rates[0])).rejects.toMatchObject({ statusCode: 500 });
    expect((await client.Shipment.buy(shipment.id, shipment.rates[0])).tracking_code).toBeTruthy();
  });

  it('moves the clock through POST /_fake/clock and lists webhooks without their secrets', async () => {
    const bought = await buyGround();
    const response = await fetch(`${fake.url}/_fake/clock`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ advanceHours: 24 * 8 }),
    });
    const body = (await response.json()) as { emitted: number };
    expect(body.emitted).toBeGreaterThanOrEqual(5);
    expect((await client.Tracker.retrieve(bought.tracker.id)).status).toBe('delivered');

    const hooks = await client.Webhook.all();
    expect((hooks as unknown as { webhooks: { url: string }[] }).webhooks.map((w) => w.url)).toContain(receiverUrl);
    expect(JSON.stringify(hooks)).not.toContain(SECRET);
  });

  it('returns the existing tracker when asked to track one of its own codes', async () => {
    const bought = await buyGround();
    const tracker = await client.Tracker.create({ tracking_code: bought.tracking_code, carrier: 'Brambleway' });
    expect(tracker.id).toBe(bought.tracker.id);
  });
});

describe('shipping fake with a configured webhook URL', () => {
  it('signs events to webhookUrl with webhookSecret, and sends each event once when the same URL is also registered', async () => {
    const configured = createShippingFake({ port: 0, apiKey: API_KEY, clockSpeed: 0, webhookUrl: receiverUrl, webhookSecret: 'configured-secret', webhookRetryDelaysMs: [5] });
    await configured.start();
    try {
      const configuredClient = new EasyPostClient(API_KEY, { baseUrl: configured.baseUrl });
      const first = await configuredClient.Shipment.create({ from_address: shop, to_address: nearLab, parcel: box });
      const firstBought = await configuredClient.Shipment.buy(first.id, first.lowestRate());
      await configured.webhooksIdle();
      const [event] = eventsFor(firstBought.tracker.id);
      expect(configuredClient.Utils.validateWebhook(event.raw, event.headers, 'configured-secret')).toMatchObject({ description: 'tracker.created' });

      // Registered without a secret of its own: signed with the configured secret, delivered once.
      await configuredClient.Webhook.create({ url: receiverUrl });
      const second = await configuredClient.Shipment.create({ from_address: shop, to_address: nearLab, parcel: box });
      const secondBought = await configuredClient.Shipment.buy(second.id, second.lowestRate());
      await configured.webhooksIdle();
      const events = eventsFor(secondBought.tracker.id);
      expect(events).toHaveLength(1);
      expect(() => configuredClient.Utils.validateWebhook(events[0].raw, events[0].headers, 'configured-secret')).not.toThrow();
    } finally {
      await configured.stop();
    }
  });
});

describe('shipping fake clock speed', () => {
  it('runs the simulated clock faster than real time when clockSpeed is set', async () => {
    // One real millisecond is ten simulated hours, so a parcel is delivered within moments.
    const quick = createShippingFake({ port: 0, apiKey: API_KEY, clockSpeed: 36_000_000 });
    await quick.start();
    try {
      const quickClient = new EasyPostClient(API_KEY, { baseUrl: quick.baseUrl });
      const shipment = await quickClient.Shipment.create({ from_address: shop, to_address: farLab, parcel: box });
      const bought = await quickClient.Shipment.buy(shipment.id, shipment.lowestRate());
      let status = bought.tracker.status as string;
      for (let i = 0; i < 100 && status !== 'delivered'; i++) {
        await new Promise((resolve) => setTimeout(resolve, 20));
        status = (await quickClient.Tracker.retrieve(bought.tracker.id)).status;
      }
      expect(status).toBe('delivered');
    } finally {
      await quick.stop();
    }
  });
});
