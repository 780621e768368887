import type { EntityManager } from 'typeorm';
import { referralInput, type DeclineOfferInput, type ReferralInput } from '@shared/schemas/referrals';
import { User } from '../../auth';
import type { Config } from '../../config';
import type { ServiceContext } from '../../lib/context';
import { Organization } from '../../organizations';
import { cancelInTransaction, openReferral, type ReferralActor } from '../../referrals';
import { acceptInTransaction, declineInTransaction, expireInTransaction, LabOffer, lockReferral } from '../../routing';

// Demo cases across the stages that exist so far — offered, accepted (by a person and by a lab's
// auto-accept rule), declined and re-offered, expired, waiting for the network, cancelled — for several
// shops, so that every screen has something on first start. They go through the real intake and offer
// code with past timestamps; cases whose offer is still pending were opened minutes ago, so their
// deadlines lie ahead. Customers, people and device makes are invented.

/** A person at each demo shop that has no demo sign-in yet, so every case has someone who opened it. */
export const demoShopStaff = [
  { organization: 'pinwheel', name: 'Celeste Amadi', email: 'celeste.amadi@pinwheelrepair.example' },
  { organization: 'harbor-lantern', name: 'Rune Halvorsen', email: 'rune.halvorsen@harborlantern.example' },
  { organization: 'redfern', name: 'Dolores Quaid', email: 'dolores.quaid@redferntech.example' },
  { organization: 'marigold', name: 'Tomas Ekwueme', email: 'tomas.ekwueme@marigoldmicro.example' },
  { organization: 'sixpence', name: 'Philippa Grange', email: 'philippa.grange@sixpencecare.example' },
  { organization: 'cinder-hill', name: 'Jasper Whitlock', email: 'jasper.whitlock@cinderhill.example' },
  { organization: 'wrenfield', name: 'Anika Solberg', email: 'anika.solberg@wrenfieldit.example' },
  { organization: 'basalt-street', name: 'Mateo Arrieta', email: 'mateo.arrieta@basaltstreet.example' },
  { organization: 'otterbrook', name: 'Greer Mulcahy', email: 'greer.mulcahy@otterbrook.example' },
] as const;

type Step =
  | { do: 'accept'; minutesAgo: number }
  | { do: 'decline'; minutesAgo: number; reason: DeclineOfferInput['reason']; note?: string }
  | { do: 'expire' }
  | { do: 'cancel'; minutesAgo: number; by: string };

interface DemoCase {
  shop: string;
  /** E-mail of the shop's person who opened it, or the shop's demo API key by its prefix. */
  openedBy: { email: string } | { apiKeyPrefix: string };
  minutesAgo: number;
  input: ReferralInput;
  steps?: Step[];
  /** What the case must end as; the seed stops if routing decided otherwise. */
  expect: { status: string; lab?: string };
}

const H = 60;
const D = 24 * H;
const consent = { accepted: true as const };

