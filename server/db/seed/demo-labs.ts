import type { EntityManager } from 'typeorm';
import { classifyCertificate, retestDueDate, type IsoClass, type ParticleSample } from '@shared/domain/clean-air';
import type { AutoAcceptRule } from '@shared/schemas/labs';
import type { LabSkill, MediaType } from '@shared/vocabulary';
import { CleanAirCertificate, LabProfile } from '../../routing';

// Profiles of the seven demo labs: invented figures for the demo only. Every lab that takes logical work
// accepts logical-only cases by itself (so a partner system can go from referral to label with nobody at
// the lab). Turnarounds are at least two business days. Clean air: three labs with a current class 5
// certificate, one class 5 past its 6-month re-test date, one class 7, two with none.

interface DemoLabProfile {
  lab: string;
  mediaTypes: MediaType[];
  skills: Partial<Record<LabSkill, number>>;
  weeklyThroughput: number;
  queueCapacity: number;
  hours: { opensAt: string; closesAt: string; workdays: number[]; region: string };
  healthDataAgreement: boolean;
  /** Particle-count tests, each `daysAgo` before the seed runs. */
  certificates: { daysAgo: number; areaName: string; areaM2: number; samples: ParticleSample[] }[];
}

const L = 28.3; // litres per sample: one cubic foot, a common counter setting

/** One location on a clean bench, counts ≥ 0.3, 0.5 and 1 µm per m³. */
const bench = (c03: number, c05: number, c1: number): ParticleSample[] => [
  { location: 'B1', sizeUm: 0.3, perM3: c03, volumeLitres: L },
  { location: 'B1', sizeUm: 0.5, perM3: c05, volumeLitres: L },
  { location: 'B1', sizeUm: 1, perM3: c1, volumeLitres: L },
];

/** A 9 m² clean room: five locations (ISO 14644-1:2015 Table A.1), two samples each. */
const room = (c05: number, c1: number): ParticleSample[] =>
  ['R1', 'R2', 'R3', 'R4', 'R5'].flatMap((location, i) =>
    [0, 1].flatMap((s) => [
      { location, sizeUm: 0.5, perM3: c05 + i * 60 + s * 25, volumeLitres: L },
      { location, sizeUm: 1, perM3: c1 + i * 12 + s * 5, volumeLitres: L },
    ]),
  );

const logicalOnly: AutoAcceptRule[] = [{ skills: ['logical'], maxDistanceKm: 5000 }];

