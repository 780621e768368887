import type pg from 'pg';
import { makeReference } from '@shared/domain/reference';
import { triage } from '@shared/domain/triage';

export interface QuillmarkCase {
  status: string;
  customerName: string;
  customerEmail: string;
  device?: { capacityGb?: number; make?: string; model?: string; serial?: string };
  priorities?: { category: string; note: string | null }[];
  /** When Quillmark accepted the offer, in days before now (default: now). */
  acceptedDaysAgo?: number;
  estimatedDays?: number;
}

/**
 * A clicking 3.5" drive from Juniper Lane that Quillmark has accepted, written as intake and routing leave
 * it (both tested in their own suites), for browser tests that start further along a case's life.
 */
export async function insertQuillmarkCase(db: pg.Client, c: QuillmarkCase): Promise<{ id: string; reference: string; labId: string }> {
  const orgs = await db.query(`SELECT id, slug, address_line1, city, region, postal_code, lat, lon FROM organizations WHERE slug IN ('juniper-lane', 'quillmark')`);
  const shop = orgs.rows.find((o) => o.slug === 'juniper-lane');
  const lab = orgs.rows.find((o) => o.slug === 'quillmark');
  const { rows: [{ n }] } = await db.query(`SELECT nextval('referral_number_seq')::text AS n`);
  const stored = { ...triage({ mediaType: 'hdd_3_5', symptoms: ['clicking'], sensitivity: [] }), battery: null };
  const columns: Record<string, unknown> = {
    reference_number: n,
    reference: makeReference(BigInt(n)),
    partner_organization_id: shop.id,
    status: c.status,
    customer_name: c.customerName,
    customer_email: c.customerEmail,
    media_type: 'hdd_3_5',
    capacity_gb: c.device?.capacityGb ?? null,
    device_make: c.device?.make ?? null,
    device_model: c.device?.model ?? null,
    device_serial: c.device?.serial ?? null,
    symptoms: ['clicking'],
    priorities: JSON.stringify(c.priorities ?? []),
    origin_line1: shop.address_line1,
    origin_city: shop.city,
    origin_region: shop.region,
    origin_postal_code: shop.postal_code,
    origin_country: 'US',
    origin_lat: shop.lat,
    origin_lon: shop.lon,
    triage: JSON.stringify(stored),
    lab_organization_id: lab.id,
    created_by_type: 'user',
    created_by_id: 'e2e',
    created_by_name: 'Theo Brandt',
  };
  const names = Object.keys(columns);
  const { rows: [row] } = await db.query(
    `INSERT INTO referrals (${names.join(', ')}) VALUES (${names.map((_, i) => `$${i + 1}`).join(', ')}) RETURNING id, reference`,
    Object.values(columns),
  );
  await db.query(
    `INSERT INTO lab_offers (referral_id, lab_organization_id, status, offered_at, deadline, responded_at, responded_by_name, estimated_days)
     VALUES ($1, $2, 'accepted', now() - $3 * interval '1 day', now() - $3 * interval '1 day' + interval '4 hours', now() - $3 * interval '1 day', 'Rosa Quintero', $4)`,
    [row.id, lab.id, c.acceptedDaysAgo ?? 0, c.estimatedDays ?? null],
  );
  return { id: row.id, reference: row.reference, labId: lab.id };
}
