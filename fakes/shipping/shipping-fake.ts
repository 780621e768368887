import { createHash, randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response } from 'express';
import { billableWeightLb } from '@shared/domain/dimensional-weight';
import { gs1CheckDigit } from '@shared/domain/sscc';
import { carrierServices, centsToDollars, findService, MAX_BILLABLE_LB, priceServices, type CarrierService } from './carriers';
import { labelPdf, trackingBarcodePng } from './labels';
import { legBetween, placeForZip, planScans, type Leg, type Place, type PlannedScan } from './route';
import { createWebhookSender, serializeEvent, type DeliveryAttempt } from './webhooks';

// A local stand-in for the hosted shipping API. It speaks the subset of the EasyPost v2 wire
// protocol we use (JSON bodies wrapped by object name, HTTP Basic auth with the key as user,
// errors as { error: { code, message, errors } }), so the official client works against it
// unchanged. Carriers, services and prices are invented (see carriers.ts).

export interface ShippingFakeOptions {
  /** 0 picks a free port; read `port` after `start()`. */
  port: number;
  apiKey: string;
  host?: string;
  /** Also post every event here, signed with `webhookSecret` (besides webhooks registered through the API). */
  webhookUrl?: string;
  /** Signs events to `webhookUrl` and to registered webhooks that gave no secret of their own. */
  webhookSecret?: string;
  /** Simulated milliseconds per real millisecond: 1 = real time, 60 = a minute per second, 0 = only moves when told. */
  clockSpeed?: number;
  /** Simulated time at start; defaults to now. */
  startTime?: Date;
  /** Seeds tracking codes, so a test run gets the same codes every time. */
  seed?: number;
  /** Waits before each retry of a failed webhook delivery. */
  webhookRetryDelaysMs?: readonly number[];
  log?: (line: string) => void;
}

type Json = Record<string, unknown>;

interface AddressObject extends Json {
  id: string;
  zip: string | null;
  city: string | null;
  state: string | null;
}

interface ParcelObject extends Json {
  id: string;
  length: number | null;
  width: number | null;
  height: number | null;
  /** Ounces, as the wire protocol counts parcel weight. */
  weight: number;
}

interface RateObject extends Json {
  id: string;
  carrier: string;
  service: string;
  rate: string;
  delivery_days: number;
  shipping_mode: 'ground' | 'air';
}

interface TrackingDetail extends Json {
  status: string;
  status_detail: string;
  datetime: string;
}

interface TrackerObject extends Json {
  id: string;
  tracking_code: string;
  status: string;
  status_detail: string;
  tracking_details: TrackingDetail[];
  shipment_id: string | null;
  updated_at: string;
}

interface ShipmentRecord {
  body: Json & { id: string; tracking_code: string | null; refund_status: string | null; status: string };
  toAddress: AddressObject;
  fromAddress: AddressObject;
  parcel: ParcelObject;
  rates: RateObject[];
  leg: Leg;
  billableLb: number;
  trackerId: string | null;
  labelId: string | null;
}

interface ScheduledScan {
  at: number;
  trackerId: string;
  scan: PlannedScan;
}

interface WebhookObject extends Json {
  id: string;
  url: string;
  disabled_at: string | null;
}

interface EventObject extends Json {
  id: string;
  description: string;
  result: Json;
}

interface FailureRule {
  pattern: RegExp;
  path: string;
  method: string | null;
  remaining: number;
  status: number;
}

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly errors: { field?: string; message: string }[] = [],
  ) {
    super(message);
  }
}

const HOUR_MS = 3_600_000;

function newId(prefix: string): string {
  return `${prefix}_${randomBytes(16).toString('hex')}`;
}

/** Timestamps as the service writes them: ISO 8601, whole seconds, Z. */
function isoSeconds(ms: number): string {
  return new Date(ms).toISOString().replace(/\.\d{3}Z$/, 'Z');
}

function carrierAccountId(carrier: string): string {
  return `ca_${createHash('sha256').update(carrier).digest('hex').slice(0, 32)}`;
}

/** Small seeded generator (mulberry32), enough for reproducible tracking codes in tests. */
function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function optionalString(value: unknown): string | null {
  if (value === undefined || value === null || value === '') return null;
  return String(value);
}

function positiveNumber(value: unknown, field: string, required: boolean): number | null {
  if (value === undefined || value === null || value === '') {
    if (required) throw new ApiError(422, 'PARAMETER.REQUIRED', `Missing required parameter: ${field}`, [{ field, message: 'is required' }]);
    return null;
  }
  const n = typeof value === 'number' ? value : Number(value);
  if (!Number.isFinite(n) || n <= 0) {
    throw new ApiError(422, 'PARAMETER.INVALID', `${field} must be a number greater than 0`, [{ field, message: 'must be greater than 0' }]);
  }
  return n;
}

