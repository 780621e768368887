import zipcodes from 'zipcodes';
import type { DataSource } from 'typeorm';
import { loadConfig, type Config } from '../../config';
import { hashPassword, User } from '../../auth';
import { Organization } from '../../organizations';
import { DEMO_PASSWORD, demoAccounts } from './demo-accounts';
import { seedDemoApiKeys } from './demo-api-keys';
import { seedDemoCases } from './demo-cases';
import { seedDemoLabs } from './demo-labs';
import { seedDemoLabWork } from './demo-lab-work';
import { seedDemoShipments } from './demo-shipments';
import { seedDemoCommissionPlans, seedDemoMoney } from './demo-money';
import { demoExtraStaff, demoOrganizations } from './demo-data';

/**
 * Seeds the demo network once. Runs in one transaction and only when the network
 * organisation is missing, so a second start neither duplicates nor wipes anything.
 */
export async function seedDemo(db: DataSource, config: Config = loadConfig()): Promise<{ seeded: boolean }> {
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  return db.transaction(async (manager) => {
    // Serialise concurrent starts (two processes seeding the same empty database).
    await manager.query(`SELECT pg_advisory_xact_lock(hashtext('platterpost-demo-seed'))`);
    if (await manager.existsBy(Organization, { slug: 'network' })) return { seeded: false };

    const orgIds = new Map<string, string>();
    for (const o of demoOrganizations) {
      const place = zipcodes.lookup(o.postalCode);
      if (!place) throw new Error(`demo data: unknown ZIP ${o.postalCode}`);
      const saved = await manager.save(
        manager.create(Organization, {
          kind: o.kind,
          name: o.name,
          slug: o.key,
          email: o.email,
          phone: o.phone,
          addressLine1: o.addressLine1,
          city: place.city,
          region: place.state,
          postalCode: o.postalCode,
          country: 'US',
          lat: place.latitude,
          lon: place.longitude,
          timeZone: o.timeZone,
        }),
      );
      orgIds.set(o.key, saved.id);
    }
    const people = [...demoAccounts, ...demoExtraStaff];
    for (const p of people) {
      await manager.save(
        manager.create(User, { email: p.email, name: p.name, role: p.role, organizationId: orgIds.get(p.organization)!, status: 'active', passwordHash }),
      );
    }
    await seedDemoApiKeys(manager, orgIds);
    const now = new Date();
    // Commission plans first: the demo cases that get paid below accrue commission under them.
    await seedDemoCommissionPlans(manager, orgIds, now);
    await seedDemoLabs(manager, orgIds, now);
    await seedDemoCases(manager, orgIds, { config, passwordHash, now });
    // Boxes for accepted demo cases in several tracking states (marked historical: see demo-shipments.ts).
    await seedDemoShipments(manager, { now, ssccCompanyPrefix: config.shipping.ssccCompanyPrefix });
    // Quillmark's bench: a case at each stage of the lab's work and the customer's side.
    await seedDemoLabWork(manager, orgIds, { config, now });
    // Commission plans, four months of paid demo cases in the ledger, the three oldest settled.
    await seedDemoMoney(manager, orgIds, now);
    return { seeded: true };
  });
}