export const demoLabProfiles: DemoLabProfile[] = [
  {
    lab: 'quillmark',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'raid_nas', 'usb_flash', 'memory_card'],
    skills: { logical: 3, hdd_electronics: 4, hdd_firmware: 4, hdd_head_swap: 5, hdd_platter_work: 9, ssd_controller: 6, raid_rebuild: 5, encrypted_volumes: 5 },
    weeklyThroughput: 10,
    queueCapacity: 30,
    hours: { opensAt: '08:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], region: 'AZ' },
    healthDataAgreement: true,
    certificates: [
      { daysAgo: 250, areaName: 'Laminar-flow bench 1', areaM2: 1.2, samples: bench(4100, 1350, 310) },
      { daysAgo: 60, areaName: 'Laminar-flow bench 1', areaM2: 1.2, samples: bench(2900, 880, 190) },
    ],
  },
  {
    lab: 'ferrowick',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'raid_nas', 'tape'],
    skills: { logical: 2, hdd_electronics: 3, hdd_firmware: 4, hdd_head_swap: 6, ssd_controller: 7, raid_rebuild: 6, tape: 10, encrypted_volumes: 4, forensic_custody: 5 },
    weeklyThroughput: 15,
    queueCapacity: 45,
    hours: { opensAt: '09:00', closesAt: '18:00', workdays: [1, 2, 3, 4, 5], region: 'IL' },
    healthDataAgreement: true,
    // Class 7: fine for electronics, not for opening drives (the network asks class 5).
    certificates: [
      {
        daysAgo: 90,
        areaName: 'Open workbench',
        areaM2: 1.8,
        samples: [
          { location: 'W1', sizeUm: 0.5, perM3: 140_000, volumeLitres: L },
          { location: 'W1', sizeUm: 1, perM3: 36_000, volumeLitres: L },
          { location: 'W1', sizeUm: 5, perM3: 1_100, volumeLitres: L },
        ],
      },
    ],
  },
  {
    lab: 'tidewater',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'raid_nas'],
    skills: { hdd_electronics: 3, hdd_firmware: 4, hdd_head_swap: 5, hdd_platter_work: 8, raid_rebuild: 7 },
    weeklyThroughput: 6,
    queueCapacity: 18,
    hours: { opensAt: '08:30', closesAt: '16:30', workdays: [1, 2, 3, 4, 5], region: 'VA' },
    healthDataAgreement: false,
    // Class 5, but tested about eight months ago: past its 6-month re-test date (ISO 14644-2).
    certificates: [{ daysAgo: 240, areaName: 'Clean bench', areaM2: 1.5, samples: bench(3300, 1020, 240) }],
  },
  {
    lab: 'saltgrass',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'memory_card', 'other'],
    skills: { logical: 2, hdd_electronics: 4, ssd_controller: 5, encrypted_volumes: 3, flash_chip_off: 7 },
    weeklyThroughput: 8,
    queueCapacity: 20,
    hours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], region: 'UT' },
    healthDataAgreement: false,
    certificates: [],
  },
  {
    lab: 'brindle-oak',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'phone', 'tablet', 'memory_card', 'usb_flash'],
    skills: { logical: 3, hdd_electronics: 4, hdd_head_swap: 7, hdd_platter_work: 11, phone_board: 6, phone_chip_off: 9, liquid_remediation: 5 },
    weeklyThroughput: 7,
    queueCapacity: 14,
    hours: { opensAt: '09:00', closesAt: '17:30', workdays: [2, 3, 4, 5, 6], region: 'OR' },
    healthDataAgreement: true,
    certificates: [{ daysAgo: 120, areaName: 'Bench 2', areaM2: 1.4, samples: bench(3600, 1180, 260) }],
  },
  {
    lab: 'lumen-ridge',
    mediaTypes: ['hdd_3_5', 'hdd_2_5', 'ssd_sata', 'ssd_m2_nvme', 'raid_nas', 'phone'],
    skills: {
      logical: 2,
      hdd_electronics: 3,
      hdd_firmware: 4,
      hdd_head_swap: 6,
      hdd_platter_work: 8,
      ssd_controller: 5,
      raid_rebuild: 7,
      phone_board: 7,
      encrypted_volumes: 4,
      forensic_custody: 6,
    },
    weeklyThroughput: 20,
    queueCapacity: 60,
    hours: { opensAt: '08:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], region: 'TX' },
    healthDataAgreement: true,
    certificates: [{ daysAgo: 30, areaName: 'Clean room A', areaM2: 9, samples: room(1100, 240) }],
  },
  {
    lab: 'cobaltmere',
    mediaTypes: ['usb_flash', 'memory_card', 'ssd_sata', 'ssd_m2_nvme', 'phone', 'tablet'],
    skills: { logical: 2, flash_chip_off: 5, monolith_flash: 6, ssd_controller: 6, phone_chip_off: 8, liquid_remediation: 4 },
    weeklyThroughput: 9,
    queueCapacity: 25,
    hours: { opensAt: '09:00', closesAt: '17:00', workdays: [1, 2, 3, 4, 5], region: 'MN' },
    healthDataAgreement: false,
    certificates: [],
  },
];

const isoDate = (d: Date) => d.toISOString().slice(0, 10);

export async function seedDemoLabs(manager: EntityManager, orgIds: Map<string, string>, now: Date): Promise<void> {
  for (const p of demoLabProfiles) {
    const organizationId = orgIds.get(p.lab);
    if (!organizationId) throw new Error(`demo data: no lab organisation ${p.lab}`);
    const skills = (Object.entries(p.skills) as [LabSkill, number][]).map(([skill, turnaroundDays]) => ({ skill, turnaroundDays }));
    await manager.insert(LabProfile, {
      organizationId,
      mediaTypes: p.mediaTypes,
      skills,
      weeklyThroughput: p.weeklyThroughput,
      queueCapacity: p.queueCapacity,
      opensAt: p.hours.opensAt,
      closesAt: p.hours.closesAt,
      workdays: p.hours.workdays,
      holidayCountry: 'US',
      holidayRegion: p.hours.region,
      healthDataAgreementSignedAt: p.healthDataAgreement ? new Date(now.getTime() - 200 * 86_400_000) : null,
      acceptingNewCases: true,
      autoAcceptRules: 'logical' in p.skills ? logicalOnly : [],
    });
    for (const c of p.certificates) {
      const testedOn = isoDate(new Date(now.getTime() - c.daysAgo * 86_400_000));
      const classification = classifyCertificate({ testedOn, areaM2: c.areaM2, samples: c.samples });
      if (classification.isoClass === null) throw new Error(`demo data: the ${p.lab} certificate demonstrates no ISO class`);
      await manager.save(
        manager.create(CleanAirCertificate, {
          organizationId,
          testedOn,
          areaName: c.areaName,
          areaM2: c.areaM2,
          samples: c.samples,
          isoClass: classification.isoClass,
          validUntil: retestDueDate(testedOn, classification.isoClass as IsoClass),
          problems: [],
          recordedById: null,
        }),
      );
    }
  }
}
