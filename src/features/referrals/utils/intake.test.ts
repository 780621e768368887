import { describe, expect, it } from 'vitest';
import { cleanIntake, emptyIntake, intakeSchema, liveCautions, previewInputFrom, type IntakeFormValues } from './intake';

const filled = (changes: Partial<IntakeFormValues> & { device?: Partial<IntakeFormValues['device']> }): IntakeFormValues => ({
  ...emptyIntake,
  customer: { name: 'Alma Reyes', email: 'alma@customer.example', phone: '' },
  consent: { accepted: true },
  ...changes,
  device: { ...emptyIntake.device, ...changes.device },
});

describe('intake form values', () => {
  it('drops blank optional fields, the shop-origin address and battery answers for a hard drive', () => {
    const cleaned = cleanIntake(
      filled({ device: { mediaType: 'hdd_3_5' }, battery: { installed: true, condition: 'swollen' }, shipsFrom: 'shop' }),
    );

    expect(cleaned).toEqual({
      customer: { name: 'Alma Reyes', email: 'alma@customer.example' },
      device: { mediaType: 'hdd_3_5' },
      symptoms: [],
      priorities: [],
      sensitivity: [],
      consent: { accepted: true },
    });
  });

  it('keeps another origin address only when the clerk chose one', () => {
    const cleaned = cleanIntake(filled({ device: { mediaType: 'hdd_3_5' }, shipsFrom: 'elsewhere', origin: { postalCode: '85004', country: 'US' } }));

    expect(cleaned.origin).toEqual({ postalCode: '85004', country: 'US' });
  });

  it('asks for the battery declaration of a phone, on the battery field', () => {
    const result = intakeSchema.safeParse(filled({ device: { mediaType: 'phone' } }));

    expect(result.success).toBe(false);
    expect(result.error?.issues.map((issue) => issue.path.join('.'))).toContain('battery.installed');
  });

  it('requires the customer’s consent at the counter', () => {
    const result = intakeSchema.safeParse(filled({ device: { mediaType: 'hdd_3_5' }, consent: { accepted: false } }));

    expect(result.error?.issues.map((issue) => issue.path.join('.'))).toContain('consent.accepted');
  });

  it('has no preview until a media type is chosen, then the device, symptoms and valid parts only', () => {
    expect(previewInputFrom(emptyIntake)).toBeNull();

    const input = previewInputFrom(filled({ device: { mediaType: 'phone' }, symptoms: ['liquid_damage'], battery: { installed: 'yes', condition: '' } }));

    expect(input).toEqual({ device: { mediaType: 'phone' }, symptoms: ['liquid_damage'], sensitivity: [] });
  });
});

describe('live cautions', () => {
  it('tells the shop not to power a clicking 3.5″ drive again and not to open it', () => {
    const { cautions } = liveCautions(filled({ device: { mediaType: 'hdd_3_5' }, symptoms: ['clicking'] }));

    expect(cautions.map((c) => c.code)).toEqual(expect.arrayContaining(['do_not_power_on', 'do_not_open_drive']));
  });

  it('warns about TRIM for deleted files on an SSD and says to stop using the device', () => {
    const { cautions } = liveCautions(filled({ device: { mediaType: 'ssd_m2_nvme' }, symptoms: ['deleted_files'] }));

    expect(cautions.map((c) => c.code)).toEqual(expect.arrayContaining(['stop_using_device', 'trim_erases_deleted_data']));
  });

  it('shows the fire-risk caution and rules out air for a swollen phone battery', () => {
    const live = liveCautions(filled({ device: { mediaType: 'phone' }, battery: { installed: 'yes', condition: 'swollen', wattHours: 12 } }));

    expect(live.battery?.airAllowed).toBe(false);
    expect(live.battery?.contactLabFirst).toBe(true);
    expect(live.cautions.map((c) => c.code)).toContain('battery_fire_risk');
  });

  it('shows the RAID caution before the member count is valid, without a made-up count', () => {
    const { cautions } = liveCautions(filled({ device: { mediaType: 'raid_nas' } }));

    const raid = cautions.find((c) => c.code === 'raid_keep_members');
    expect(raid?.message).not.toMatch(/members: send all/);
  });
});
