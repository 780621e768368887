import { createHmac } from 'node:crypto';
import type { StripeEvent } from './store';

/**
 * The provider's `Stripe-Signature` header: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<payload>">`,
 * keyed with the whole endpoint secret (`whsec_…`) as text — what `stripe.webhooks.constructEvent` checks.
 */
export function signatureHeader(payload: string, secret: string, timestamp = Math.floor(Date.now() / 1000)): string {
  const signature = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

export interface WebhookDelivery {
  eventId: string;
  eventType: string;
  attempt: number;
  /** HTTP status of the receiver's answer, or null when it could not be reached. */
  status: number | null;
  error: string | null;
  ok: boolean;
  at: number;
}

export interface WebhookSenderOptions {
  url: () => string | undefined;
  secret: () => string;
  /** Waits before each retry; the number of entries is the number of retries after the first attempt. */
  retryDelaysMs: readonly number[];
  timeoutMs: number;
  onDelivered?: (event: StripeEvent) => void;
}

/**
 * Posts each event to the endpoint on its own, retrying with back-off on a non-2xx answer or a network
 * error. Events are not queued behind each other: like the provider, the fake does not promise order.
 */
export class WebhookSender {
  readonly deliveries: WebhookDelivery[] = [];
  private readonly pending = new Set<Promise<void>>();
  private readonly timers = new Map<NodeJS.Timeout, () => void>();
  private stopped = false;

  constructor(private readonly options: WebhookSenderOptions) {}

  send(event: StripeEvent): void {
    if (!this.options.url() || this.stopped) return;
    const job = this.deliver(event).finally(() => this.pending.delete(job));
    this.pending.add(job);
  }

  /** Resolves once every delivery started so far has succeeded or used up its retries. */
  async idle(): Promise<void> {
    while (this.pending.size > 0) await Promise.allSettled([...this.pending]);
  }

  stop(): void {
    this.stopped = true;
    // Wake the waiting retries so they see `stopped` and end, instead of hanging `idle()`.
    for (const [timer, resolve] of this.timers) {
      clearTimeout(timer);
      resolve();
    }
    this.timers.clear();
  }

  private async deliver(event: StripeEvent): Promise<void> {
    // Pretty-printed, as the provider sends it; the signature covers these exact bytes.
    const payload = JSON.stringify(event, null, 2);
    const attempts = this.options.retryDelaysMs.length + 1;
    for (let attempt = 1; attempt <= attempts && !this.stopped; attempt++) {
      if (attempt > 1) await this.wait(this.options.retryDelaysMs[attempt - 2]);
      const url = this.options.url();
      if (!url || this.stopped) return;
      const record: WebhookDelivery = {
        eventId: event.id,
        eventType: event.type,
        attempt,
        status: null,
        error: null,
        ok: false,
        at: Date.now(),
      };
      try {
        const response = await fetch(url, {
          method: 'POST',
          headers: {
            'content-type': 'application/json; charset=utf-8',
            'stripe-signature': signatureHeader(payload, this.options.secret()),
            'user-agent': 'platterpost-payments-fake',
          },
          body: payload,
          signal: AbortSignal.timeout(this.options.timeoutMs),
        });
        await response.arrayBuffer().catch(() => undefined);
        record.status = response.status;
        record.ok = response.ok;
      } catch (error) {
        record.error = error instanceof Error ? error.message : String(error);
      }
      this.deliveries.push(record);
      if (record.ok) {
        this.options.onDelivered?.(event);
        return;
      }
    }
  }

  private wait(ms: number): Promise<void> {
    return new Promise((resolve) => {
      const timer = setTimeout(() => {
        this.timers.delete(timer);
        resolve();
      }, ms);
      this.timers.set(timer, resolve);
    });
  }
}