export const demoCases: DemoCase[] = [
  // Older cases first, so that labs' queues hold their accepted cases when the newer ones are ranked.
  {
    shop: 'marigold',
    openedBy: { email: 'tomas.ekwueme@marigoldmicro.example' },
    minutesAgo: 8 * D,
    input: {
      customer: { name: 'Lucia Fenwright', email: 'lucia.fenwright@customer.example', phone: '+1 916 555 0177' },
      device: { mediaType: 'hdd_2_5', capacityGb: 1000, interface: 'sata', make: 'Veltrion', model: 'VT-1000M' },
      symptoms: ['beeping', 'dropped'],
      description: 'Laptop fell from a table; the drive now buzzes and the laptop does not find it.',
      priorities: [{ category: 'photos', note: 'Photos of the grandchildren, 2016 onwards' }, { category: 'documents', note: 'Tax returns' }],
      consent,
    },
    steps: [{ do: 'accept', minutesAgo: 8 * D - 2 * H }],
    expect: { status: 'accepted', lab: 'quillmark' },
  },
  {
    shop: 'harbor-lantern',
    openedBy: { email: 'rune.halvorsen@harborlantern.example' },
    minutesAgo: 6 * D,
    input: {
      customer: { name: 'Ingrid Oyelaran', email: 'ingrid.oyelaran@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 4000, interface: 'sata', make: 'Noctara', model: 'N4-Desk' },
      symptoms: ['not_spinning', 'burnt_smell'],
      description: 'Desktop drive went silent after a power cut; faint burnt smell from the board.',
      priorities: [{ category: 'design_files', note: 'Studio project archive' }, { category: 'email' }],
      sensitivity: ['none'],
      consent,
    },
    steps: [{ do: 'accept', minutesAgo: 6 * D - 3 * H }],
    expect: { status: 'accepted', lab: 'brindle-oak' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { email: 'maya.ferrante@juniperlane.example' },
    minutesAgo: 5 * D,
    input: {
      customer: { name: 'Bertrand Achterberg', email: 'bertrand.achterberg@customer.example' },
      device: { mediaType: 'ssd_sata', capacityGb: 500 },
      symptoms: ['wont_boot'],
      description: 'Windows stops at the logo; the customer found the files on a USB stick afterwards.',
      priorities: [{ category: 'spreadsheets' }],
      consent,
    },
    steps: [{ do: 'cancel', minutesAgo: 4 * D, by: 'maya.ferrante@juniperlane.example' }],
    expect: { status: 'cancelled' },
  },
  {
    shop: 'redfern',
    openedBy: { email: 'dolores.quaid@redferntech.example' },
    minutesAgo: 4 * D,
    input: {
      customer: { name: 'Harlan Mbeki-Ross', email: 'harlan.mbekiross@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 2000 },
      symptoms: ['deleted_files'],
      description: 'Emptied the recycle bin by mistake; the drive has not been used since.',
      priorities: [{ category: 'accounting', note: 'Bookkeeping files for 2024' }],
      consent,
    },
    expect: { status: 'accepted' },
  },
  {
    shop: 'pinwheel',
    openedBy: { email: 'celeste.amadi@pinwheelrepair.example' },
    // Long enough ago that its offer's deadline (4 business hours) has passed whatever the weekday.
    minutesAgo: 5 * D + 2 * H,
    input: {
      customer: { name: 'Marisol Achebe-Lund', email: 'marisol.achebelund@customer.example', phone: '+1 404 555 0162' },
      device: { mediaType: 'phone', make: 'Brisel', model: 'B12' },
      symptoms: ['liquid_damage', 'no_power'],
      description: 'Dropped in a lake while kayaking; has not switched on since.',
      priorities: [{ category: 'photos', note: 'Holiday photos not yet backed up' }, { category: 'videos' }],
      battery: { installed: true, condition: 'intact', wattHours: 14.2 },
      consent,
    },
    steps: [{ do: 'expire' }],
    expect: { status: 'needs_attention' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { email: 'maya.ferrante@juniperlane.example' },
    minutesAgo: 3 * D - 5 * H,
    input: {
      customer: { name: 'Odile Prasanna', email: 'odile.prasanna@customer.example' },
      device: { mediaType: 'usb_flash', capacityGb: 64 },
      symptoms: ['formatted'],
      description: 'Formatted the stick in a camera by accident.',
      priorities: [{ category: 'photos' }],
      consent,
    },
    expect: { status: 'accepted' },
  },
  {
    shop: 'kettle-creek',
    openedBy: { email: 'ward.pemberton@kettlecreek.example' },
    minutesAgo: 2 * D,
    input: {
      customer: { name: 'Viktor Almeida-Shaw', email: 'viktor.almeidashaw@customer.example' },
      device: { mediaType: 'ssd_m2_nvme', capacityGb: 1000, interface: 'nvme', make: 'Calderine', model: 'C9 Pro' },
      symptoms: ['not_detected'],
      description: 'Laptop SSD vanished from the BIOS after a firmware update.',
      priorities: [{ category: 'source_code', note: 'Uncommitted work, last two weeks' }, { category: 'documents' }],
      consent,
    },
    steps: [
      { do: 'decline', minutesAgo: 2 * D - 2 * H, reason: 'no_capacity', note: 'Controller bench booked until next week' },
      { do: 'accept', minutesAgo: 2 * D - 5 * H },
    ],
    expect: { status: 'accepted' },
  },
  {
    shop: 'cinder-hill',
    openedBy: { email: 'jasper.whitlock@cinderhill.example' },
    minutesAgo: 2 * D - 3 * H,
    input: {
      customer: { name: 'Priscilla Obuya', email: 'priscilla.obuya@customer.example' },
      device: { mediaType: 'usb_flash', capacityGb: 128 },
      symptoms: ['physically_broken', 'not_detected'],
      description: 'Stick snapped at the connector in a laptop port.',
      priorities: [{ category: 'documents', note: 'Thesis chapters' }],
      consent,
    },
    steps: [{ do: 'accept', minutesAgo: 2 * D - 4 * H }],
    expect: { status: 'accepted', lab: 'cobaltmere' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { email: 'ivy.okonkwo@juniperlane.example' },
    minutesAgo: 2 * D - 6 * H,
    input: {
      customer: { name: 'Dr. Anselm Whitcombe', email: 'anselm.whitcombe@customer.example' },
      device: { mediaType: 'memory_card', capacityGb: 256 },
      symptoms: ['physically_broken'],
      description: 'MicroSD card from a clinic’s dictation recorder, cracked across the middle.',
      priorities: [{ category: 'other', note: 'Dictated patient letters' }],
      sensitivity: ['health_records'],
      consent,
    },
    expect: { status: 'needs_attention' },
  },
  {
    shop: 'wrenfield',
    openedBy: { email: 'anika.solberg@wrenfieldit.example' },
    minutesAgo: 1 * D + 4 * H,
    input: {
      customer: { name: 'Cormac Delacroix-Yu', email: 'cormac.delacroixyu@customer.example' },
      device: { mediaType: 'hdd_2_5', capacityGb: 2000, interface: 'usb' },
      symptoms: ['clicking'],
      description: 'Portable backup drive clicks; the customer found a second copy afterwards.',
      priorities: [{ category: 'photos' }],
      consent,
    },
    steps: [{ do: 'cancel', minutesAgo: 1 * D + 1 * H, by: 'anika.solberg@wrenfieldit.example' }],
    expect: { status: 'cancelled' },
  },
  {
    shop: 'sixpence',
    openedBy: { email: 'philippa.grange@sixpencecare.example' },
    minutesAgo: 1 * D,
    input: {
      customer: { name: 'Eleanor Vasquez-Hale', email: 'eleanor.vasquezhale@customer.example' },
      device: { mediaType: 'tape' },
      symptoms: ['liquid_damage'],
      description: 'Backup tapes from a flooded basement office.',
      priorities: [{ category: 'accounting', note: 'Ledgers 2009–2014' }, { category: 'email' }],
      consent,
    },
    expect: { status: 'needs_attention' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { apiKeyPrefix: 'demojuniper1' },
    minutesAgo: 20 * H,
    input: {
      externalRef: 'JL-TKT-20417',
      customer: { name: 'Samir Kowalczyk', email: 'samir.kowalczyk@customer.example' },
      device: { mediaType: 'memory_card', capacityGb: 128 },
      symptoms: ['deleted_files'],
      description: 'Deleted a folder of drone footage from the card.',
      priorities: [{ category: 'videos', note: 'Footage from 12 October' }],
    },
    expect: { status: 'accepted' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { email: 'theo.brandt@juniperlane.example' },
    minutesAgo: 70,
    input: {
      customer: { name: 'Greta Halloran', email: 'greta.halloran@customer.example', phone: '+1 303 555 0188' },
      device: { mediaType: 'phone', make: 'Tindral', model: 'T7' },
      symptoms: ['wont_boot', 'dropped'],
      description: 'Stuck on the start screen after a fall; the customer has no cloud backup.',
      priorities: [{ category: 'photos', note: 'Newborn photos since March' }, { category: 'other', note: 'Voice memos' }],
      battery: { installed: true, condition: 'intact', wattHours: 12.7 },
      consent,
    },
    steps: [{ do: 'decline', minutesAgo: 20, reason: 'missing_skill_or_parts', note: 'No donor board for this model in stock' }],
    expect: { status: 'offered' },
  },
  {
    shop: 'basalt-street',
    openedBy: { email: 'mateo.arrieta@basaltstreet.example' },
    minutesAgo: 50,
    input: {
      customer: { name: 'Rosalind Achterberg-Nwosu', email: 'rosalind.an@customer.example' },
      device: { mediaType: 'raid_nas', memberCount: 4, capacityGb: 16000 },
      symptoms: ['clicking'],
      description: 'Office NAS: one member clicks, the volume will not mount. Not rebuilt or resynced.',
      priorities: [{ category: 'databases', note: 'Practice management database' }, { category: 'documents' }],
      sensitivity: ['financial'],
      consent,
    },
    expect: { status: 'offered', lab: 'quillmark' },
  },
  {
    shop: 'kettle-creek',
    openedBy: { email: 'ward.pemberton@kettlecreek.example' },
    minutesAgo: 40,
    input: {
      customer: { name: 'Thaddeus Ilunga', email: 'thaddeus.ilunga@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 3000 },
      symptoms: ['wont_boot'],
      description: 'Office PC seized by the owner’s lawyer; needs a documented image.',
      priorities: [{ category: 'email' }, { category: 'documents' }],
      sensitivity: ['legal_evidence'],
      consent,
    },
    expect: { status: 'offered' },
  },
  {
    shop: 'juniper-lane',
    openedBy: { email: 'theo.brandt@juniperlane.example' },
    minutesAgo: 35,
    input: {
      customer: { name: 'Wolfgang Eze', email: 'wolfgang.eze@customer.example', phone: '+1 303 555 0141' },
      device: { mediaType: 'hdd_3_5', capacityGb: 6000, interface: 'usb', make: 'Veltrion', model: 'DeskVault 6' },
      symptoms: ['clicking'],
      description: 'External backup drive knocked off a shelf; clicks and is not seen by the Mac.',
      priorities: [{ category: 'photos', note: '2019–2023 family photos' }, { category: 'documents', note: 'Scanned contracts' }],
      consent,
    },
    expect: { status: 'offered', lab: 'quillmark' },
  },
  {
    shop: 'bramblewood',
    openedBy: { email: 'nadia.castellanos@bramblewood.example' },
    minutesAgo: 20,
    input: {
      customer: { name: 'Imelda Sorensen-Oduya', email: 'imelda.so@customer.example' },
      device: { mediaType: 'hdd_3_5', capacityGb: 8000, make: 'Noctara', model: 'N8 Archive' },
      symptoms: ['beeping'],
      description: 'Archive drive beeps at power-on and does not spin up.',
      priorities: [{ category: 'videos', note: 'Wedding videography masters' }],
      consent,
    },
    expect: { status: 'offered', lab: 'quillmark' },
  },
  {
    shop: 'otterbrook',
    openedBy: { email: 'greer.mulcahy@otterbrook.example' },
    minutesAgo: 15,
    input: {
      customer: { name: 'Faisal Lindgren', email: 'faisal.lindgren@customer.example' },
      device: { mediaType: 'usb_flash', capacityGb: 32 },
      symptoms: ['physically_broken'],
      description: 'Key-ring stick bent in half.',
      priorities: [{ category: 'documents', note: 'CV and cover letters' }],
      consent,
    },
    expect: { status: 'offered', lab: 'cobaltmere' },
  },
];

/** Labs' managers, who answer the demo offers. */
async function labManagerOf(manager: EntityManager, labId: string): Promise<ReferralActor> {
  const user = await manager.findOneOrFail(User, { where: { organizationId: labId, role: 'lab_manager' }, order: { email: 'ASC' } });
  return { type: 'user', id: user.id, name: user.name };
}

async function pendingOffer(manager: EntityManager, referralId: string, what: string): Promise<LabOffer> {
  const offer = await manager.findOneBy(LabOffer, { referralId, status: 'pending' });
  if (!offer) throw new Error(`demo data: ${what} expected a pending offer`);
  return offer;
}

export async function seedDemoCases(
  manager: EntityManager,
  orgIds: Map<string, string>,
  options: { config: Config; passwordHash: string; now: Date },
): Promise<void> {
  const ctx: ServiceContext = { db: manager.connection, config: options.config };
  for (const person of demoShopStaff) {
    await manager.save(
      manager.create(User, {
        email: person.email,
        name: person.name,
        role: 'partner_admin',
        organizationId: orgIds.get(person.organization)!,
        status: 'active',
        passwordHash: options.passwordHash,
      }),
    );
  }
  const slugOf = new Map([...orgIds.entries()].map(([slug, id]) => [id, slug]));
  const at = (minutesAgo: number) => new Date(options.now.getTime() - minutesAgo * 60_000);

  for (const [index, demo] of demoCases.entries()) {
    const what = `case ${index + 1} (${demo.shop})`;
    const partnerOrganizationId = orgIds.get(demo.shop)!;
    let actor: ReferralActor;
    if ('email' in demo.openedBy) {
      const user = await manager.findOneByOrFail(User, { email: demo.openedBy.email });
      actor = { type: 'user', id: user.id, name: user.name };
    } else {
      const [key]: { id: string; name: string }[] = await manager.query(`SELECT id, name FROM api_keys WHERE prefix = $1`, [demo.openedBy.apiKeyPrefix]);
      if (!key) throw new Error(`demo data: no API key ${demo.openedBy.apiKeyPrefix}`);
      actor = { type: 'api_key', id: key.id, name: key.name };
    }
    const openedAt = at(demo.minutesAgo);
    const id = await openReferral(ctx, manager, { partnerOrganizationId, actor }, referralInput.parse(demo.input), { now: openedAt });

    for (const step of demo.steps ?? []) {
      const referral = (await lockReferral(manager, id))!;
      if (step.do === 'cancel') {
        const user = await manager.findOneByOrFail(User, { email: step.by });
        await cancelInTransaction(manager, referral, { type: 'user', id: user.id, name: user.name }, at(step.minutesAgo));
        continue;
      }
      const offer = await pendingOffer(manager, id, what);
      const lab = await manager.findOneByOrFail(Organization, { id: offer.labOrganizationId });
      if (step.do === 'expire') {
        await expireInTransaction(ctx, manager, referral, offer, new Date(Math.min(offer.deadline.getTime() + 60_000, options.now.getTime())));
      } else if (step.do === 'accept') {
        await acceptInTransaction(ctx, manager, referral, offer, lab, { actor: await labManagerOf(manager, lab.id), now: at(step.minutesAgo) });
      } else {
        await declineInTransaction(ctx, manager, referral, offer, lab.name, {
          actor: await labManagerOf(manager, lab.id),
          input: { reason: step.reason, note: step.note },
          now: at(step.minutesAgo),
        });
      }
    }

    // Rows whose time the database sets itself get the case's own times.
    await manager.query(`UPDATE lab_offers SET created_at = offered_at, updated_at = coalesce(responded_at, offered_at) WHERE referral_id = $1`, [id]);
    await manager.query(
      `UPDATE routing_snapshots s SET created_at = t.at FROM referral_timeline t
       WHERE s.referral_id = $1 AND t.referral_id = $1 AND t.kind IN ('routed', 'assigned') AND t.details->>'snapshotId' = s.id::text`,
      [id],
    );
    await manager.query(
      `UPDATE referrals SET created_at = $2, updated_at = (SELECT max(at) FROM referral_timeline WHERE referral_id = $1) WHERE id = $1`,
      [id, openedAt],
    );

    const [final]: { status: string; lab_organization_id: string | null }[] = await manager.query(
      `SELECT r.status, coalesce(r.lab_organization_id, o.lab_organization_id) AS lab_organization_id
       FROM referrals r LEFT JOIN lab_offers o ON o.referral_id = r.id AND o.status = 'pending' WHERE r.id = $1`,
      [id],
    );
    if (final.status !== demo.expect.status || (demo.expect.lab && slugOf.get(final.lab_organization_id ?? '') !== demo.expect.lab)) {
      throw new Error(
        `demo data: ${what} ended ${final.status} at ${slugOf.get(final.lab_organization_id ?? '') ?? 'no lab'}, expected ${demo.expect.status}${demo.expect.lab ? ` at ${demo.expect.lab}` : ''}`,
      );
    }
  }
}
