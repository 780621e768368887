import request from 'supertest';
import zipcodes from 'zipcodes';
import { afterEach, expect } from 'vitest';
import type { Role } from '@shared/vocabulary';
import { Organization } from '../../server/organizations';
import { signIn, unique, type TestContext } from './api';
import { createOrganization, createUser, TEST_PASSWORD } from './factories';

// Shops and labs of one test file, at a ZIP code of its own far from the other files' and the demo
// network's, so that its labs rank first for its shops. Labs are set up through the lab manager's own
// profile form (PUT /api/lab/profile); each test's labs stop taking new cases when it ends.

export interface NetworkPlace {
  zip: string;
  timeZone: string;
  /** The state, for the labs' public holidays. */
  holidayRegion: string;
}

export interface ShopOptions {
  zip?: string;
  line1?: string;
  role?: Extract<Role, 'partner_admin' | 'partner_staff'>;
}

export interface LabOptions {
  name?: string;
  zip?: string;
  line1?: string;
  skills?: { skill: string; turnaroundDays: number }[];
  mediaTypes?: string[];
  certificate?: object;
  /** Any other part of the profile, as PUT /api/lab/profile takes it. */
  profile?: Record<string, unknown>;
}

const isoDate = (d: Date) => d.toISOString().slice(0, 10);
/** The date n days before today, as a certificate's test date. */
export const daysAgo = (n: number) => isoDate(new Date(Date.now() - n * 86_400_000));

/**
 * Particle counts that demonstrate ISO 14644-1:2015 class 5 on a 1.5 m² bench: one sampling location
 * (Table A.1), every count under the class 5 limits of Table 1 (0.3 µm 10 200, 0.5 µm 3 520, 1 µm 832).
 */
export const classFive = (testedOn: string) => ({
  testedOn,
  areaName: 'Bench 1',
  areaM2: 1.5,
  samples: [
    { location: 'L1', sizeUm: 0.3, perM3: 3000, volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 0.5, perM3: 900, volumeLitres: 28.3 },
    { location: 'L1', sizeUm: 1, perM3: 200, volumeLitres: 28.3 },
  ],
});

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` });

export function testNetwork({ app, db }: Pick<TestContext, 'app' | 'db'>, at: NetworkPlace) {
  const place = zipcodes.lookup(at.zip)!;
  const labsOfThisTest: string[] = [];
  afterEach(async () => {
    await db.query(`UPDATE lab_profiles SET accepting_new_cases = false WHERE organization_id = ANY($1)`, [labsOfThisTest]);
    labsOfThisTest.length = 0;
  });

  async function makeShop(options: ShopOptions = {}) {
    const zip = options.zip ?? at.zip;
    const where = zipcodes.lookup(zip)!;
    const org = await db.getRepository(Organization).save({
      kind: 'partner',
      name: unique('Test Shop '),
      slug: unique('shop-'),
      addressLine1: options.line1 ?? null,
      city: where.city,
      region: where.state,
      postalCode: zip,
      country: 'US',
      lat: where.latitude,
      lon: where.longitude,
      timeZone: at.timeZone,
    });
    const user = await createUser(db, { role: options.role ?? 'partner_staff', organizationId: org.id });
    const { accessToken } = await signIn(app, user.email, TEST_PASSWORD);
    return { org, user, token: accessToken };
  }

  async function makeLab(options: LabOptions = {}) {
    const org = await createOrganization(db, 'lab', unique(options.name ?? 'Test Lab '));
    const manager = await createUser(db, { role: 'lab_manager', organizationId: org.id });
    const { accessToken: token } = await signIn(app, manager.email, TEST_PASSWORD);
    const res = await request(app)
      .put('/api/lab/profile')
      .set(bearer(token))
      .send({
        address: { ...(options.line1 ? { line1: options.line1 } : {}), postalCode: options.zip ?? at.zip, country: 'US' },
        timeZone: at.timeZone,
        businessHours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], holidayCountry: 'US', holidayRegion: at.holidayRegion },
        mediaTypes: options.mediaTypes ?? ['hdd_3_5', 'hdd_2_5', 'usb_flash', 'tape'],
        skills: options.skills ?? [{ skill: 'hdd_head_swap', turnaroundDays: 1 }],
        weeklyThroughput: 10,
        queueCapacity: 20,
        healthDataAgreement: { signed: false },
        acceptingNewCases: true,
        autoAcceptRules: [],
        ...options.profile,
      });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    if (options.certificate) {
      const cert = await request(app).post('/api/lab/profile/certificates').set(bearer(token)).send(options.certificate);
      expect(cert.status).toBe(201);
    }
    labsOfThisTest.push(org.id);
    return { org, manager, token };
  }

  return { place, makeShop, makeLab };
}
