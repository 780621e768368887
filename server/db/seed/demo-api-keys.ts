import type { EntityManager } from 'typeorm';
import { formatApiKey, insertApiKey } from '../../partner-api';

// Two partner API keys with fixed secrets, so that the README's curl example works on a fresh
// demo. Only for the demo data: real keys are created in the app and shown once.
export const demoApiKeys = [
  { organization: 'juniper-lane', name: 'Juniper Lane ticketing (demo)', prefix: 'demojuniper1', secret: 'demo-only-secret-juniper-lane-pc-clinic' },
  { organization: 'bramblewood', name: 'Bramblewood repair desk (demo)', prefix: 'demobramble1', secret: 'demo-only-secret-bramblewood-device-repair' },
] as const;

export const demoApiKeyValues = Object.fromEntries(demoApiKeys.map((k) => [k.organization, formatApiKey(k.prefix, k.secret)])) as Record<
  (typeof demoApiKeys)[number]['organization'],
  string
>;

export async function seedDemoApiKeys(manager: EntityManager, orgIds: Map<string, string>): Promise<void> {
  for (const k of demoApiKeys) {
    const organizationId = orgIds.get(k.organization);
    if (!organizationId) throw new Error(`demo data: no organisation ${k.organization} for its API key`);
    await insertApiKey(manager, { organizationId, name: k.name, prefix: k.prefix, secret: k.secret });
  }
}