function wrapped(req: Request, key: string): Json {
  const body = (req.body ?? {}) as Json;
  const inner = body[key];
  if (!inner || typeof inner !== 'object' || Array.isArray(inner)) {
    throw new ApiError(422, 'PARAMETER.REQUIRED', `Missing required parameter: ${key}`, [{ field: key, message: 'is required' }]);
  }
  return inner as Json;
}

/** Turn "/v2/shipments/:id/buy" or "/v2/trackers/*" into a matcher for request paths. */
function pathPattern(path: string): RegExp {
  const escaped = path
    .split('/')
    .map((part) => (part.startsWith(':') ? '[^/]+' : part === '*' ? '.*' : part.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')))
    .join('/');
  return new RegExp(`^${escaped}/?$`);
}

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

export function createShippingFake(options: ShippingFakeOptions) {
  const {
    apiKey,
    host = '127.0.0.1',
    webhookUrl,
    webhookSecret,
    clockSpeed = 1,
    webhookRetryDelaysMs = [1000, 4000, 16000],
    log = () => {},
  } = options;
  if (!apiKey) throw new Error('createShippingFake needs an apiKey');
  let configuredWebhookUrl: string | undefined;
  try {
    configuredWebhookUrl = webhookUrl ? new URL(webhookUrl).toString() : undefined;
  } catch {
    throw new Error(`webhookUrl must be a URL, got ${JSON.stringify(webhookUrl)}`);
  }
  if (!Number.isFinite(clockSpeed) || clockSpeed < 0) throw new RangeError(`clockSpeed must be a number ≥ 0, got ${clockSpeed}`);

  let boundPort = options.port;
  let server: Server | null = null;
  let ticker: NodeJS.Timeout | null = null;
  const random = options.seed === undefined ? Math.random : seededRandom(options.seed);

  // The simulated clock runs at clockSpeed from an anchor; advanceHours moves the anchor.
  let simAnchor = options.startTime?.getTime() ?? Date.now();
  const realAnchor = Date.now();
  const nowMs = () => simAnchor + (Date.now() - realAnchor) * clockSpeed;

  const state = {
    addresses: new Map<string, AddressObject>(),
    parcels: new Map<string, ParcelObject>(),
    shipments: new Map<string, ShipmentRecord>(),
    trackers: new Map<string, TrackerObject>(),
    webhooks: new Map<string, WebhookObject & { secret: string | null; customHeaders: { key: string; value: string }[] }>(),
    events: [] as EventObject[],
    deliveries: [] as DeliveryAttempt[],
    scheduled: [] as ScheduledScan[],
    failures: [] as FailureRule[],
    labels: new Map<string, { shipmentId: string; png?: Promise<Buffer>; pdf?: Promise<Buffer> }>(),
    now: () => new Date(nowMs()),
  };

  const sender = createWebhookSender({
    retryDelaysMs: webhookRetryDelaysMs,
    onAttempt(attempt) {
      state.deliveries.push(attempt);
      if (!attempt.ok) log(`webhook ${attempt.eventId} to ${attempt.url} failed (attempt ${attempt.attempt}): ${attempt.status ?? attempt.error}`);
    },
  });

  // ---- objects -------------------------------------------------------------------------------

  function createAddress(input: Json, verify: unknown): AddressObject {
    const at = isoSeconds(nowMs());
    const zip = optionalString(input.zip);
    const address: AddressObject = {
      id: newId('adr'),
      object: 'Address',
      mode: 'test',
      name: optionalString(input.name),
      company: optionalString(input.company),
      street1: optionalString(input.street1),
      street2: optionalString(input.street2),
      city: optionalString(input.city),
      state: optionalString(input.state),
      zip,
      country: optionalString(input.country) ?? 'US',
      phone: optionalString(input.phone),
      email: optionalString(input.email),
      residential: typeof input.residential === 'boolean' ? input.residential : null,
      carrier_facility: null,
      federal_tax_id: null,
      state_tax_id: null,
      verifications: {},
      created_at: at,
      updated_at: at,
    };
    const wanted = Array.isArray(verify) ? verify.map(String) : verify === true || verify === 'true' ? ['delivery'] : [];
    if (wanted.includes('delivery') || wanted.includes('zip4')) {
      const place = placeForZip(zip);
      const delivery = place
        ? { success: true, errors: [], details: { latitude: place.lat, longitude: place.lon, time_zone: null } }
        : { success: false, errors: [{ code: 'E.ADDRESS.NOT_FOUND', field: 'address', message: 'Address not found', suggestion: null }], details: null };
      address.verifications = { delivery, zip4: { success: Boolean(place), errors: [], details: null } };
    }
    state.addresses.set(address.id, address);
    return address;
  }

  function createParcel(input: Json): ParcelObject {
    const dims = ['length', 'width', 'height'].map((f) => positiveNumber(input[f], f, false));
    if (dims.some((d) => d !== null) && dims.some((d) => d === null)) {
      throw new ApiError(422, 'PARAMETER.INVALID', 'Give all of length, width and height, or none of them', [
        { field: 'parcel', message: 'length, width and height go together' },
      ]);
    }
    const at = isoSeconds(nowMs());
    const parcel: ParcelObject = {
      id: newId('prcl'),
      object: 'Parcel',
      mode: 'test',
      length: dims[0],
      width: dims[1],
      height: dims[2],
      weight: positiveNumber(input.weight, 'weight', true)!,
      predefined_package: optionalString(input.predefined_package),
      created_at: at,
      updated_at: at,
    };
    state.parcels.set(parcel.id, parcel);
    return parcel;
  }

  /** A nested address or parcel may be given whole, as `{ id }`, or as an id string. */
  function resolve<T extends { id: string }>(value: unknown, field: string, store: Map<string, T>, create: (input: Json) => T): T {
    if (value === undefined || value === null || value === '') {
      throw new ApiError(422, 'PARAMETER.REQUIRED', `Missing required parameter: ${field}`, [{ field, message: 'is required' }]);
    }
    const id = typeof value === 'string' ? value : typeof value === 'object' && Object.keys(value as Json).length === 1 ? (value as Json).id : undefined;
    if (typeof id === 'string') {
      const found = store.get(id);
      if (!found) throw new ApiError(404, 'NOT_FOUND', `${field} ${id} could not be found`, [{ field, message: 'not found' }]);
      return found;
    }
    if (typeof value !== 'object') throw new ApiError(422, 'PARAMETER.INVALID', `${field} must be an object or an id`, [{ field, message: 'is invalid' }]);
    return create(value as Json);
  }

  function placeOf(address: AddressObject, field: string): Place {
    const place = placeForZip(address.zip);
    if (!place) {
      throw new ApiError(422, 'ADDRESS.VERIFY.FAILURE', `${field} needs a known US ZIP code to rate the shipment, got ${JSON.stringify(address.zip)}`, [
        { field: `${field}.zip`, message: 'unknown ZIP code' },
      ]);
    }
    return place;
  }

  function billableFor(parcel: ParcelObject): number {
    const weightLb = parcel.weight / 16;
    if (parcel.length && parcel.width && parcel.height) {
      return billableWeightLb({ lengthIn: parcel.length, widthIn: parcel.width, heightIn: parcel.height, weightLb }).billableLb;
    }
    return Math.max(1, Math.ceil(weightLb - 1e-9));
  }

  function createShipment(input: Json): ShipmentRecord {
    const toAddress = resolve(input.to_address, 'to_address', state.addresses, (a) => createAddress(a, undefined));
    const fromAddress = resolve(input.from_address, 'from_address', state.addresses, (a) => createAddress(a, undefined));
    const parcel = resolve(input.parcel, 'parcel', state.parcels, createParcel);
    const leg = legBetween(placeOf(fromAddress, 'from_address'), placeOf(toAddress, 'to_address'));
    const billableLb = billableFor(parcel);
    const id = newId('shp');
    const nowAt = nowMs();
    const at = isoSeconds(nowAt);
    const rates: RateObject[] = priceServices(leg.zone, billableLb).map((s) => ({
      id: newId('rate'),
      object: 'Rate',
      mode: 'test',
      shipment_id: id,
      carrier: s.carrier,
      carrier_account_id: carrierAccountId(s.carrier),
      service: s.service,
      // Not part of the wire protocol: tells ground from air without knowing service names.
      shipping_mode: s.mode,
      zone: leg.zone,
      billable_weight_lb: billableLb,
      rate: centsToDollars(s.cents),
      currency: 'USD',
      list_rate: centsToDollars(Math.round(s.cents * 1.1)),
      list_currency: 'USD',
      retail_rate: centsToDollars(Math.round(s.cents * 1.25)),
      retail_currency: 'USD',
      delivery_days: s.deliveryDays,
      est_delivery_days: s.deliveryDays,
      delivery_date: isoSeconds(nowAt + s.deliveryDays * 24 * HOUR_MS),
      delivery_date_guaranteed: s.mode === 'air',
      billing_type: 'carrier',
      created_at: at,
      updated_at: at,
    }));
    const messages =
      rates.length === 0
        ? carrierServices
            .filter((s, i, all) => all.findIndex((o) => o.carrier === s.carrier) === i)
            .map((s) => ({ carrier: s.carrier, type: 'rate_error', message: `Billable weight ${billableLb} lb is over the ${MAX_BILLABLE_LB} lb limit` }))
        : [];
    const record: ShipmentRecord = {
      body: {
        id,
        object: 'Shipment',
        mode: 'test',
        reference: optionalString(input.reference),
        is_return: input.is_return === true,
        options: (input.options as Json | undefined) ?? {},
        status: 'unknown',
        tracking_code: null,
        refund_status: null,
        selected_rate: null,
        postage_label: null,
        insurance: null,
        scan_form: null,
        forms: [],
        fees: [],
        customs_info: null,
        return_address: null,
        buyer_address: null,
        batch_id: null,
        batch_status: null,
        batch_message: null,
        usps_zone: null,
        messages,
        created_at: at,
        updated_at: at,
      },
      toAddress,
      fromAddress,
      parcel,
      rates,
      leg,
      billableLb,
      trackerId: null,
      labelId: null,
    };
    state.shipments.set(id, record);
    return record;
  }

  function shipmentJson(record: ShipmentRecord): Json {
    return {
      ...record.body,
      to_address: record.toAddress,
      from_address: record.fromAddress,
      parcel: record.parcel,
      rates: record.rates,
      tracker: record.trackerId ? state.trackers.get(record.trackerId) ?? null : null,
    };
  }

  function getShipment(id: string): ShipmentRecord {
    const record = state.shipments.get(id);
    if (!record) throw new ApiError(404, 'NOT_FOUND', `Shipment ${id} could not be found`);
    return record;
  }

  function newTrackingCode(service: CarrierService): string {
    // Prefix, 15 digits and a GS1 mod-10 check digit, so a mistyped code is easy to spot.
    let body = '';
    for (let i = 0; i < 15; i++) body += Math.floor(random() * 10);
    return `${service.trackingPrefix}${body}${gs1CheckDigit(body)}`;
  }

  function trackingLocation(place: Place) {
    return { object: 'TrackingLocation', city: place.city, state: place.state, country: place.country, zip: place.zip };
  }

  function baseUrlOf(req: Request): string {
    return `${req.protocol}://${req.get('host') ?? `${host}:${boundPort}`}`;
  }

  function buy(record: ShipmentRecord, rateId: unknown, baseUrl: string): void {
    if (record.body.tracking_code) {
      throw new ApiError(422, 'SHIPMENT.POSTAGE.EXISTS', `Shipment ${record.body.id} already has postage`);
    }
    const rate = record.rates.find((r) => r.id === rateId);
    if (!rate) {
      throw new ApiError(422, 'SHIPMENT.RATE.INVALID', `Rate ${String(rateId)} is not one of this shipment's rates`, [
        { field: 'rate.id', message: 'is not a rate of this shipment' },
      ]);
    }
    const service = findService(rate.carrier, rate.service)!;
    const nowAt = nowMs();
    const at = isoSeconds(nowAt);
    const trackingCode = newTrackingCode(service);
    const labelId = newId('pl');
    const trackerId = newId('trk');
    const scans = planScans(record.leg, rate.delivery_days, trackingCode, rate.carrier);
    const deliveredAt = nowAt + scans[scans.length - 1].afterHours * HOUR_MS;

    const tracker: TrackerObject = {
      id: trackerId,
      object: 'Tracker',
      mode: 'test',
      tracking_code: trackingCode,
      status: 'pre_transit',
      status_detail: 'label_created',
      signed_by: null,
      weight: record.parcel.weight,
      est_delivery_date: isoSeconds(deliveredAt),
      shipment_id: record.body.id,
      carrier: rate.carrier,
      tracking_details: [
        {
          object: 'TrackingDetail',
          message: 'Shipping label created',
          description: '',
          status: 'pre_transit',
          status_detail: 'label_created',
          datetime: at,
          source: rate.carrier,
          carrier_code: null,
          tracking_location: trackingLocation(record.leg.from),
        },
      ],
      carrier_detail: {
        object: 'CarrierDetail',
        service: rate.service,
        container_type: null,
        est_delivery_date_local: isoSeconds(deliveredAt).slice(0, 10),
        est_delivery_time_local: null,
        origin_location: `${record.leg.from.city} ${record.leg.from.state} US`,
        origin_tracking_location: trackingLocation(record.leg.from),
        destination_location: `${record.leg.to.city} ${record.leg.to.state} US`,
        destination_tracking_location: trackingLocation(record.leg.to),
        guaranteed_delivery_date: null,
        alternate_identifier: null,
        initial_delivery_attempt: null,
      },
      public_url: `${baseUrl}/track/${trackingCode}`,
      fees: [],
      finalized: false,
      is_return: record.body.is_return === true,
      created_at: at,
      updated_at: at,
    };
    state.trackers.set(trackerId, tracker);
    for (const scan of scans) state.scheduled.push({ at: nowAt + scan.afterHours * HOUR_MS, trackerId, scan });
    state.scheduled.sort((a, b) => a.at - b.at);

    state.labels.set(labelId, { shipmentId: record.body.id });
    record.trackerId = trackerId;
    record.labelId = labelId;
    Object.assign(record.body, {
      tracking_code: trackingCode,
      status: 'pre_transit',
      selected_rate: rate,
      postage_label: {
        id: labelId,
        object: 'PostageLabel',
        mode: 'test',
        date_advance: 0,
        integrated_form: 'none',
        label_date: at,
        label_resolution: 300,
        label_size: '4x6',
        label_type: 'default',
        label_file_type: 'image/png',
        label_url: `${baseUrl}/labels/${labelId}.png`,
        label_pdf_url: `${baseUrl}/labels/${labelId}.pdf`,
        label_epl2_url: null,
        label_zpl_url: null,
        created_at: at,
        updated_at: at,
      },
      updated_at: at,
    });
    emit('tracker.created', tracker, {});
  }

  function refund(record: ShipmentRecord): Json {
    const tracker = record.trackerId ? state.trackers.get(record.trackerId) : undefined;
    if (!tracker) throw new ApiError(422, 'SHIPMENT.REFUND.UNAVAILABLE', `Shipment ${record.body.id} has no postage to refund`);
    if (record.body.refund_status) {
      throw new ApiError(422, 'SHIPMENT.REFUND.UNAVAILABLE', `A refund for shipment ${record.body.id} was already submitted`);
    }
    if (tracker.status !== 'pre_transit') {
      throw new ApiError(
        422,
        'SHIPMENT.REFUND.UNAVAILABLE',
        `Shipment ${record.body.id} has been scanned by the carrier (${tracker.status}) and can no longer be voided`,
      );
    }
    state.scheduled = state.scheduled.filter((s) => s.trackerId !== tracker.id);
    const at = isoSeconds(nowMs());
    record.body.refund_status = 'submitted';
    record.body.updated_at = at;
    applyScan(tracker, {
      status: 'cancelled',
      status_detail: 'cancelled',
      message: 'Label voided by the shipper',
      datetime: at,
      place: undefined,
    });
    const response = shipmentJson(record);
    // The fake approves voids at once; the answer still says "submitted", as the service does.
    record.body.refund_status = 'refunded';
    return response;
  }

  // ---- tracking on the simulated clock ---------------------------------------------------------

  function emit(description: string, tracker: TrackerObject, previous: Json): EventObject {
    const at = isoSeconds(nowMs());
    const registered = [...state.webhooks.values()]
      .filter((w) => !w.disabled_at)
      .map((w) => ({ url: w.url, secret: w.secret ?? webhookSecret, customHeaders: w.customHeaders }));
    // The configured URL gets each event once, even when our server also registered it.
    const configured =
      configuredWebhookUrl && !registered.some((t) => t.url === configuredWebhookUrl)
        ? [{ url: configuredWebhookUrl, secret: webhookSecret, customHeaders: [] }]
        : [];
    const targets = [...registered, ...configured];
    const event: EventObject = {
      id: newId('evt'),
      object: 'Event',
      mode: 'test',
      description,
      previous_attributes: previous,
      result: structuredClone(tracker),
      status: targets.length > 0 ? 'pending' : 'completed',
      pending_urls: targets.map((t) => t.url),
      completed_urls: [],
      user_id: 'user_shippingfake',
      created_at: at,
      updated_at: at,
    };
    state.events.push(event);
    const body = serializeEvent(event);
    for (const target of targets) sender.send(target, event.id, body);
    return event;
  }

  function applyScan(
    tracker: TrackerObject,
    scan: { status: string; status_detail: string; message: string; datetime: string; place: Place | undefined },
  ): EventObject {
    const previousStatus = tracker.status;
    tracker.tracking_details.push({
      object: 'TrackingDetail',
      message: scan.message,
      description: '',
      status: scan.status,
      status_detail: scan.status_detail,
      datetime: scan.datetime,
      source: tracker.carrier,
      carrier_code: null,
      tracking_location: scan.place ? trackingLocation(scan.place) : null,
    });
    tracker.status = scan.status;
    tracker.status_detail = scan.status_detail;
    tracker.updated_at = scan.datetime;
    if (scan.status === 'delivered') {
      tracker.finalized = true;
      tracker.signed_by = 'Front desk';
    }
    if (scan.status === 'cancelled') tracker.finalized = true;
    const shipment = tracker.shipment_id ? state.shipments.get(tracker.shipment_id) : undefined;
    if (shipment) {
      shipment.body.status = scan.status;
      shipment.body.updated_at = scan.datetime;
    }
    return emit('tracker.updated', tracker, previousStatus === scan.status ? {} : { status: previousStatus });
  }

  /** Apply every scan whose simulated time has come, in time order. */
  function processDue(): EventObject[] {
    const emitted: EventObject[] = [];
    const now = nowMs();
    while (state.scheduled.length > 0 && state.scheduled[0].at <= now) {
      const { at, trackerId, scan } = state.scheduled.shift()!;
      const tracker = state.trackers.get(trackerId);
      if (!tracker) continue;
      emitted.push(
        applyScan(tracker, { status: scan.status, status_detail: scan.statusDetail, message: scan.message, datetime: isoSeconds(at), place: scan.place }),
      );
    }
    return emitted;
  }

  function advanceHours(hours: number): EventObject[] {
    if (typeof hours !== 'number' || !Number.isFinite(hours) || hours < 0) {
      throw new RangeError(`advanceHours needs a number of hours ≥ 0, got ${String(hours)}`);
    }
    simAnchor += hours * HOUR_MS;
    return processDue();
  }

  function trackerByCode(code: string): TrackerObject | undefined {
    return [...state.trackers.values()].find((t) => t.tracking_code === code);
  }

  // ---- HTTP ------------------------------------------------------------------------------------

  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', false);
  app.use(express.json({ limit: '1mb' }));

  app.get('/', (_req, res) => {
    res.json({
      service: 'Platterpost shipping fake',
      api: '/v2/',
      now: new Date(nowMs()).toISOString(),
      clockSpeed,
      carriers: [...new Set(carrierServices.map((s) => s.carrier))],
    });
  });

  // Test controls: no API key, like any other local-only switch.
  app.get('/_fake/clock', (_req, res) => {
    res.json({ now: new Date(nowMs()).toISOString(), clockSpeed, pendingScans: state.scheduled.length });
  });
  app.post('/_fake/clock', (req, res) => {
    const hours = Number((req.body as Json | undefined)?.advanceHours);
    if (!Number.isFinite(hours) || hours < 0) {
      throw new ApiError(422, 'PARAMETER.INVALID', 'advanceHours must be a number of hours ≥ 0', [{ field: 'advanceHours', message: 'is invalid' }]);
    }
    const emitted = advanceHours(hours);
    res.json({ now: new Date(nowMs()).toISOString(), emitted: emitted.length, events: emitted.map((e) => e.id) });
  });
  app.post('/_fake/fail', (req, res) => {
    const body = (req.body ?? {}) as Json;
    const path = body.path;
    const times = body.times === undefined ? 1 : Number(body.times);
    const status = body.status === undefined ? 500 : Number(body.status);
    if (typeof path !== 'string' || !path.startsWith('/')) {
      throw new ApiError(422, 'PARAMETER.INVALID', 'path must start with "/", e.g. "/v2/shipments" or "/v2/shipments/:id/buy"', [{ field: 'path', message: 'is invalid' }]);
    }
    if (!Number.isInteger(times) || times < 1) throw new ApiError(422, 'PARAMETER.INVALID', 'times must be a whole number ≥ 1', [{ field: 'times', message: 'is invalid' }]);
    if (!Number.isInteger(status) || status < 400 || status > 599) throw new ApiError(422, 'PARAMETER.INVALID', 'status must be 400–599', [{ field: 'status', message: 'is invalid' }]);
    const method = typeof body.method === 'string' ? body.method.toUpperCase() : null;
    state.failures.push({ pattern: pathPattern(path), path, method, remaining: times, status });
    res.status(201).json({ path, times, status, method });
  });
  app.delete('/_fake/fail', (_req, res) => {
    state.failures = [];
    res.status(204).end();
  });
  app.post('/_fake/reset', (_req, res) => {
    for (const map of [state.addresses, state.parcels, state.shipments, state.trackers, state.webhooks, state.labels]) map.clear();
    state.events.length = 0;
    state.deliveries.length = 0;
    state.scheduled = [];
    state.failures = [];
    res.status(204).end();
  });

  // Injected failures, before authentication: an outage does not care about keys.
  app.use((req: Request, res: Response, next: NextFunction) => {
    const rule = state.failures.find((f) => f.remaining > 0 && f.pattern.test(req.path) && (!f.method || f.method === req.method));
    if (!rule) return next();
    rule.remaining -= 1;
    state.failures = state.failures.filter((f) => f.remaining > 0);
    res.status(rule.status).json({ error: { code: 'INTERNAL_SERVER_ERROR', message: `Injected failure for ${rule.path}`, errors: [] } });
  });

  // Label files are public links, as the service's label URLs are.
  app.get('/labels/:file', async (req, res) => {
    const match = /^(pl_[0-9a-f]+)\.(png|pdf)$/.exec(String(req.params.file));
    const entry = match ? state.labels.get(match[1]) : undefined;
    const record = entry ? state.shipments.get(entry.shipmentId) : undefined;
    if (!match || !entry || !record || !record.body.tracking_code) {
      res.status(404).type('text').send('No such label');
      return;
    }
    const rate = record.body.selected_rate as RateObject;
    if (match[2] === 'png') {
      entry.png ??= trackingBarcodePng(record.body.tracking_code);
      res.type('image/png').send(await entry.png);
      return;
    }
    entry.pdf ??= labelPdf({
      carrier: rate.carrier,
      service: rate.service,
      trackingCode: record.body.tracking_code,
      from: record.fromAddress,
      to: record.toAddress,
      billableLb: record.billableLb,
      zone: record.leg.zone,
      shipDate: String((record.body.postage_label as Json).label_date).slice(0, 10),
      reference: record.body.reference as string | null,
    });
    res.type('application/pdf').send(await entry.pdf);
  });

  app.get('/track/:code', (req, res) => {
    processDue();
    const tracker = trackerByCode(String(req.params.code));
    if (!tracker) {
      res.status(404).type('html').send('<!doctype html><title>Not found</title><p>No parcel with that tracking code.</p>');
      return;
    }
    const rows = [...tracker.tracking_details]
      .reverse()
      .map((d) => {
        const loc = d.tracking_location as { city: string; state: string } | null;
        return `<tr><td>${escapeHtml(d.datetime)}</td><td>${escapeHtml(String(d.message))}</td><td>${loc ? escapeHtml(`${loc.city}, ${loc.state}`) : ''}</td></tr>`;
      })
      .join('');
    res
      .type('html')
      .send(
        `<!doctype html><html lang="en"><meta charset="utf-8"><title>Tracking ${escapeHtml(tracker.tracking_code)}</title><body style="font-family:system-ui,sans-serif;max-width:40rem;margin:2rem auto"><h1>${escapeHtml(String(tracker.carrier))} ${escapeHtml(tracker.tracking_code)}</h1><p>Status: <strong>${escapeHtml(tracker.status.replace(/_/g, ' '))}</strong></p><table><thead><tr><th>Time (UTC)</th><th>Event</th><th>Place</th></tr></thead><tbody>${rows}</tbody></table></body></html>`,
      );
  });

  const v2 = express.Router();
  v2.use((req: Request, _res: Response, next: NextFunction) => {
    const header = req.get('authorization') ?? '';
    const [scheme, encoded] = header.split(' ');
    if (scheme?.toLowerCase() !== 'basic' || !encoded) {
      throw new ApiError(401, 'APIKEY.REQUIRED', 'An API key is required for this request. Send it as the user name in HTTP Basic authentication.');
    }
    const decoded = Buffer.from(encoded, 'base64').toString('utf8');
    const key = decoded.includes(':') ? decoded.slice(0, decoded.indexOf(':')) : decoded;
    if (key !== apiKey) throw new ApiError(401, 'APIKEY.INACTIVE', 'This API key is not valid. Check the key and try again.');
    processDue();
    next();
  });

  v2.post('/addresses', (req, res) => {
    const body = (req.body ?? {}) as Json;
    res.status(201).json(createAddress(wrapped(req, 'address'), body.verify ?? body.verify_strict));
  });
  v2.get('/addresses/:id', (req, res) => {
    const address = state.addresses.get(String(req.params.id));
    if (!address) throw new ApiError(404, 'NOT_FOUND', `Address ${req.params.id} could not be found`);
    res.json(address);
  });
  v2.post('/parcels', (req, res) => {
    res.status(201).json(createParcel(wrapped(req, 'parcel')));
  });
  v2.get('/parcels/:id', (req, res) => {
    const parcel = state.parcels.get(String(req.params.id));
    if (!parcel) throw new ApiError(404, 'NOT_FOUND', `Parcel ${req.params.id} could not be found`);
    res.json(parcel);
  });
  v2.post('/shipments', (req, res) => {
    res.status(201).json(shipmentJson(createShipment(wrapped(req, 'shipment'))));
  });
  v2.get('/shipments', (_req, res) => {
    res.json({ shipments: [...state.shipments.values()].reverse().map(shipmentJson), has_more: false });
  });
  v2.get('/shipments/:id', (req, res) => {
    res.json(shipmentJson(getShipment(String(req.params.id))));
  });
  v2.post('/shipments/:id/buy', (req, res) => {
    const record = getShipment(String(req.params.id));
    const rate = ((req.body ?? {}) as Json).rate;
    const rateId = typeof rate === 'string' ? rate : rate && typeof rate === 'object' ? (rate as Json).id : undefined;
    if (!rateId) throw new ApiError(422, 'PARAMETER.REQUIRED', 'Missing required parameter: rate', [{ field: 'rate', message: 'is required' }]);
    buy(record, rateId, baseUrlOf(req));
    res.json(shipmentJson(record));
  });
  v2.post('/shipments/:id/refund', (req, res) => {
    res.json(refund(getShipment(String(req.params.id))));
  });

  v2.post('/trackers', (req, res) => {
    const input = wrapped(req, 'tracker');
    const code = optionalString(input.tracking_code);
    if (!code) throw new ApiError(422, 'PARAMETER.REQUIRED', 'Missing required parameter: tracking_code', [{ field: 'tracking_code', message: 'is required' }]);
    const existing = trackerByCode(code);
    if (existing) {
      res.json(existing);
      return;
    }
    // A code this fake never issued: the carrier has nothing on it yet.
    const at = isoSeconds(nowMs());
    const tracker: TrackerObject = {
      id: newId('trk'),
      object: 'Tracker',
      mode: 'test',
      tracking_code: code,
      status: 'unknown',
      status_detail: 'unknown',
      signed_by: null,
      weight: null,
      est_delivery_date: null,
      shipment_id: null,
      carrier: optionalString(input.carrier),
      tracking_details: [],
      carrier_detail: null,
      public_url: `${baseUrlOf(req)}/track/${encodeURIComponent(code)}`,
      fees: [],
      finalized: false,
      is_return: false,
      created_at: at,
      updated_at: at,
    };
    state.trackers.set(tracker.id, tracker);
    res.status(201).json(tracker);
  });
  v2.get('/trackers', (req, res) => {
    const code = typeof req.query.tracking_code === 'string' ? req.query.tracking_code : undefined;
    const trackers = [...state.trackers.values()].filter((t) => !code || t.tracking_code === code).reverse();
    res.json({ trackers, has_more: false });
  });
  v2.get('/trackers/:id', (req, res) => {
    const tracker = state.trackers.get(String(req.params.id));
    if (!tracker) throw new ApiError(404, 'NOT_FOUND', `Tracker ${req.params.id} could not be found`);
    res.json(tracker);
  });

  function publicWebhook(w: WebhookObject): WebhookObject {
    const { secret: _secret, customHeaders: _headers, ...rest } = w as WebhookObject & { secret?: unknown; customHeaders?: unknown };
    return rest as WebhookObject;
  }
  v2.post('/webhooks', (req, res) => {
    const input = wrapped(req, 'webhook');
    const url = optionalString(input.url);
    let parsed: URL | null = null;
    try {
      parsed = url ? new URL(url) : null;
    } catch {
      parsed = null;
    }
    if (!parsed || !/^https?:$/.test(parsed.protocol)) {
      throw new ApiError(422, 'PARAMETER.INVALID', 'url must be an http or https URL', [{ field: 'url', message: 'is invalid' }]);
    }
    const customHeaders = Array.isArray(input.custom_headers)
      ? (input.custom_headers as Json[]).map((h) => ({ key: String(h.key), value: String(h.value) }))
      : [];
    const webhook = {
      id: newId('hook'),
      object: 'Webhook',
      mode: 'test',
      url: parsed.toString(),
      disabled_at: null,
      custom_headers: customHeaders.map(({ key }) => ({ key, value: '[hidden]' })),
      created_at: isoSeconds(nowMs()),
      secret: optionalString(input.webhook_secret),
      customHeaders,
    };
    state.webhooks.set(webhook.id, webhook);
    res.status(201).json(publicWebhook(webhook));
  });
  v2.get('/webhooks', (_req, res) => {
    res.json({ webhooks: [...state.webhooks.values()].map(publicWebhook) });
  });
  v2.get('/webhooks/:id', (req, res) => {
    const webhook = state.webhooks.get(String(req.params.id));
    if (!webhook) throw new ApiError(404, 'NOT_FOUND', `Webhook ${req.params.id} could not be found`);
    res.json(publicWebhook(webhook));
  });
  v2.delete('/webhooks/:id', (req, res) => {
    if (!state.webhooks.delete(String(req.params.id))) throw new ApiError(404, 'NOT_FOUND', `Webhook ${req.params.id} could not be found`);
    res.json({});
  });
  v2.get('/events', (_req, res) => {
    res.json({ events: [...state.events].reverse(), has_more: false });
  });
  v2.get('/events/:id', (req, res) => {
    const event = state.events.find((e) => e.id === req.params.id);
    if (!event) throw new ApiError(404, 'NOT_FOUND', `Event ${req.params.id} could not be found`);
    res.json(event);
  });
  v2.use((req: Request) => {
    throw new ApiError(404, 'NOT_FOUND', `No endpoint ${req.method} ${req.originalUrl}`);
  });
  app.use('/v2', v2);

  app.use((error: unknown, _req: Request, res: Response, _next: NextFunction) => {
    if (error instanceof ApiError) {
      res.status(error.status).json({ error: { code: error.code, message: error.message, errors: error.errors } });
      return;
    }
    const parseFailed = (error as { type?: string }).type === 'entity.parse.failed';
    if (parseFailed) {
      res.status(400).json({ error: { code: 'BAD_REQUEST', message: 'The request body is not valid JSON', errors: [] } });
      return;
    }
    if (error instanceof RangeError) {
      res.status(422).json({ error: { code: 'PARAMETER.INVALID', message: error.message, errors: [] } });
      return;
    }
    log(`shipping fake error: ${(error as Error).stack ?? String(error)}`);
    res.status(500).json({ error: { code: 'INTERNAL_SERVER_ERROR', message: 'Something went wrong in the shipping fake', errors: [] } });
  });

  return {
    app,
    state,
    get port() {
      return boundPort;
    },
    get url() {
      return `http://${host}:${boundPort}`;
    },
    /** Base URL for `new EasyPostClient(key, { baseUrl })`. */
    get baseUrl() {
      return `http://${host}:${boundPort}/v2/`;
    },
    async start(): Promise<void> {
      await new Promise<void>((resolve, reject) => {
        const s = app.listen(boundPort, host, (error?: Error) => (error ? reject(error) : resolve()));
        server = s;
      });
      boundPort = (server!.address() as AddressInfo).port;
      if (clockSpeed > 0) {
        ticker = setInterval(processDue, 250);
        ticker.unref();
      }
    },
    async stop(): Promise<void> {
      if (ticker) clearInterval(ticker);
      ticker = null;
      sender.stop();
      const s = server;
      server = null;
      if (s) {
        s.closeAllConnections();
        await new Promise<void>((resolve) => s.close(() => resolve()));
      }
    },
    advanceHours,
    /** Resolves when every queued webhook delivery has succeeded or used up its retries. */
    webhooksIdle: () => sender.idle(),
    now: () => new Date(nowMs()),
  };
}

export type ShippingFake = ReturnType<typeof createShippingFake>;
export { trackingHasException } from './route';
