import { createServer, type IncomingMessage, type RequestListener, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createRequire } from 'node:module';
import zipcodes from 'zipcodes';
import type { DataSource } from 'typeorm';
import { assessBattery, type BatteryDeclaration } from '@shared/domain/battery';
import { makeReference } from '@shared/domain/reference';
import { triage } from '@shared/domain/triage';
import type { MediaType, Role } from '@shared/vocabulary';
import { Organization } from '../../server/organizations';
import { formatApiKey, insertApiKey } from '../../server/partner-api';
import { createUser, TEST_PASSWORD } from '../support/factories';
import { signIn, unique } from '../support/api';
import type { Express } from 'express';

// Shared by the shipping and receiving API tests: shops and labs at real ZIP centroids, cases a lab has
// already accepted (written directly, as intake and routing are tested in their own files), a partner API
// key, a gate in front of the app that can play "server down", and pdf-parse.

/** pdf-parse v1's index reads a sample PDF when loaded as a main module; its library file does not. */
export const pdfParse = createRequire(import.meta.url)('pdf-parse/lib/pdf-parse.js') as (
  data: Buffer,
  options?: { pagerender?: (page: { view: number[]; getTextContent(): Promise<{ items: { str: string }[] }> }) => Promise<string> },
) => Promise<{ numpages: number; text: string }>;

/** Page sizes (PDF points) and text of a PDF. */
export async function readPdf(pdf: Buffer): Promise<{ pages: number; sizes: number[][]; text: string }> {
  const sizes: number[][] = [];
  const parsed = await pdfParse(pdf, {
    pagerender: async (page) => {
      sizes.push([page.view[2]! - page.view[0]!, page.view[3]! - page.view[1]!]);
      const content = await page.getTextContent();
      return content.items.map((i) => i.str).join(' ');
    },
  });
  return { pages: parsed.numpages, sizes, text: parsed.text };
}

export const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

export async function makeOrganization(db: DataSource, kind: 'partner' | 'lab', zip: string, name = unique(kind === 'lab' ? 'Test Lab ' : 'Test Shop ')) {
  const place = zipcodes.lookup(zip)!;
  return db.getRepository(Organization).save({
    kind,
    name,
    slug: unique(`${kind}-`),
    addressLine1: kind === 'lab' ? '12 Bench Road' : '3 Counter Street',
    city: place.city,
    region: place.state,
    postalCode: zip,
    country: 'US',
    lat: place.latitude,
    lon: place.longitude,
    phone: '+1 555 0100',
    timeZone: 'America/Chicago',
  });
}

export async function person(app: Express, db: DataSource, role: Role, organizationId: string) {
  const user = await createUser(db, { role, organizationId });
  const { accessToken } = await signIn(app, user.email, TEST_PASSWORD);
  return { user, token: accessToken };
}

export interface CaseOptions {
  mediaType?: MediaType;
  battery?: BatteryDeclaration;
  status?: string;
}

/** A case the lab has accepted, as intake and routing leave it (with the accepted offer and the timeline). */
export async function makeAcceptedCase(db: DataSource, shop: Organization, lab: Organization, options: CaseOptions = {}) {
  const mediaType = options.mediaType ?? 'hdd_3_5';
  const t = triage({ mediaType, symptoms: ['clicking'], sensitivity: [], ...(options.battery ? { battery: options.battery } : {}) });
  const battery = options.battery ? assessBattery(options.battery) : null;
  const stored = { ...t, cautions: [...t.cautions, ...(battery?.cautions ?? [])], battery };
  const [{ n }]: { n: string }[] = await db.query(`SELECT nextval('referral_number_seq')::text AS n`);
  const [row]: { id: string }[] = await db.query(
    `INSERT INTO referrals (reference_number, reference, partner_organization_id, status, customer_name, customer_email, media_type,
       device_make, device_model, symptoms, battery, origin_line1, origin_city, origin_region, origin_postal_code, origin_country,
       origin_lat, origin_lon, triage, lab_organization_id, created_by_type, created_by_id, created_by_name)
     VALUES ($1, $2, $3, $4, 'Wren Halloway', 'wren.halloway@customer.test', $5, 'Examplar', 'X-2000', '{clicking}', $6, $7, $8, $9, $10, 'US',
       $11, $12, $13, $14, 'user', 'test', 'Test partner_staff') RETURNING id`,
    [
      n,
      makeReference(BigInt(n)),
      shop.id,
      options.status ?? 'accepted',
      mediaType,
      options.battery
        ? JSON.stringify({ installed: options.battery.installed, condition: options.battery.condition ?? null, wattHours: options.battery.wattHours ?? null, volts: null, milliampHours: null })
        : null,
      shop.addressLine1,
      shop.city,
      shop.region,
      shop.postalCode,
      shop.lat,
      shop.lon,
      JSON.stringify(stored),
      lab.id,
    ],
  );
  await db.query(
    `INSERT INTO lab_offers (referral_id, lab_organization_id, status, offered_at, deadline, responded_at, responded_by_name)
     VALUES ($1, $2, 'accepted', now(), now() + interval '4 hours', now(), 'Test lab_manager')`,
    [row!.id, lab.id],
  );
  const [referral]: { id: string; reference: string }[] = await db.query(`SELECT id, reference FROM referrals WHERE id = $1`, [row!.id]);
  return referral!;
}

export async function makeApiKey(db: DataSource, organizationId: string): Promise<string> {
  const prefix = unique('').replace(/[^a-z0-9]/g, '').padEnd(12, '0').slice(-12);
  const secret = `s${unique('secret').replace(/[^A-Za-z0-9]/g, '')}`.padEnd(40, 'x');
  await insertApiKey(db.manager, { organizationId, name: 'Ticketing', prefix, secret });
  return formatApiKey(prefix, secret);
}

/**
 * An HTTP listener in front of the app, so the shipping fake has somewhere to post events. `down()` plays a
 * stopped server (connections refused by answering 503), `up(handler)` brings a (new) app back.
 */
export async function startGate(handler: RequestListener) {
  let current: RequestListener | null = handler;
  const server: Server = createServer((req: IncomingMessage, res: ServerResponse) => {
    if (!current) {
      res.writeHead(503).end();
      return;
    }
    current(req, res);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/api/webhooks/shipping`,
    down: () => {
      current = null;
    },
    up: (next: RequestListener) => {
      current = next;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/**
 * A proxy to the shipping fake that can hold answers back past the client's timeout while still passing
 * the request on (the fake does the work; the caller never hears).
 */
export async function startSlowProxy(target: string) {
  let slowMs = 0;
  const server: Server = createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const upstream = await fetch(new URL(req.url!, target), {
      method: req.method,
      headers: Object.fromEntries(Object.entries(req.headers).filter(([k]) => !['host', 'content-length', 'connection'].includes(k)) as [string, string][]),
      body: ['GET', 'HEAD'].includes(req.method!) ? undefined : Buffer.concat(chunks),
    });
    const body = Buffer.from(await upstream.arrayBuffer());
    if (slowMs > 0) await new Promise((r) => setTimeout(r, slowMs));
    if (res.destroyed) return;
    res.writeHead(upstream.status, { 'content-type': upstream.headers.get('content-type') ?? 'application/json' }).end(body);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}/v2/`,
    slow: (ms: number) => {
      slowMs = ms;
    },
    close: () => {
      server.closeAllConnections();
      return new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
