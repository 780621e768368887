import EasyPostClient from '@easypost/api';
import type { Config } from '../config';

// The shipping service through its official SDK. Locally the SDK talks to fakes/shipping (same wire
// protocol, invented carriers); one URL and one key move it to the hosted service.

export type CarrierClient = InstanceType<typeof EasyPostClient>;

const clients = new WeakMap<Config['shipping'], CarrierClient>();

/** One client per configuration. The SDK applies no timeout of its own, so each request gets ours. */
export function carrierClient(config: Config['shipping']): CarrierClient {
  let client = clients.get(config);
  if (!client) {
    client = new EasyPostClient(config.apiKey, {
      baseUrl: config.apiUrl,
      requestMiddleware: (request: { timeout(t: { response: number; deadline: number }): unknown }) => {
        request.timeout({ response: config.timeoutMs, deadline: config.timeoutMs });
        return request;
      },
    });
    clients.set(config, client);
  }
  return client;
}

// The parts of the wire objects we read (the SDK's own types mark most fields optional).
export interface ProviderRate {
  id: string;
  carrier: string;
  service: string;
  rate: string;
  currency: string;
  delivery_days: number | null;
  est_delivery_days?: number | null;
  /** The fake's own field: ground or air without knowing service names. */
  shipping_mode?: 'ground' | 'air';
  zone?: number;
  billable_weight_lb?: number;
}

export interface ProviderTrackingDetail {
  status: string;
  status_detail: string | null;
  message: string | null;
  datetime: string;
  tracking_location?: { city?: string | null; state?: string | null; zip?: string | null } | null;
}

export interface ProviderTracker {
  id: string;
  tracking_code: string;
  status: string;
  status_detail: string | null;
  est_delivery_date: string | null;
  public_url: string | null;
  carrier: string | null;
  updated_at: string;
  tracking_details: ProviderTrackingDetail[];
}

export interface ProviderShipment {
  id: string;
  tracking_code: string | null;
  rates: ProviderRate[];
  selected_rate: ProviderRate | null;
  postage_label: { label_pdf_url?: string | null; label_url?: string | null } | null;
  tracker: ProviderTracker | null;
  messages?: { carrier: string; message: string }[];
  refund_status?: string | null;
}

export type CarrierFailureKind = 'unavailable' | 'not_found' | 'postage_exists' | 'rejected';

export interface CarrierFailure {
  kind: CarrierFailureKind;
  status: number | null;
  code: string | null;
  message: string;
}

/** What went wrong in a call to the shipping service, in the terms our use cases need. */
export function classifyCarrierError(error: unknown): CarrierFailure {
  const e = error as { statusCode?: number; code?: string; message?: string; timeout?: number; errno?: string };
  const status = typeof e?.statusCode === 'number' ? e.statusCode : null;
  const code = typeof e?.code === 'string' ? e.code : null;
  const message = e?.message ?? String(error);
  if (status === null) return { kind: 'unavailable', status, code, message }; // timeout, refused, reset
  if (status >= 500 || status === 429 || status === 408) return { kind: 'unavailable', status, code, message };
  if (status === 404) return { kind: 'not_found', status, code, message };
  if (code === 'SHIPMENT.POSTAGE.EXISTS') return { kind: 'postage_exists', status, code, message };
  return { kind: 'rejected', status, code, message };
}

/** "12.34" dollars → 1234 cents, without floating-point surprises. */
export function toMinorUnits(decimal: string): number {
  const m = /^(\d+)(?:\.(\d{1,2}))?$/.exec(decimal.trim());
  if (!m) throw new RangeError(`not an amount: ${JSON.stringify(decimal)}`);
  return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}
