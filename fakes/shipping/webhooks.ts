import { createHmac } from 'node:crypto';

/**
 * The service writes parcel and tracker weights as floats ("weight": 40.0), and the official
 * client's validateWebhook rewrites integer weights that way before hashing, so we serialise
 * weights the same way and sign exactly the bytes we send.
 */
export function serializeEvent(event: unknown): string {
  return JSON.stringify(event).replace(/("weight":\s*)(\d+)(\s*)(?=,|\})/g, '$1$2.0');
}

/** `X-Hmac-Signature` value: HMAC-SHA256 over the body with the NFKD-normalised secret, hex. */
export function hmacSignature(body: string, secret: string): string {
  const digest = createHmac('sha256', Buffer.from(secret.normalize('NFKD'), 'utf8')).update(body, 'utf8').digest('hex');
  return `hmac-sha256-hex=${digest}`;
}

export interface WebhookTarget {
  url: string;
  secret?: string;
  customHeaders?: { key: string; value: string }[];
}

export interface DeliveryAttempt {
  eventId: string;
  url: string;
  attempt: number;
  ok: boolean;
  status: number | null;
  error?: string;
  at: string;
}

export interface WebhookSenderOptions {
  /** Waits between attempts; the number of entries is the number of retries. */
  retryDelaysMs: readonly number[];
  timeoutMs?: number;
  onAttempt?: (attempt: DeliveryAttempt) => void;
}

/**
 * Posts events to webhook URLs. Each URL has its own queue, so a receiver sees events in the
 * order they happened even while an earlier one is being retried.
 */
export function createWebhookSender({ retryDelaysMs, timeoutMs = 5000, onAttempt }: WebhookSenderOptions) {
  const queues = new Map<string, Promise<void>>();
  const sleepers = new Map<NodeJS.Timeout, () => void>();
  let stopped = false;

  const sleep = (ms: number) =>
    new Promise<void>((resolve) => {
      const timer = setTimeout(() => {
        sleepers.delete(timer);
        resolve();
      }, ms);
      sleepers.set(timer, resolve);
    });

  async function deliver(target: WebhookTarget, eventId: string, body: string): Promise<void> {
    const headers: Record<string, string> = {
      'Content-Type': 'application/json',
      'User-Agent': 'Platterpost-Shipping-Fake/1.0',
    };
    for (const { key, value } of target.customHeaders ?? []) headers[key] = value;
    if (target.secret) headers['X-Hmac-Signature'] = hmacSignature(body, target.secret);

    for (let attempt = 1; attempt <= retryDelaysMs.length + 1 && !stopped; attempt++) {
      let status: number | null = null;
      let error: string | undefined;
      try {
        const response = await fetch(target.url, { method: 'POST', headers, body, signal: AbortSignal.timeout(timeoutMs) });
        status = response.status;
        await response.arrayBuffer();
      } catch (e) {
        error = (e as Error).message;
      }
      const ok = status !== null && status >= 200 && status < 300;
      onAttempt?.({ eventId, url: target.url, attempt, ok, status, error, at: new Date().toISOString() });
      if (ok) return;
      const wait = retryDelaysMs[attempt - 1];
      if (wait === undefined || stopped) return;
      await sleep(wait);
    }
  }

  return {
    send(target: WebhookTarget, eventId: string, body: string): void {
      const previous = queues.get(target.url) ?? Promise.resolve();
      const next = previous.then(() => deliver(target, eventId, body));
      queues.set(target.url, next);
      void next.finally(() => {
        if (queues.get(target.url) === next) queues.delete(target.url);
      });
    },
    /** Resolves when every queued delivery has succeeded or used up its retries. */
    async idle(): Promise<void> {
      while (queues.size > 0) await Promise.all([...queues.values()]);
    },
    stop(): void {
      stopped = true;
      // Wake the waiting retries so they see `stopped` and give up, and idle() settles.
      for (const [timer, wake] of sleepers) {
        clearTimeout(timer);
        wake();
      }
      sleepers.clear();
    },
  };
}

export type WebhookSender = ReturnType<typeof createWebhookSender>;
