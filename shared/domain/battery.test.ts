import { describe, expect, it } from 'vitest';
import { batteryConditions } from '../vocabulary';
import {
  assessBattery,
  DAMAGED_BATTERY_MARK_TEXT,
  DEFER_TO_CARRIER,
  LITHIUM_BATTERY_MARK_TEXT,
  wattHours,
} from './battery';

function allMessages(a: ReturnType<typeof assessBattery>): string[] {
  return [...a.reasons, ...a.cautions.map((c) => c.message)];
}

describe('wattHours', () => {
  it('is volts × amp-hours: 3.7 V × 3 000 mAh = 11.1 Wh (Wh = V × Ah, IATA DGR definition, from memory)', () => {
    expect(wattHours(3.7, 3000)).toBeCloseTo(11.1, 10);
  });

  it('gives 99.9 Wh for a 11.1 V, 9 000 mAh laptop pack', () => {
    expect(wattHours(11.1, 9000)).toBeCloseTo(99.9, 10);
  });

  it('rejects non-positive or non-finite input with a RangeError naming the argument', () => {
    expect(() => wattHours(0, 3000)).toThrow(/^volts must be a positive/);
    expect(() => wattHours(3.7, Number.NaN)).toThrow(/^milliampHours must be a positive/);
  });
});

describe('assessBattery', () => {
  it('applies no battery rules when no battery is installed', () => {
    const a = assessBattery({ installed: false });
    expect(a).toMatchObject({ wattHours: null, airAllowed: true, shippable: true, markText: null, cautions: [] });
    expect(a.reasons[0]).toContain('do not apply');
  });

  it('lets an intact battery of 100 Wh or less ship by air with the lithium battery mark (IATA PI 967, 49 CFR 173.185(c), from memory)', () => {
    const a = assessBattery({ installed: true, condition: 'intact', volts: 3.85, milliampHours: 4000 });
    expect(a.wattHours).toBeCloseTo(15.4, 10);
    expect(a).toMatchObject({ airAllowed: true, shippable: true, markText: LITHIUM_BATTERY_MARK_TEXT, contactLabFirst: false });
    expect(a.markText).toContain('UN3481');
    expect(a.reasons[0]).toContain('15.4 Wh');
    expect(a.cautions.map((c) => c.code)).toEqual(['battery_switch_off']);
  });

  it('treats exactly 100 Wh as within the small-battery limit (the limit is "not exceeding 100 Wh", from memory)', () => {
    const a = assessBattery({ installed: true, condition: 'intact', wattHours: 100 });
    expect(a).toMatchObject({ shippable: true, airAllowed: true });
  });

  it('refuses a battery over 100 Wh as fully regulated dangerous goods (IATA PI 967 Section I, from memory)', () => {
    const a = assessBattery({ installed: true, condition: 'intact', wattHours: 100.1 });
    expect(a).toMatchObject({ shippable: false, airAllowed: false, markText: null });
    expect(a.reasons[0]).toMatch(/100\.1 Wh, over the 100 Wh small-battery limit/);
    expect(a.reasons[0]).toContain('fully regulated dangerous goods');
    expect(a.cautions).toContainEqual(expect.objectContaining({ code: 'battery_over_limit', severity: 'danger' }));
  });

  it.each(['swollen', 'damaged', 'leaking'] as const)(
    'forbids a %s battery by air (IATA Special Provision A154, from memory) and shows the fire-risk caution',
    (condition) => {
      const a = assessBattery({ installed: true, condition, wattHours: 12 });
      expect(a).toMatchObject({ airAllowed: false, shippable: true, contactLabFirst: true, markText: DAMAGED_BATTERY_MARK_TEXT });
      expect(a.reasons.some((r) => r.includes('A154'))).toBe(true);
      const fire = a.cautions.find((c) => c.code === 'battery_fire_risk');
      expect(fire?.severity).toBe('danger');
      expect(fire?.message).toContain('Do not charge');
      expect(fire?.message).toContain('away from heat');
      expect(fire?.message).toContain('non-combustible container');
      expect(fire?.message).toContain('contact the lab before shipping');
      expect(a.cautions.find((c) => c.code === 'battery_damaged_ground_packing')?.message).toContain('173.185(f)');
    },
  );

  it('refuses a damaged battery over 100 Wh outright and still shows the fire-risk caution', () => {
    const a = assessBattery({ installed: true, condition: 'swollen', wattHours: 150 });
    expect(a).toMatchObject({ shippable: false, airAllowed: false, markText: null, contactLabFirst: true });
    expect(a.cautions.map((c) => c.code)).toEqual(['battery_over_limit', 'battery_fire_risk']);
  });

  it('keeps air services off and warns when the rating is unknown', () => {
    const a = assessBattery({ installed: true, condition: 'intact' });
    expect(a).toMatchObject({ wattHours: null, airAllowed: false, shippable: true });
    expect(a.cautions[0]).toMatchObject({ code: 'battery_rating_unknown', severity: 'warning' });
  });

  it('prefers a stated watt-hour rating over volts and milliamp-hours', () => {
    expect(assessBattery({ installed: true, condition: 'intact', wattHours: 50, volts: 3.7, milliampHours: 1000 }).wattHours).toBe(50);
  });

  it('ends every reason and caution by deferring to the carrier and local regulations, for every condition', () => {
    for (const condition of batteryConditions) {
      for (const wh of [10, 150, undefined]) {
        const a = assessBattery({ installed: true, condition, wattHours: wh });
        for (const message of allMessages(a)) expect(message.endsWith(DEFER_TO_CARRIER)).toBe(true);
      }
    }
    for (const message of allMessages(assessBattery({ installed: false }))) expect(message.endsWith(DEFER_TO_CARRIER)).toBe(true);
  });

  it('rejects a missing or unknown condition and bad ratings with clear errors', () => {
    expect(() => assessBattery({ installed: true })).toThrow(/^condition must be one of intact, swollen, damaged, leaking/);
    // @ts-expect-error checking the runtime guard against a value outside the vocabulary
    expect(() => assessBattery({ installed: true, condition: 'cracked' })).toThrow(RangeError);
    expect(() => assessBattery({ installed: true, condition: 'intact', wattHours: -5 })).toThrow(/^wattHours must be a positive/);
    expect(() => assessBattery({ installed: true, condition: 'intact', volts: -1 })).toThrow(/^volts must be a positive/);
  });
});
