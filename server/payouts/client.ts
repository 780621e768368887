import Stripe from 'stripe';
import type { Config } from '../config';

const clients = new WeakMap<Config, Stripe>();

/**
 * The payment provider's official SDK, pointed at PAYMENTS_API_URL (our local fake in development and
 * tests; the provider itself in production). One client per configuration; shared by every component
 * that talks to the provider (payouts here, checkout and refunds for the payment component).
 */
export function paymentsClient(config: Config): Stripe {
  let client = clients.get(config);
  if (!client) {
    const url = new URL(config.payments.apiUrl);
    const protocol = url.protocol === 'http:' ? 'http' : 'https';
    client = new Stripe(config.payments.secretKey, {
      host: url.hostname,
      port: url.port ? Number(url.port) : protocol === 'http' ? 80 : 443,
      protocol,
      maxNetworkRetries: config.payments.maxNetworkRetries,
      timeout: 20_000,
      appInfo: { name: 'Platterpost' },
    });
    clients.set(config, client);
  }
  return client;
}
